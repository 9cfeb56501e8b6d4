//! Benchmark: interpreting a generated 10,000-bed section (target: well under 10 ms), and the
//! same rules on 1,000 / 10,000 / 100,000 beds to read off how the time grows, and the
//! sensitivity check (every parameter variant) on 500 beds.
//!
//! `AGGRADE_BENCH_WRITE=FILE cargo bench --workspace --bench interpret` also writes the
//! generated section as a project file, for timing the whole `aggrade interpret --json` process.

use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, Lithology, PaleosolDevelopment, Project, Section, WentworthClass,
};
use aggrade_core::rules::{interpret, sensitivity, RuleParams};
use criterion::{black_box, criterion_group, criterion_main, BenchmarkId, Criterion};

/// A deterministic section of `n` beds mixing channel storeys, drapes, overbank fines, splays,
/// paleosols and covered intervals (a linear congruential generator keeps it reproducible).
fn generated_section(n: usize) -> Section {
    let mut state: u64 = 0x9e37_79b9_7f4a_7c15;
    let mut next = move |m: u64| {
        state = state.wrapping_mul(6_364_136_223_846_793_005).wrapping_add(1_442_695_040_888_963_407);
        (state >> 33) % m
    };
    let mut s = Section::new("Generated 10k");
    for i in 0..n {
        let roll = next(100);
        let (lith, grain, t_m) = match roll {
            0..=34 => (Lithology::Mudstone, WentworthClass::Silt, 0.2 + next(300) as f64 / 100.0),
            35..=44 => (Lithology::Siltstone, WentworthClass::Silt, 0.1 + next(40) as f64 / 100.0),
            45..=79 => (
                Lithology::Sandstone,
                WentworthClass::from_rank(3 + next(3) as usize),
                0.3 + next(250) as f64 / 100.0,
            ),
            80..=89 => (Lithology::Conglomerate, WentworthClass::Pebble, 0.2 + next(150) as f64 / 100.0),
            90..=95 => (Lithology::Covered, WentworthClass::Silt, 0.5 + next(500) as f64 / 100.0),
            _ => (Lithology::Coal, WentworthClass::Clay, 0.1 + next(50) as f64 / 100.0),
        };
        let g = (lith != Lithology::Covered).then_some(GrainSize::Class(grain));
        let mut b = Bed::new(BedId(i as u64 + 1), t_m, lith, g);
        b.base_contact = [Contact::Sharp, Contact::Erosional, Contact::Gradational][next(3) as usize];
        if lith == Lithology::Mudstone {
            b.paleosol = PaleosolDevelopment::ALL[next(5) as usize];
        }
        if b.base_contact == Contact::Erosional && next(4) == 0 {
            b.base_relief_m = Some(next(600) as f64 / 100.0);
        }
        s.beds.push(b);
    }
    s
}

fn bench_interpret(c: &mut Criterion) {
    let section = generated_section(10_000);
    if let Ok(path) = std::env::var("AGGRADE_BENCH_WRITE") {
        let text = serde_json::to_string(&Project::new(vec![section.clone()])).expect("serialise project");
        std::fs::write(&path, text).expect("write the generated project");
    }
    let params = RuleParams::default();
    c.bench_function("interpret 10,000 beds", |b| {
        b.iter(|| interpret(black_box(&section), black_box(&params)))
    });
    // Growth with size: ten times the beds should take about ten times as long (nothing
    // quadratic).
    let mut g = c.benchmark_group("interpret_by_size");
    g.sample_size(10);
    for n in [1_000usize, 10_000, 100_000] {
        let s = generated_section(n);
        g.bench_with_input(BenchmarkId::from_parameter(n), &s, |b, s| {
            b.iter(|| interpret(black_box(s), black_box(&params)))
        });
    }
    g.finish();
    // The floor for any rule: one pass reading one field of every bed. When this grows faster
    // than tenfold per tenfold beds, the section has outgrown the processor's caches (each bed
    // is a few hundred bytes), and the rules' growth beyond tenfold comes from that, not from
    // their own work.
    let mut g = c.benchmark_group("one_pass_over_beds_by_size");
    g.sample_size(20);
    for n in [1_000usize, 10_000, 100_000] {
        let s = generated_section(n);
        g.bench_with_input(BenchmarkId::from_parameter(n), &s, |b, s| {
            b.iter(|| black_box(s).beds.iter().map(|bed| bed.thickness_m).sum::<f64>())
        });
    }
    g.finish();
}

/// The sensitivity check behind the review list's "Check stability" button: the rules re-run
/// over every documented parameter variant of a 500-bed section (target: one click, well under
/// 100 ms).
fn bench_sensitivity(c: &mut Criterion) {
    let section = generated_section(500);
    let params = RuleParams::default();
    let base = interpret(&section, &params);
    c.bench_function("sensitivity 500 beds", |b| {
        b.iter(|| {
            let mut r = base.clone();
            sensitivity::annotate(black_box(&section), black_box(&params), &mut r)
        })
    });
}

criterion_group!(benches, bench_interpret, bench_sensitivity);
criterion_main!(benches);
