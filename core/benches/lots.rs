//! Criterion benchmark of the lot pipeline: 100,000 generated rows (80 lots x 25 wafers x 50
//! sites) parsed, converted and summarised, judged against a resistivity and a density window
//! (target under 150 ms natively).

use std::fmt::Write as _;
use std::hint::black_box;
use std::time::Duration;

use bandgauge_core::lots::{LotBook, LotReader, ReadOptions, SpecQuantity, SpecWindow, read_str};
use criterion::{Criterion, criterion_group, criterion_main};

const LOTS: usize = 80;
const WAFERS: usize = 25;
const SITES: usize = 50;

/// A deterministic 64-bit linear congruential generator (Knuth's MMIX constants), so the
/// benchmark input is the same on every run without a random-number crate.
struct Lcg(u64);

impl Lcg {
    fn next_unit(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

fn generated_file() -> String {
    let mut rng = Lcg(42);
    let mut text =
        String::from("lot,wafer,site,x [mm],y [mm],dopant,resistivity [ohm-cm],uncertainty [%]\n");
    for lot in 0..LOTS {
        let lot_level = 9.0 + 2.0 * rng.next_unit();
        for wafer in 1..=WAFERS {
            let wafer_level = lot_level * (1.0 + 0.02 * (rng.next_unit() - 0.5));
            for site in 1..=SITES {
                let angle = site as f64 * 0.7;
                let radius = 70.0 * (site as f64 / SITES as f64).sqrt();
                let rho = wafer_level * (1.0 + 0.03 * (rng.next_unit() - 0.5));
                writeln!(
                    text,
                    "L{lot:03},{wafer},{site},{:.1},{:.1},B,{rho:.4},1.5",
                    radius * angle.cos(),
                    radius * angle.sin()
                )
                .expect("writing to a String cannot fail");
            }
        }
    }
    text
}

fn lot_benches(c: &mut Criterion) {
    let text = generated_file();
    let options = ReadOptions::default();
    let resistivity = SpecWindow::parse(SpecQuantity::Resistivity, "8:12").expect("valid window");
    let density = SpecWindow::parse(SpecQuantity::Density, "1.1e15:1.7e15").expect("valid window");
    let mut group = c.benchmark_group("lots_100k_rows");
    group.sample_size(20);
    group.measurement_time(Duration::from_secs(10));
    group.bench_function("read_convert_summarise_resistivity_window", |b| {
        b.iter(|| {
            let mut book = LotBook::new();
            let counts = read_str(black_box(&text), &options, &mut book, &mut |_| {})
                .expect("the generated file reads");
            assert_eq!(counts.converted as usize, LOTS * WAFERS * SITES);
            book.report(Some(&resistivity))
        })
    });
    group.bench_function("read_convert_summarise_density_window", |b| {
        b.iter(|| {
            let mut book = LotBook::new();
            read_str(black_box(&text), &options, &mut book, &mut |_| {})
                .expect("the generated file reads");
            book.report(Some(&density))
        })
    });
    group.bench_function("read_in_64k_chunks_no_report", |b| {
        b.iter(|| {
            let mut book = LotBook::new();
            let mut reader = LotReader::new(options.clone());
            for chunk in text.as_bytes().chunks(1 << 16) {
                reader.feed(chunk, &mut book, &mut |_| {}).expect("reads");
            }
            reader.finish(&mut book, &mut |_| {}).expect("reads")
        })
    });
    group.finish();
}

criterion_group!(benches, lot_benches);
criterion_main!(benches);
