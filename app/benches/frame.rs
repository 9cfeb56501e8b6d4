//! One frame of the window on a 5,000-bed section: build the UI (layout cached, as while
//! scrolling), and tessellate; plus the same frame right after an edit (layout rebuilt).
//! Target: under 8 ms per frame.

use aggrade::gui::document::Edit;
use aggrade::gui::{demo, files, AggradeApp, AppConfig};
use aggrade_core::model::Project;
use criterion::{criterion_group, criterion_main, Criterion};

fn app_with(n: usize, data_dir: &std::path::Path) -> AggradeApp {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("long.aggrade");
    files::save(&path, &Project::new(vec![demo::long_section(n)])).expect("written");
    AggradeApp::new(AppConfig {
        file: Some(path),
        data_dir: data_dir.to_path_buf(),
        dialogs: Box::new(files::ScriptedDialogs::default()),
        recent: Vec::new(),
    })
}

fn input(t: f64) -> egui::RawInput {
    egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(egui::Pos2::ZERO, egui::vec2(1400.0, 880.0))),
        time: Some(t),
        ..Default::default()
    }
}

fn frame(c: &mut Criterion) {
    let data = tempfile::tempdir().expect("temp dir");
    let mut app = app_with(5_000, data.path());
    let ctx = egui::Context::default();
    let mut t = 0.0;
    // Warm up: fonts, first layout.
    for _ in 0..3 {
        t += 0.016;
        let out = ctx.run_ui(input(t), |ui| app.ui_main(ui));
        let _ = ctx.tessellate(out.shapes, out.pixels_per_point);
    }
    c.bench_function("frame_5000_beds_scrolling", |b| {
        b.iter(|| {
            t += 0.016;
            let out = ctx.run_ui(input(t), |ui| app.ui_main(ui));
            ctx.tessellate(out.shapes, out.pixels_per_point)
        })
    });
    let first = app.doc.section().beds[10].id;
    let mut k = 0u64;
    c.bench_function("frame_5000_beds_after_edit", |b| {
        b.iter(|| {
            k += 1;
            app.apply(Edit::SetThickness { bed: first, thickness_m: 1.0 + (k % 7) as f64 * 0.1 });
            t += 0.016;
            let out = ctx.run_ui(input(t), |ui| app.ui_main(ui));
            ctx.tessellate(out.shapes, out.pixels_per_point)
        })
    });
}

criterion_group!(benches, frame);
criterion_main!(benches);
