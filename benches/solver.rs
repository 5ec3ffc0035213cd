//! Solver benchmarks on the demo fleet: one propeller curve, its growth with points and
//! variants, a pitch recommendation, a 20-candidate sweep and a 200-candidate shortlist over a
//! catalogue the bench makes up. Budgets in docs/performance.md.

use criterion::{BenchmarkId, Criterion, Throughput, criterion_group, criterion_main};
use std::hint::black_box;
use std::time::Duration;
use tidewright::profile::{EngineDoc, Store};
use tidewright::propulsion::hull::holtrop::HoltropCoefficients;
use tidewright::propulsion::hull::resistance::HOLTROP_EDITION;
use tidewright::propulsion::solver::pitch::{PitchOptions, recommend_pitch};
use tidewright::propulsion::solver::point::solve_point;
use tidewright::propulsion::solver::sweep::{SweepOptions, SweepParameter, sweep};
use tidewright::propulsion::solver::{PropellerCurve, Variant, Vessel};
use tidewright::study::Study;
use tidewright::study::shortlist::{Offer, ShortlistOptions};

/// Standard gravity, m/s² (NIST SP 811).
const GRAVITY: f64 = 9.80665;

/// A demo boat from the embedded fleet, in its default load condition.
fn demo_vessel(name: &str) -> Vessel {
    let demo = Store::at("/nonexistent/tidewright-bench-demo");
    let (boat, engine) = demo.resolve_boat(name).expect("demo boat loads");
    boat.doc
        .to_default_vessel(&engine.doc)
        .expect("demo boat builds a vessel")
}

/// The speed range a curve is drawn over: rest to Froude number 0.45, m/s.
fn top_speed(vessel: &Vessel) -> f64 {
    0.45 * (GRAVITY * vessel.resistance.hull.input.length_waterline).sqrt()
}

/// `vessel` with its variants repeated until it has `count` of them.
fn with_variants(vessel: &Vessel, count: usize) -> Vessel {
    let mut grown = vessel.clone();
    grown.variants = (0..count)
        .map(|i| {
            let original = &vessel.variants[i % vessel.variants.len()];
            Variant {
                label: format!("{} #{i}", original.label),
                screw: original.screw.clone(),
            }
        })
        .collect();
    grown
}

fn curve(c: &mut Criterion) {
    let vessel = demo_vessel("marram");
    let system = vessel.active_system();
    let top = top_speed(&vessel);
    let mut group = c.benchmark_group("curve");
    group.bench_function("solve_point", |b| {
        b.iter(|| solve_point(black_box(&system), black_box(0.6 * top)))
    });
    // Where one point's time goes: resistance, interaction, the screw's polynomials.
    let model = &vessel.resistance;
    let speed = 0.6 * top;
    group.bench_function("part_resistance", |b| {
        b.iter(|| model.resistance(black_box(speed)))
    });
    group.bench_function("part_holtrop_coefficients", |b| {
        b.iter(|| HoltropCoefficients::new(black_box(&model.hull), HOLTROP_EDITION))
    });
    let stern = system.screw_at_stern();
    group.bench_function("part_interaction", |b| {
        b.iter(|| {
            system
                .interaction
                .at_speed(&model.hull, &model.water, &stern, black_box(speed))
        })
    });
    group.bench_function("part_open_water_kt_kq", |b| {
        b.iter(|| {
            system
                .screw
                .coefficients(black_box(0.55), Some(black_box(8.0e6)))
        })
    });
    group.bench_function("part_zero_thrust_j", |b| {
        b.iter(|| {
            system
                .screw
                .zero_thrust_advance_ratio(Some(black_box(8.0e6)))
        })
    });
    group.bench_function("marram_101_points", |b| {
        b.iter(|| PropellerCurve::over_speeds(black_box(&system), 0.0, top, 101))
    });
    // The TUI keeps its curves and re-solves into them: no allocation after the first.
    let mut reused = PropellerCurve::over_speeds(&system, 0.0, top, 101);
    group.bench_function("marram_101_points_reused", |b| {
        b.iter(|| reused.resolve(black_box(&system), 0.0, top, 101))
    });
    group.finish();

    let mut group = c.benchmark_group("curve_points");
    for points in [25usize, 50, 100, 200, 400] {
        group.throughput(Throughput::Elements(points as u64));
        group.bench_with_input(BenchmarkId::from_parameter(points), &points, |b, &n| {
            b.iter(|| PropellerCurve::over_speeds(black_box(&system), 0.0, top, n))
        });
    }
    group.finish();

    let mut group = c.benchmark_group("curve_variants");
    for variants in [1usize, 2, 4, 8] {
        let grown = with_variants(&vessel, variants);
        group.throughput(Throughput::Elements(variants as u64));
        group.bench_with_input(BenchmarkId::from_parameter(variants), &grown, |b, v| {
            b.iter(|| {
                (0..v.variants.len())
                    .map(|i| PropellerCurve::over_speeds(&v.system(i), 0.0, top, 101))
                    .collect::<Vec<_>>()
            })
        });
    }
    group.finish();
}

