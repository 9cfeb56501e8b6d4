//! Layout and PDF of a generated 10,000-bed section (~3.6 km; ~145 A4 pages at 1:100).
//! Target: under 1 s for layout + PDF (release build).

use aggrade_core::export::{write_pdf, PdfInfo};
use aggrade_core::layout::sample::generated_section;
use aggrade_core::layout::{column_strip, pages, LayoutOptions, PrintMeta};
use criterion::{criterion_group, criterion_main, Criterion};
use std::hint::black_box;

fn bench(c: &mut Criterion) {
    let (section, interp) = generated_section(10_000);
    let opts = LayoutOptions::default();
    let meta = PrintMeta { printed_on: "2026-12-01".into(), subtitle: String::new() };
    let info = PdfInfo { title: section.name.clone(), author: String::new(), creation_date: 0 };
    let p = pages(&section, &interp, &opts, &meta);
    let items: usize = p.iter().map(|pg| pg.items.len()).sum();
    let bytes = write_pdf(&p, &info);
    eprintln!(
        "10,000 beds, {:.0} m: {} A4 pages at 1:100, {} items, PDF {:.1} MB",
        section.total_thickness_m(),
        p.len(),
        items,
        bytes.len() as f64 / 1e6
    );
    let mut g = c.benchmark_group("layout_pdf_10k_beds");
    g.sample_size(10);
    g.bench_function("pages", |b| b.iter(|| pages(black_box(&section), &interp, &opts, &meta)));
    g.bench_function("pages_and_pdf", |b| {
        b.iter(|| write_pdf(&pages(black_box(&section), &interp, &opts, &meta), &info))
    });
    g.bench_function("column_strip", |b| b.iter(|| column_strip(black_box(&section), &interp, &opts)));
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
