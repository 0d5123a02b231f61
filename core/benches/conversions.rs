//! Criterion benchmarks of the conversions: one physics-model rho -> N inversion (target under
//! 20 microseconds), one physics N -> rho evaluation, the empirical relation both ways, and the
//! finite-thickness probe correction.

use std::hint::black_box;

use bandgauge_core::empirical::{self, EmpiricalRelation};
use bandgauge_core::materials;
use bandgauge_core::mobility::MobilityModel;
use bandgauge_core::probe;
use bandgauge_core::resistivity::{self, PhysicsOptions};
use criterion::{Criterion, criterion_group, criterion_main};

fn conversion_benches(c: &mut Criterion) {
    let si = materials::silicon();
    let masetti = PhysicsOptions::with_mobility(MobilityModel::Masetti);
    c.bench_function("physics_rho_to_n_masetti_boron_10_ohm_cm_300k", |b| {
        b.iter(|| resistivity::density_from_resistivity(&si, "B", black_box(10.0), 300.0, &masetti))
    });
    c.bench_function(
        "physics_rho_to_n_masetti_phosphorus_0p01_ohm_cm_300k",
        |b| {
            b.iter(|| {
                resistivity::density_from_resistivity(&si, "P", black_box(0.01), 300.0, &masetti)
            })
        },
    );
    c.bench_function("physics_n_to_rho_masetti_boron_1e15_300k", |b| {
        b.iter(|| resistivity::resistivity_from_density(&si, "B", black_box(1e15), 300.0, &masetti))
    });
    c.bench_function("empirical_rho_to_n_phosphorus", |b| {
        b.iter(|| {
            empirical::density_from_resistivity_cm3(EmpiricalRelation::Phosphorus, black_box(10.0))
        })
    });
    c.bench_function("empirical_n_to_rho_boron", |b| {
        b.iter(|| {
            empirical::resistivity_from_density_ohm_cm(EmpiricalRelation::Boron, black_box(1e15))
        })
    });
    c.bench_function("probe_thickness_correction", |b| {
        b.iter(|| probe::thickness_correction(black_box(0.0525), 0.1))
    });
}

criterion_group!(benches, conversion_benches);
criterion_main!(benches);
