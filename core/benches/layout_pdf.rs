//! Layout and PDF of a generated 10,000-bed section (~3.6 km; 174 A4 pages at 1:100).
//! Target: under 1 s for layout + PDF (release build). Also 1,000 and 100,000 beds, to read off
//! how the time grows (it should be about linear in beds, i.e. in pages).
//!
//! `pages_and_pdf_streamed` is what `aggrade export --pdf` does: pages laid out one at a time
//! (`layout::page_stream`) and written a group at a time (`export::write_pdf_to`), here to a sink;
//! its throughput is reported in pages per second.

use aggrade_core::export::{write_pdf, write_pdf_to, PdfInfo};
use aggrade_core::layout::sample::generated_section;
use aggrade_core::layout::{column_strip, page_stream, pages, LayoutOptions, PrintMeta};
use aggrade_core::rules::{interpret, RuleParams};
use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, Throughput};
use std::hint::black_box;

fn bench(c: &mut Criterion) {
    let opts = LayoutOptions::default();
    let meta = PrintMeta { printed_on: "2026-12-01".into(), subtitle: String::new() };
    let mut g = c.benchmark_group("layout_pdf");
    g.sample_size(10);
    for n in [1_000usize, 10_000, 100_000] {
        // The demo's beds repeated, interpreted by the real rules (as `aggrade export` does), so
        // the interpretation tracks carry storeys, bodies, regimes and candidates.
        let (section, _) = generated_section(n);
        let interp = interpret(&section, &RuleParams::default());
        let info = PdfInfo { title: section.name.clone(), author: String::new(), creation_date: 0 };
        let p = pages(&section, &interp, &opts, &meta);
        let items: usize = p.iter().map(|pg| pg.items.len()).sum();
        let bytes = write_pdf(&p, &info);
        eprintln!(
            "{n} beds, {:.0} m: {} A4 pages at 1:100, {} items, PDF {:.1} MB",
            section.total_thickness_m(),
            p.len(),
            items,
            bytes.len() as f64 / 1e6
        );
        g.throughput(Throughput::Elements(p.len() as u64));
        g.bench_with_input(BenchmarkId::new("pages", n), &n, |b, _| {
            b.iter(|| pages(black_box(&section), &interp, &opts, &meta))
        });
        g.bench_with_input(BenchmarkId::new("pdf", n), &n, |b, _| b.iter(|| write_pdf(black_box(&p), &info)));
        g.bench_with_input(BenchmarkId::new("pages_and_pdf", n), &n, |b, _| {
            b.iter(|| write_pdf(&pages(black_box(&section), &interp, &opts, &meta), &info))
        });
        g.bench_with_input(BenchmarkId::new("pages_and_pdf_streamed", n), &n, |b, _| {
            b.iter(|| {
                let stream = page_stream(black_box(&section), &interp, &opts, &meta);
                write_pdf_to(std::io::sink(), stream, &info).expect("a sink takes every byte")
            })
        });
        if n == 10_000 {
            g.throughput(Throughput::Elements(1));
            g.bench_function("column_strip/10000", |b| {
                b.iter(|| column_strip(black_box(&section), &interp, &opts))
            });
        }
    }
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
