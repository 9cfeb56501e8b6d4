//! Reading a generated 10,000-bed project file (target: under 50 ms) and how reading grows from
//! 1,000 to 100,000 beds (valid, and with one bad bed), plus validation alone and the bed-table
//! CSV reader on the same beds.

use aggrade_core::io::{
    project_to_json, read_bed_table, read_project_text, validate_project, write_bed_table,
};
use aggrade_core::model::{
    Bed, BedId, Contact, GrainSize, Lithology, PaleosolDevelopment, Project, Section, Structure, Surface,
    SurfaceKind, WentworthClass,
};
use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion};
use std::hint::black_box;

/// A section cycling through channel sand, splay sand and paleosol mudstone beds.
fn generated_project(beds: usize) -> Project {
    let mut s = Section::new("Generated");
    s.locality = "bench".into();
    for i in 0..beds {
        let id = BedId(i as u64 + 1);
        let bed = match i % 4 {
            0 => {
                let mut b = Bed::new(
                    id,
                    2.5,
                    Lithology::Sandstone,
                    Some(GrainSize::Class(WentworthClass::CoarseSand)),
                );
                b.grain_top = Some(GrainSize::Phi(2.4739));
                b.base_contact = Contact::Erosional;
                b.base_relief_m = Some(0.4);
                b.structures = vec![Structure::TroughCrossBedding, Structure::MudClasts];
                b.paleocurrents =
                    [12.0, 40.5, 355.0].into_iter().map(aggrade_core::model::Paleocurrent::azimuth).collect();
                b.base_surface = Some(Surface { name: format!("S-{i}"), kind: SurfaceKind::Incision });
                b.notes = "scoured base with mud-clast lag".into();
                b
            }
            1 => Bed::new(id, 0.6, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand))),
            2 => {
                let mut b =
                    Bed::new(id, 3.1, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Clay)));
                b.paleosol = PaleosolDevelopment::Moderate;
                b.carbonate_stage = Some(2);
                b.colour = "red-brown".into();
                b
            }
            _ => Bed::new(id, 1.2, Lithology::Covered, None),
        };
        s.beds.push(bed);
    }
    Project::new(vec![s])
}

fn bench(c: &mut Criterion) {
    let project = generated_project(10_000);
    let json = project_to_json(&project).expect("encode");
    eprintln!("10,000-bed project: {} bytes of JSON", json.len());
    c.bench_function("read_project_10000_beds", |b| {
        b.iter(|| read_project_text(black_box(&json)).expect("valid"))
    });
    // Growth with size: 1,000 / 10,000 / 100,000 beds (pretty JSON, as saved). A file with one
    // bad bed near its end takes the slower path that names every problem, bed by bed.
    let mut g = c.benchmark_group("read_project_by_size");
    g.sample_size(10);
    for n in [1_000usize, 10_000, 100_000] {
        let text = project_to_json(&generated_project(n)).expect("encode");
        g.bench_with_input(BenchmarkId::new("valid", n), &text, |b, t| {
            b.iter(|| read_project_text(black_box(t)).expect("valid"))
        });
        let bad = text.replacen(&format!("\"id\": {}", n - 2), &format!("\"id\": \"{}\"", n - 2), 1);
        assert_ne!(bad, text);
        g.bench_with_input(BenchmarkId::new("one_bad_bed", n), &bad, |b, t| {
            b.iter(|| read_project_text(black_box(t)).expect_err("one bad bed"))
        });
    }
    g.finish();
    // Stages of the read, to see where the time goes.
    c.bench_function("stage_scan_limits_10000_beds", |b| {
        b.iter(|| aggrade_core::io::internals::check_limits(black_box(&json)).expect("within limits"))
    });
    c.bench_function("stage_parse_json_tree_10000_beds", |b| {
        b.iter(|| serde_json::from_str::<serde_json::Value>(black_box(&json)).expect("json"))
    });
    c.bench_function("stage_serde_direct_10000_beds", |b| {
        b.iter(|| serde_json::from_str::<Project>(black_box(&json)).expect("json"))
    });
    c.bench_function("validate_project_10000_beds", |b| b.iter(|| validate_project(black_box(&project))));
    let csv = write_bed_table(&project.sections[0]);
    c.bench_function("read_bed_table_10000_rows", |b| {
        b.iter(|| read_bed_table(black_box(&csv), "Generated").expect("valid"))
    });
}

criterion_group!(benches, bench);
criterion_main!(benches);
