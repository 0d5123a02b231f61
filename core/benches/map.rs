//! Criterion benchmark of the wafer map: `SurfaceFit::new` (Delaunay triangulation) plus
//! `raster` on a 200 x 200 grid, for a 121-site and the 49-site polar pattern (target: well
//! under 16 ms, one frame, since the page draws a map with its contour per frame).

use std::f64::consts::PI;
use std::hint::black_box;
use std::time::Duration;

use bandgauge_core::lots::map::{Grid, SurfaceFit};
use criterion::{Criterion, criterion_group, criterion_main};

/// Centre and rings of the given site counts at 14 mm steps (synthetic), with a centre-high
/// value.
fn polar(counts: &[usize], step_mm: f64) -> Vec<(f64, f64, f64)> {
    let mut sites = vec![(0.0, 0.0, 11.1)];
    for (ring, &count) in counts.iter().enumerate() {
        let radius = step_mm * (ring + 1) as f64;
        for k in 0..count {
            let a = 2.0 * PI * k as f64 / count as f64;
            let value = 10.0 * (1.0 + 0.11 * (1.0 - (radius / 70.0).powi(2)));
            sites.push((radius * a.cos(), radius * a.sin(), value));
        }
    }
    sites
}

fn bench(c: &mut Criterion) {
    let grid = Grid::covering(75.0, 200);
    let mut group = c.benchmark_group("map");
    group.measurement_time(Duration::from_secs(5));
    for (name, sites) in [
        (
            "fit_and_raster_121_sites_200x200",
            polar(&[8, 16, 24, 32, 40], 14.0),
        ),
        ("fit_and_raster_49_sites_200x200", polar(&[8, 16, 24], 22.0)),
    ] {
        group.bench_function(name, |b| {
            b.iter(|| {
                let fit = SurfaceFit::new(black_box(&sites)).expect("a valid pattern");
                black_box(fit.raster(&grid))
            })
        });
    }
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