fn design(c: &mut Criterion) {
    let vessel = demo_vessel("marram");
    let index = vessel.active_variant;
    let mut group = c.benchmark_group("design");
    group.bench_function("recommend_pitch_marram", |b| {
        b.iter(|| recommend_pitch(black_box(&vessel), index, &PitchOptions::default()))
    });
    let area_ratios: Vec<f64> = (0..20).map(|i| 0.40 + 0.03 * f64::from(i)).collect();
    let parameter = SweepParameter::AreaRatio(area_ratios);
    group.bench_function("sweep_20_area_ratios_marram", |b| {
        b.iter(|| {
            sweep(
                black_box(&vessel),
                index,
                &parameter,
                &SweepOptions::default(),
            )
        })
    });
    group.finish();
}

/// A made-up catalogue of `count` engine sheets for the shortlist bench, four gears each:
/// three- to six-cylinder diesels from 30 to 128 kW, rated 2600 to 3800 rpm, Willans fuel
/// model. Invented numbers under invented names; never shipped as demo data.
fn bench_catalogue(count: usize) -> Vec<Offer> {
    (0..count)
        .map(|i| {
            let step = i as f64;
            let rated_kw = 30.0 + 2.0 * step;
            let rated_rpm = 2600.0 + 100.0 * (i % 13) as f64;
            let curve: Vec<String> = [0.40, 0.55, 0.70, 0.85, 1.0]
                .iter()
                .map(|&share: &f64| {
                    let rpm = rated_rpm * share;
                    // A full-load curve rising less than linearly in rpm, as diesels' do.
                    let kw = rated_kw * share.powf(0.8);
                    format!("[\"{rpm:.0} rpm\", \"{kw:.1} kW\"]")
                })
                .collect();
            let name = format!("Benchmark Diesel {i:02}");
            let toml = format!(
                "schema = 1\nname = \"{name}\"\nunits = \"metric\"\nrated_rpm = \"{rated_rpm:.0} rpm\"\n\
                 idle_rpm = \"800 rpm\"\nfuel_density = \"0.84 kg/L\"\ngears = [1.5, 2.0, 2.5, 3.0]\n\
                 full_load_power = [{}]\n\n[fuel]\nform = \"willans\"\nfull_load_sfc = \"{:.0} g/kWh\"\n\
                 zero_load_fraction = 0.15\n",
                curve.join(", "),
                235.0 + (i % 7) as f64 * 3.0
            );
            Offer {
                name: format!("benchmark-diesel-{i:02}"),
                doc: EngineDoc::from_toml(&toml, &name).expect("bench engine sheet parses"),
            }
        })
        .collect()
}

fn shortlist(c: &mut Criterion) {
    let demo = Store::at("/nonexistent/tidewright-bench-demo");
    let study = Study::load(&demo, "marram", None).expect("demo boat loads");
    let offers = bench_catalogue(50);
    let options = ShortlistOptions::default();
    let listed = study.shortlist(&offers, &options).expect("shortlist");
    assert_eq!(listed.candidates.len(), 200, "50 sheets × 4 gears");
    let mut group = c.benchmark_group("shortlist");
    group.sample_size(10);
    // RAYON_NUM_THREADS=1 gives the single-core figure.
    group.bench_function("catalogue_200", |b| {
        b.iter(|| study.shortlist(black_box(&offers), &options))
    });
    group.finish();
}

fn config() -> Criterion {
    Criterion::default()
        .sample_size(30)
        .warm_up_time(Duration::from_millis(500))
        .measurement_time(Duration::from_secs(2))
}

criterion_group! {
    name = benches;
    config = config();
    targets = curve, design, shortlist
}
criterion_main!(benches);
