//! One frame of the window on a 5,000-bed and on a 50,000-bed section: build the UI (layout
//! cached, as while scrolling), and tessellate; a jump along the section (the layout around the
//! new view rebuilt); the frame right after an edit (the rules and layout start on a worker; the
//! column from before is drawn), and the time from an edit until the column on screen shows it:
//! with frames drawn back to back meanwhile (the worst case: nothing paces the window), and at the
//! pace of a 60 Hz display, as the window draws. Targets: under 8 ms per frame; from an edit until
//! the column is current, under 50 ms.

use aggrade::gui::test_hooks::{demo, files};
use aggrade::gui::Edit;
use aggrade::gui::{AggradeApp, AppConfig};
use aggrade_core::model::Project;
use criterion::{criterion_group, criterion_main, Criterion};

fn app_with(n: usize, data_dir: &std::path::Path) -> AggradeApp {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("long.aggrade");
    files::save(&path, &Project::new(vec![demo::long_section(n)])).expect("written");
    AggradeApp::new(AppConfig {
        file: Some(path),
        data_dir: data_dir.to_path_buf(),
        dialogs: Box::new(aggrade::gui::ScriptedDialogs::default()),
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

/// One frame: build the UI, then tessellate what it painted (textures are not uploaded here).
fn frame_once(ctx: &egui::Context, app: &mut AggradeApp, t: f64) -> Vec<egui::ClippedPrimitive> {
    let mut out = ctx.run_ui(input(t), |ui| app.ui_main(ui));
    out.textures_delta.clear();
    ctx.tessellate(std::mem::take(&mut out.shapes), out.pixels_per_point)
}

fn frame(c: &mut Criterion) {
    frames_on(c, 5_000, 100);
    frames_on(c, 50_000, 30);
}

/// The five measurements on an `n`-bed section, `samples` samples each.
fn frames_on(c: &mut Criterion, n: usize, samples: usize) {
    let data = tempfile::tempdir().expect("temp dir");
    let mut app = app_with(n, data.path());
    let ctx = egui::Context::default();
    let mut t = 0.0;
    // Warm up: fonts, first layout.
    for _ in 0..3 {
        t += 0.016;
        let _ = frame_once(&ctx, &mut app, t);
    }
    let mut g = c.benchmark_group(format!("window_{n}_beds"));
    g.sample_size(samples);
    g.bench_function(format!("frame_{n}_beds_scrolling"), |b| {
        b.iter(|| {
            t += 0.016;
            frame_once(&ctx, &mut app, t)
        })
    });
    // A jump far along the section (as from the review list): the frame that moves the view,
    // then the frame that lays out the heights around it and draws them (no rules re-run).
    let total = app.doc.section().total_thickness_m();
    let mut jump = 0u64;
    g.bench_function(format!("jump_{n}_beds_relayout_two_frames"), |b| {
        b.iter(|| {
            jump += 1;
            app.scroll_canvas_to(total * if jump.is_multiple_of(2) { 0.2 } else { 0.8 });
            t += 0.016;
            let _ = frame_once(&ctx, &mut app, t);
            t += 0.016;
            frame_once(&ctx, &mut app, t)
        })
    });
    let first = app.doc.section().beds[10].id;
    let mut k = 0u64;
    g.bench_function(format!("frame_{n}_beds_after_edit"), |b| {
        b.iter(|| {
            k += 1;
            app.apply(Edit::SetThickness { bed: first, thickness_m: 1.0 + (k % 7) as f64 * 0.1 });
            t += 0.016;
            frame_once(&ctx, &mut app, t)
        })
    });
    // The rules and layout after an edit run on a worker while frames go on: how long from the
    // edit until the column on screen shows it (frames drawn meanwhile included).
    g.bench_function(format!("edit_until_column_current_{n}_beds"), |b| {
        b.iter(|| {
            k += 1;
            app.apply(Edit::SetThickness { bed: first, thickness_m: 1.0 + (k % 7) as f64 * 0.1 });
            let mut frames = 0;
            loop {
                t += 0.016;
                let _ = frame_once(&ctx, &mut app, t);
                frames += 1;
                if !app.column_pending() || frames > 10_000 {
                    break frames;
                }
            }
        })
    });
    // The same as the window runs it: it draws when there is input or something asks for a
    // repaint, at most once per display refresh, and the worker asks for one when it is done. A
    // geologist who keeps moving the mouse meanwhile gets a frame every 16.7 ms (a 60 Hz display);
    // the worker's repaint request is answered at once, as eframe answers it.
    let asked = std::sync::Arc::new(std::sync::atomic::AtomicBool::new(false));
    let flag = std::sync::Arc::clone(&asked);
    ctx.set_request_repaint_callback(move |info| {
        if info.delay.is_zero() {
            flag.store(true, std::sync::atomic::Ordering::SeqCst);
        }
    });
    let display = std::time::Duration::from_micros(16_667);
    g.bench_function(format!("edit_until_column_current_{n}_beds_60hz"), |b| {
        b.iter(|| {
            k += 1;
            app.apply(Edit::SetThickness { bed: first, thickness_m: 1.0 + (k % 7) as f64 * 0.1 });
            let mut frames = 0;
            loop {
                let drawn = std::time::Instant::now();
                asked.store(false, std::sync::atomic::Ordering::SeqCst);
                t += 0.016;
                let _ = frame_once(&ctx, &mut app, t);
                frames += 1;
                if !app.column_pending() || frames > 10_000 {
                    break frames;
                }
                while !asked.load(std::sync::atomic::Ordering::SeqCst) && drawn.elapsed() < display {
                    std::thread::sleep(std::time::Duration::from_micros(100));
                }
            }
        })
    });
    g.finish();
}

criterion_group!(benches, frame);
criterion_main!(benches);
