//! Criterion benchmarks of the van der Pauw solve (target under 1 microsecond) at a nearly
//! symmetric and a strongly asymmetric structure, and of one whole Hall evaluation.

use std::hint::black_box;

use bandgauge_core::hall::{self, HallReading, HallVoltage, ScatteringFactor};
use bandgauge_core::vdp;
use criterion::{Criterion, criterion_group, criterion_main};

fn vdp_benches(c: &mut Criterion) {
    let mut group = c.benchmark_group("vdp");
    // The problem the SciPy script (core/benches/python/vdp_scipy.py) solves.
    group.bench_function("solve_ratio_1p5", |b| {
        b.iter(|| vdp::solve(black_box(15.0), black_box(10.0)))
    });
    group.bench_function("solve_ratio_1000", |b| {
        b.iter(|| vdp::solve(black_box(1000.0), black_box(1.0)))
    });
    group.bench_function("hall_evaluate_four_readings", |b| {
        b.iter(|| {
            hall::evaluate(black_box(&HallReading {
                voltage: HallVoltage::Readings([7.1e-3, -2.9e-3, 3.1e-3, -6.9e-3]),
                current_a: 1e-4,
                field_t: 0.5,
                sheet_resistance_ohm_sq: 55.86,
                thickness_cm: Some(2e-4),
                scattering: ScatteringFactor::Unity,
            }))
        })
    });
    group.finish();
}

criterion_group!(benches, vdp_benches);
criterion_main!(benches);
