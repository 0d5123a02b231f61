//! Criterion benchmarks of the neutrality solver: one solve and a 1000-point temperature sweep.
//!
//! The problem is the one `core/benches/python/neutrality_scipy.py` scripts in
//! Python: silicon at 300 K with 1e15 cm^-3 phosphorus and 1e14 cm^-3 boron.

use std::hint::black_box;

use bandgauge_core::materials::{self, DopantDensity};
use bandgauge_core::neutrality::{self, SolveOptions};
use bandgauge_core::sweep;
use criterion::{Criterion, criterion_group, criterion_main};

fn benchmark_problem() -> (bandgauge_core::Material, Vec<DopantDensity>) {
    let si = materials::silicon();
    let doping = vec![
        DopantDensity {
            dopant: si.dopant("P").expect("P in Si"),
            density_cm3: 1e15,
        },
        DopantDensity {
            dopant: si.dopant("B").expect("B in Si"),
            density_cm3: 1e14,
        },
    ];
    (si, doping)
}

fn neutrality_benches(c: &mut Criterion) {
    let (si, doping) = benchmark_problem();
    let options = SolveOptions::default();
    // Names read by `cargo xtask bench` (group "neutrality").
    let mut group = c.benchmark_group("neutrality");
    group.bench_function("solve_si_p1e15_300k", |b| {
        b.iter(|| neutrality::solve(black_box(&si), black_box(300.0), &doping, &options))
    });
    let grid = sweep::linear_grid_k(5.0, 2000.0, 1000).expect("valid grid");
    group.bench_function("sweep_1000_points_5_2000k", |b| {
        b.iter(|| sweep::temperature_sweep(black_box(&si), black_box(&grid), &doping, &options))
    });
    group.finish();
}

criterion_group!(benches, neutrality_benches);
criterion_main!(benches);
