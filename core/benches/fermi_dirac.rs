//! Criterion benchmarks of the Fermi-Dirac integrals: one call in each region and the inverse.
//!
//! eta = -10 uses the exp(eta) series table, 0 and 5 and 30 the piecewise
//! tables, 50 the Sommerfeld series; the neutrality solver needs a few dozen
//! of these calls per solve within about a microsecond.

use bandgauge_core::fermi_dirac::{
    f_half, f_half_inverse, f_minus_half, ln_f_half, ln_f_half_inverse,
};
use criterion::{Criterion, criterion_group, criterion_main};
use std::hint::black_box;

fn fermi_dirac(c: &mut Criterion) {
    let mut group = c.benchmark_group("fermi_dirac");
    for eta in [-10.0, 0.0, 5.0, 30.0, 50.0] {
        group.bench_function(format!("f_half/eta={eta}"), |b| {
            b.iter(|| f_half(black_box(eta)))
        });
    }
    group.bench_function("f_minus_half/eta=5", |b| {
        b.iter(|| f_minus_half(black_box(5.0)))
    });
    group.bench_function("ln_f_half/eta=-10", |b| {
        b.iter(|| ln_f_half(black_box(-10.0)))
    });
    for u in [1e-4, 1.0, 100.0] {
        group.bench_function(format!("f_half_inverse/u={u}"), |b| {
            b.iter(|| f_half_inverse(black_box(u)))
        });
    }
    group.bench_function("ln_f_half_inverse/ln_u=-500", |b| {
        b.iter(|| ln_f_half_inverse(black_box(-500.0)))
    });
    group.finish();
}

criterion_group!(benches, fermi_dirac);
criterion_main!(benches);
