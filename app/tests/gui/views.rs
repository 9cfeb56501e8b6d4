//! Drives the comparison and statistics views headlessly (egui_kittest) on the demo project:
//! the correlation panel draws the core's panel layout item for item and exports what the
//! command line exports, the statistics and channel-body views show what the core and the
//! command line compute, and their exports read back (SVG bytes, PDF by pypdf, CSV by Python's
//! csv module).

use super::harness::{app_with, demo_file as demo, harness_of};
use aggrade::gui::test_hooks::datum_choices;
use aggrade::gui::AggradeApp;
use aggrade::gui::Edit;
use aggrade_core::analysis::bodies::{body_table, thickness_summary};
use aggrade_core::analysis::paleocurrents::{
    circular_summary, rose_bins, section_readings, CircularParams, DataKind, PetalScale, RoseParams,
};
use aggrade_core::layout::{panel_layout, Datum, LayoutOptions, Orientation, PanelOptions, Paper, PrintMeta};
use aggrade_core::rules::{interpret, Interpretation, RuleParams};
use egui::{Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::{Path, PathBuf};
use std::process::Command;

fn harness(data_dir: &Path, answers: Vec<Option<PathBuf>>) -> Harness<'static, AggradeApp> {
    let mut h = harness_of(app_with(Some(demo()), data_dir, answers));
    h.run();
    h
}

/// Open a view from the View menu by its label.
fn open_view(h: &mut Harness<'static, AggradeApp>, label: &str) {
    let view = h.get_by_label("View").rect().center();
    h.hover_at(view);
    h.run();
    h.get_by_label("View").click();
    h.run();
    // Menu items read "label  shortcut".
    if h.query_by_label_contains(label).is_none() {
        let all = std::cell::RefCell::new(Vec::new());
        let _ = h
            .query_all_by(|n| {
                all.borrow_mut().extend(n.label());
                false
            })
            .count();
        panic!("no {label:?} after opening View; labels: {:?}", all.borrow());
    }
    h.get_by_label_contains(label).click();
    h.run();
    h.run();
}

fn interps(h: &Harness<'static, AggradeApp>) -> Vec<Interpretation> {
    let p = &h.state().doc.project;
    p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect()
}

/// Is some widget labelled exactly `text` on screen?
fn shown(h: &Harness<'static, AggradeApp>, text: &str) -> bool {
    h.query_all_by_label(text).next().is_some()
}

fn aggrade(args: &[&str]) -> std::process::Output {
    let out = Command::new(env!("CARGO_BIN_EXE_aggrade"))
        .args(args)
        .env_remove("SOURCE_DATE_EPOCH")
        .output()
        .expect("the aggrade binary runs");
    assert!(out.status.success(), "aggrade {args:?}: {}", String::from_utf8_lossy(&out.stderr));
    out
}

/// Rows of a CSV file as read by Python's csv module (an independent reader).
fn python_csv(path: &Path) -> Vec<Vec<String>> {
    let out = Command::new("python3")
        .arg("-c")
        .arg("import csv, json, sys\nprint(json.dumps(list(csv.reader(open(sys.argv[1], newline='')))))")
        .arg(path)
        .output()
        .expect("python3 runs (the independent CSV reader)");
    assert!(
        out.status.success(),
        "python could not read {}: {}",
        path.display(),
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("JSON rows")
}

#[test]
fn panel_view_draws_the_core_panel_and_exports_what_the_command_line_does() {
    let data = tempfile::tempdir().expect("temp dir");
    let out = tempfile::tempdir().expect("temp dir");
    let (svg, pdf) = (out.path().join("gui-panel.svg"), out.path().join("gui-panel.pdf"));
    let mut h = harness(data.path(), vec![Some(svg.clone()), Some(pdf.clone())]);
    open_view(&mut h, "Correlation panel");
    assert!(h.state().views.panel.open);

    // Pick SB-1 from the datum list, by its label.
    let sb1 = datum_choices(&h.state().doc.project)
        .into_iter()
        .find(|d| d.datum == Datum::Named("SB-1".into()))
        .expect("the demo has SB-1");
    h.get_by_value("Section base").click();
    h.run();
    h.get_by_label(&sb1.label).click();
    h.run();
    h.run();
    assert_eq!(h.state().views.panel.choices.datum, Datum::Named("SB-1".into()));

    // The core's panel with the view's starting options (A3 landscape, 1:500), as
    // `aggrade panel --datum SB-1 --scale 500 --paper a3 --landscape` builds them.
    let opts = PanelOptions {
        datum: Datum::Named("SB-1".into()),
        layout: LayoutOptions {
            scale_denominator: 500.0,
            paper: Paper::A3,
            orientation: Orientation::Landscape,
            ..LayoutOptions::default()
        },
        ..PanelOptions::default()
    };
    let meta = PrintMeta { printed_on: String::new(), subtitle: "demo.aggrade".into() };
    let core = panel_layout(&h.state().doc.project, &interps(&h), &opts, &meta).expect("panel");
    let shown_layout = h.state().views.panel.layout().expect("laid out").clone().expect("no error");
    assert_eq!(shown_layout, core, "the view lays out exactly the core's panel");
    assert_eq!(
        h.state().views.panel.last_drawn_items,
        core.page.items.len(),
        "the whole page is in view after fitting, so every item is drawn"
    );
    // Each column's proportion and the tie lines are listed.
    for col in &core.columns {
        assert!(shown(&h, &col.name), "{} listed", col.name);
        if let Some(p) = col.channel_proportion {
            let pc = format!("{:.0} %", 100.0 * p);
            assert!(shown(&h, &pc), "{}: channel bodies {pc} shown", col.name);
        }
    }
    assert!(core.ties.len() > 1);
    assert!(shown(&h, &format!("{} tie lines", core.ties.len())));

    // No re-layout while nothing changes.
    let made = h.state().views.panel.layouts_made;
    for _ in 0..5 {
        h.run();
    }
    assert_eq!(h.state().views.panel.layouts_made, made, "laid out once per revision and choice");

    // Export both ways; the SVG is the command line's SVG byte for byte.
    h.get_by_label("Export panel SVG…").click();
    h.run();
    h.get_by_label("Export panel PDF…").click();
    h.run();
    let cli_svg = out.path().join("cli-panel.svg");
    let demo = demo();
    aggrade(&[
        "panel",
        demo.to_str().expect("utf-8"),
        "--datum",
        "SB-1",
        "--scale",
        "500",
        "--paper",
        "a3",
        "--landscape",
        "--svg",
        cli_svg.to_str().expect("utf-8"),
    ]);
    let gui_bytes = std::fs::read(&svg).expect("SVG written");
    assert_eq!(gui_bytes, std::fs::read(&cli_svg).expect("CLI SVG"), "screen export = command-line export");
    // pypdf (PyPI) reads the PDF: one page of the layout's size (1 mm = 72/25.4 pt).
    let script = "import sys, pypdf\nr = pypdf.PdfReader(sys.argv[1])\nb = r.pages[0].mediabox\nprint(len(r.pages), float(b.width), float(b.height))";
    let py = Command::new("python3").arg("-c").arg(script).arg(&pdf).output().expect("python3 runs");
    assert!(py.status.success(), "pypdf could not read the PDF: {}", String::from_utf8_lossy(&py.stderr));
    let text = String::from_utf8_lossy(&py.stdout).to_string();
    let v: Vec<f64> = text.split_whitespace().map(|x| x.parse().expect("number")).collect();
    assert_eq!(v[0], 1.0, "one page");
    assert!((v[1] - core.page.width_mm * 72.0 / 25.4).abs() < 0.01, "{text}");
    assert!((v[2] - core.page.height_mm * 72.0 / 25.4).abs() < 0.01, "{text}");
    assert!(h.state().status.contains("gui-panel.pdf"), "status says where: {}", h.state().status);
}

#[test]
fn labels_typed_in_the_review_list_tie_two_sections_on_the_panel_and_undo_takes_one_back() {
    use aggrade::gui::test_hooks::LINK_HINT;
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(data.path(), vec![]);
    // Corrie Wash (at 0 m) and Halloway Bluff (at 1150 m) are neighbours on the demo panel; neither
    // has a review decision. Accept the best candidate in each and label it SB-9.
    let mut picked = Vec::new();
    for name in ["Corrie Wash", "Halloway Bluff"] {
        let i = h.state().doc.project.sections.iter().position(|s| s.name == name).expect("demo section");
        h.state_mut().doc.select_section(i); // as the Section menu does
        h.run();
        let top = h.state_mut().interpretation().sequence_boundary_candidates[0].clone();
        h.get_all_by_label("Accept").next().expect("an open candidate").click();
        h.run();
        h.get_by(|n| n.placeholder() == Some(LINK_HINT)).focus();
        h.run();
        h.get_by(|n| n.is_focused()).type_text("SB-9");
        h.run();
        h.key_press(Key::Enter);
        h.run();
        let d = h.state().doc.section().decision_for(top.bed_id).cloned().expect("decision");
        assert_eq!(d.link.as_deref(), Some("SB-9"), "{name}");
        picked.push((name, top.bed_id, top.height_m));
    }
    open_view(&mut h, "Correlation panel");
    let linked = |h: &Harness<'static, AggradeApp>| {
        let layout = h.state().views.panel.layout().expect("laid out").clone().expect("no error");
        layout
            .ties
            .iter()
            .filter(|t| t.linked)
            .map(|t| {
                let col = |k: usize| layout.columns[k].name.clone();
                (t.name.clone(), col(t.left), t.left_height_m, col(t.right), t.right_height_m)
            })
            .collect::<Vec<_>>()
    };
    assert_eq!(
        linked(&h),
        vec![(
            "SB-9".to_string(),
            picked[0].0.to_string(),
            picked[0].2,
            picked[1].0.to_string(),
            picked[1].2
        )],
        "one linked tie, between the two labelled boundaries"
    );
    assert!(
        h.query_by_label_contains("SB-9 (correlation label)").is_some(),
        "the tie list says how the tie came about"
    );
    // One undo takes the second label back (the typing was one step); the panel redraws untied.
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    h.run();
    let d = h.state().doc.section().decision_for(picked[1].1).cloned().expect("still decided");
    assert_eq!((d.state, d.link), (aggrade_core::model::ReviewState::Accepted, None));
    assert_eq!(linked(&h), vec![], "no linked tie after undo");
}

#[test]
fn a_label_typed_past_the_length_limit_stops_at_the_limit_and_is_what_is_kept() {
    use aggrade::gui::test_hooks::LINK_HINT;
    use aggrade_core::io::limits::MAX_LINK_LABEL_CHARS;
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(data.path(), vec![]);
    let top = h.state_mut().interpretation().sequence_boundary_candidates[0].clone();
    h.get_all_by_label("Accept").next().expect("an open candidate").click();
    h.run();
    h.get_by(|n| n.placeholder() == Some(LINK_HINT)).focus();
    h.run();
    // 50 characters typed in one go, then 5 more: the field takes the first 40 and no more, and
    // nothing is refused on the way (a refused keystroke used to leave a shorter label behind).
    let typed: String = ('A'..='Z').chain('a'..='x').collect();
    assert_eq!(typed.chars().count(), 50);
    h.get_by(|n| n.is_focused()).type_text(&typed);
    h.run();
    h.get_by(|n| n.is_focused()).type_text("yz012");
    h.run();
    h.key_press(Key::Enter);
    h.run();
    let d = h.state().doc.section().decision_for(top.bed_id).cloned().expect("decision");
    let kept: String = typed.chars().take(MAX_LINK_LABEL_CHARS).collect();
    assert_eq!(d.link.as_deref(), Some(kept.as_str()));
    assert!(!h.state().status.starts_with("Not changed"), "{}", h.state().status);
}

#[test]
fn statistics_view_shows_what_the_core_and_command_line_compute() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(data.path(), vec![]);
    // Opened by its shortcut this time.
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::T);
    h.run();
    h.run();
    assert!(h.state().views.stats.open, "Ctrl+Shift+T opens the statistics");

    // Paleocurrents per section, as the core computes them.
    let project = h.state().doc.project.clone();
    for s in &project.sections {
        let sum = circular_summary(&section_readings(s), &CircularParams::default()).expect("readings");
        assert!(shown(&h, &sum.n.to_string()), "{}: n", s.name);
        let mean = sum.mean_azimuth_deg.expect("a mean direction");
        assert!(shown(&h, &format!("{mean:.1}°")), "{}: vector mean {mean:.1}", s.name);
        assert!(shown(&h, &format!("{:.3}", sum.mean_resultant_length)), "{}: R̄", s.name);
        assert!(shown(&h, &format!("{:.1}°", sum.circular_std_deg)), "{}: circular s.d.", s.name);
        assert!(shown(&h, &format!("{:.3}", sum.rayleigh_z)), "{}: Rayleigh z", s.name);
    }
    // The transition analysis of the first section, as `aggrade stats --json` reports it.
    let first = project.sections[0].name.clone();
    let demo = demo();
    let out = aggrade(&["stats", demo.to_str().expect("utf-8"), "--section", &first, "--json"]);
    let cli: serde_json::Value = serde_json::from_slice(&out.stdout).expect("JSON");
    let t = &cli["transitions"];
    let chi = t["chi_square"].as_f64().expect("chi-square");
    let dof = t["dof"].as_i64().expect("dof");
    let line = format!("χ² = {chi:.2}, G² = {:.2}, dof = {dof}", t["g_square"].as_f64().expect("G²"));
    assert!(h.query_by_label_contains(&line).is_some(), "shown: {line}");
    let shown_t = h.state().views.stats.result().expect("computed").transitions.clone().expect("analysis");
    assert_eq!(serde_json::to_value(&shown_t.observed).expect("json"), t["observed"]);
    for (row, cli_row) in shown_t.observed.iter().zip(t["observed"].as_array().expect("rows")) {
        assert_eq!(row.len(), cli_row.as_array().expect("row").len());
    }
    for p in &shown_t.preferred {
        assert!(shown(&h, &format!("{} → {}", p.from, p.to)), "preferred {} → {} listed", p.from, p.to);
    }
    // The rose: core bins for 30° petals by area.
    let readings = section_readings(&project.sections[0]);
    let core_rose = rose_bins(&readings, &RoseParams::default()).expect("rose");
    assert_eq!(h.state().views.stats.result().expect("computed").rose.as_ref().expect("rose"), &core_rose);

    // Nothing is computed again while nothing changes.
    let n = h.state().views.stats.computations;
    for _ in 0..5 {
        h.run();
    }
    assert_eq!(h.state().views.stats.computations, n, "computed once per revision and choice");

    // Axial data and 45° petals by count: the shown numbers follow.
    h.get_by_label("Axial").click();
    h.run();
    h.get_by_value("30°").click();
    h.run();
    h.get_by_label("45°").click();
    h.run();
    h.get_by_label("Petal length ∝ count").click();
    h.run();
    h.run();
    let axial = CircularParams { kind: DataKind::Axial, ..Default::default() };
    let sum = circular_summary(&readings, &axial).expect("readings");
    let mean = sum.mean_azimuth_deg.expect("axial mean");
    assert!((0.0..180.0).contains(&mean));
    assert!(shown(&h, &format!("{mean:.1}°")), "axial mean {mean:.1}° shown");
    let core_rose = rose_bins(
        &readings,
        &RoseParams {
            bin_width_deg: 45.0,
            scale: PetalScale::Count,
            kind: DataKind::Axial,
            ..Default::default()
        },
    )
    .expect("rose");
    assert_eq!(core_rose.bins.len(), 8);
    assert_eq!(h.state().views.stats.result().expect("computed").rose.as_ref().expect("rose"), &core_rose);

    // An edit makes a new revision: computed again, once.
    let n = h.state().views.stats.computations;
    let bed = h.state().doc.section().beds[0].clone();
    h.state_mut().apply(Edit::SetThickness { bed: bed.id, thickness_m: bed.thickness_m + 0.5 });
    h.run();
    h.run();
    assert_eq!(h.state().views.stats.computations, n + 1);
}

#[test]
fn channel_body_view_shows_the_summary_and_writes_csv_files() {
    let data = tempfile::tempdir().expect("temp dir");
    let out = tempfile::tempdir().expect("temp dir");
    let (bodies_csv, curve_csv) = (out.path().join("bodies.csv"), out.path().join("curve.csv"));
    let mut h = harness(data.path(), vec![Some(bodies_csv.clone()), Some(curve_csv.clone())]);
    open_view(&mut h, "Channel bodies");
    assert!(h.state().views.bodies.open);

    let it = interps(&h);
    let rows = body_table(it.iter().map(|i| (i.section.as_str(), i.channel_bodies.as_slice())));
    let s = thickness_summary(&rows).expect("the demo has channel bodies");
    assert!(shown(&h, &format!("Channel bodies ({})", rows.len())));
    for v in [s.mean_m, s.median_m, s.p10_m, s.p50_m, s.p90_m] {
        assert!(shown(&h, &format!("{v:.2}")), "summary value {v:.2} shown");
    }
    assert!(shown(&h, &s.count.to_string()));
    assert!(shown(&h, &format!("{} / {} / {}", s.multi_story, s.single_story, s.undetermined)));

    // Exports through the dialogs, read back by Python's csv module.
    h.get_by_label("Export bodies CSV…").click();
    h.run();
    h.get_by_label("Export proportion curve CSV…").click();
    h.run();
    let table = python_csv(&bodies_csv);
    assert_eq!(table[0][..4], ["section", "base_m", "top_m", "thickness_m"]);
    assert_eq!(table.len(), rows.len() + 1, "a header and one row per body");
    for (r, c) in rows.iter().zip(&table[1..]) {
        assert_eq!(c[0], r.section);
        let t: f64 = c[3].parse().expect("thickness");
        assert!((t - r.thickness_m).abs() <= 0.0005 + 1e-12, "{} vs {}", c[3], r.thickness_m);
    }
    let curve = python_csv(&curve_csv);
    assert_eq!(curve[0], ["section", "height_m", "proportion"]);
    assert_eq!(curve.len(), 1 + it.iter().map(|i| i.proportion_curve.len()).sum::<usize>());

    // Decompaction from 2000 m burial: the per-section thicknesses are those of
    // `aggrade bodies --burial-depth 2000`.
    h.state_mut().views.bodies.burial_depth_m = 2000.0;
    h.get_by_label("Decompact").click();
    h.run();
    h.run();
    assert!(h.state().views.bodies.decompact);
    let demo = demo();
    let csv = out.path().join("cli-bodies.csv");
    let cli = aggrade(&[
        "bodies",
        demo.to_str().expect("utf-8"),
        "--csv",
        csv.to_str().expect("utf-8"),
        "--burial-depth",
        "2000",
    ]);
    let text = String::from_utf8_lossy(&cli.stdout).to_string();
    let mut checked = 0;
    for line in text.lines().filter(|l| l.contains("decompacted from 2000 m burial:")) {
        // "  decompacted from 2000 m burial: A m → B m; channel proportion p → q"
        let after = line.split("burial: ").nth(1).expect("numbers");
        let (present, rest) = after.split_once(" m → ").expect("present");
        let restored = rest.split(" m;").next().expect("restored");
        let want = format!("({present} → {restored} m)");
        assert!(h.query_by_label_contains(&want).is_some(), "shown: {want}");
        checked += 1;
    }
    assert_eq!(checked, h.state().doc.project.sections.len(), "one line per section");
    let r = h.state().views.bodies.result().expect("computed");
    assert!(r.decompacted_m.iter().all(Option::is_some));
    assert!(shown(&h, "decompacted (m)"));
}

/// Every text painted in the last frame (tick labels, axis names and page text included).
fn painted_texts(h: &Harness<'static, AggradeApp>) -> Vec<(String, egui::Rect)> {
    fn walk(shape: &egui::Shape, out: &mut Vec<(String, egui::Rect)>) {
        match shape {
            egui::Shape::Text(t) => out.push((t.galley.text().to_string(), t.visual_bounding_rect())),
            egui::Shape::Vec(v) => v.iter().for_each(|s| walk(s, out)),
            _ => {}
        }
    }
    let mut out = Vec::new();
    for c in &h.output().shapes {
        walk(&c.shape, &mut out);
    }
    out
}

/// The plots tab of the window on `file` (the demo when `None`), after a few frames.
fn plots_tab(data_dir: &Path, file: Option<PathBuf>) -> Harness<'static, AggradeApp> {
    let mut h = harness_of(app_with(file, data_dir, vec![]));
    h.run();
    h.state_mut().tab = aggrade::gui::Tab::Plots;
    for _ in 0..4 {
        h.run();
    }
    h
}

#[test]
fn plots_tab_names_every_axis_and_shows_the_last_bar_whole() {
    use aggrade::gui::test_hooks::{histogram, histogram_bars, THICKNESS_PLOT};
    let data = tempfile::tempdir().expect("temp dir");
    let h = plots_tab(data.path(), None);
    let texts = painted_texts(&h);
    let painted = |want: &str| texts.iter().any(|(t, _)| t == want);
    // Each axis names its quantity and unit (the demo's first section is logged in metres).
    for axis in [
        "channel bodies (% of thickness)",
        "grain size (φ), coarser to the right",
        "channel-body thickness (m)",
        "number of bodies",
    ] {
        assert!(
            painted(axis),
            "axis {axis:?} painted; texts: {:?}",
            texts.iter().map(|t| &t.0).collect::<Vec<_>>()
        );
    }
    // (The column left of the plots has its own "height (m)": count only the plots' side.)
    let plots_left = texts
        .iter()
        .find(|(t, _)| t.starts_with("Channel-body proportion, "))
        .map(|(_, r)| r.left())
        .expect("title")
        - 10.0;
    let on_plots = |want: &str| texts.iter().filter(|(t, r)| t == want && r.left() >= plots_left).count();
    assert_eq!(on_plots("height (m)"), 2, "both height axes named");
    // The grain-size axis is numbered (φ at the ticks), not bare.
    assert!(painted("2") && painted("4"), "φ ticks numbered");
    // The thickness plot shows the last bar whole: its bounds reach past the bar's right edge.
    let it = interps(&h);
    let th: Vec<f64> = it[0].channel_bodies.iter().map(|b| b.thickness_m).collect();
    assert!(!th.is_empty(), "the demo's first section has channel bodies");
    let (w, bins) = histogram(&th);
    let (centre, count, width) = *histogram_bars(w, &bins).last().expect("bars");
    let memory =
        egui_plot::PlotMemory::load(&h.ctx, egui::Id::unique(THICKNESS_PLOT)).expect("the plot was drawn");
    let (lo, hi) = (memory.bounds().min(), memory.bounds().max());
    // Whole, with room after it: the bounds reach past the end of the last bin by a visible margin
    // (2 % of the span shown), so the bar does not run into the plot's frame.
    let bin_end = centre + w / 2.0;
    assert!(centre + width / 2.0 < bin_end);
    assert!(hi[0] >= bin_end + 0.02 * (hi[0] - lo[0]), "last bin ends at {bin_end}, bounds {lo:?}–{hi:?}");
    assert!(lo[0] <= 0.0, "the axis starts at zero thickness: {lo:?}");
    let tallest = bins.iter().map(|b| b.1).max().unwrap_or(0) as f64;
    assert!(hi[1] > tallest && count <= tallest, "room above the tallest bar: {hi:?}");
    // The thickest body falls in the last bar's bin.
    let thickest = th.iter().copied().fold(0.0, f64::max);
    assert!(thickest >= centre - w / 2.0 && thickest <= centre + w / 2.0);
    // No legend box over the bars: the single series is named by the plot's title.
    assert!(!painted("bodies"), "no legend entry drawn");
    assert!(painted("Channel-body thicknesses"));
}

#[test]
fn plots_of_a_section_logged_in_feet_are_in_feet() {
    use aggrade::gui::test_hooks::PROPORTION_PLOT;
    let data = tempfile::tempdir().expect("temp dir");
    let pell = Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample_sections/pell_butte.csv");
    let h = plots_tab(data.path(), Some(pell));
    assert_eq!(h.state().doc.section().display_unit, aggrade_core::model::LengthUnit::Foot);
    let texts = painted_texts(&h);
    let painted = |want: &str| texts.iter().any(|(t, _)| t == want);
    assert!(painted("channel-body thickness (ft)"));
    let plots_left = texts
        .iter()
        .find(|(t, _)| t.starts_with("Channel-body proportion, "))
        .map(|(_, r)| r.left())
        .expect("title")
        - 10.0;
    let on_plots = |want: &str| texts.iter().filter(|(t, r)| t == want && r.left() >= plots_left).count();
    assert_eq!(on_plots("height (ft)"), 2);
    assert_eq!(on_plots("height (m)"), 0);
    assert!(!painted("channel-body thickness (m)"));
    // The window of the proportion curve, 10 m, is said in feet: 32.8 ft (1 ft = 0.3048 m).
    assert!(h.query_by_label_contains("32.8 ft moving window").is_some());
    // The proportion curve runs up the section's 141.2 ft (43.04 m), so the height axis reaches
    // past 100 (it would stop near 43 in metres).
    let memory =
        egui_plot::PlotMemory::load(&h.ctx, egui::Id::unique(PROPORTION_PLOT)).expect("the plot was drawn");
    assert!(memory.bounds().max()[1] > 100.0, "{:?}", memory.bounds());
}

#[test]
fn panel_view_says_datum_and_one_thing_about_the_horizontal_scale() {
    use aggrade::gui::test_hooks::PANEL_PANE_WIDTH;
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(data.path(), vec![]);
    open_view(&mut h, "Correlation panel");
    assert!(shown(&h, "Datum"), "the picker is headed Datum");
    assert!(h.query_by_label_contains("Hang on").is_none());
    let layout = h.state().views.panel.layout().expect("laid out").clone().expect("no error");
    // The demo at 1:500 on A3: every gap is widened to the minimum, so the view and the page
    // both say only that the gaps are not to scale, and no scale is printed for them.
    let gaps = layout.columns.len() - 1;
    assert_eq!(layout.horizontal.widened_gaps.len(), gaps);
    let (said, flagged) = layout.horizontal.statement(gaps);
    assert!(flagged && said.contains("NOT to scale"));
    assert!(h.query_by_label_contains("Horizontal: NOT to scale").is_some(), "the view says it");
    assert!(h.query_by_label_contains("Gaps at 1:").is_none(), "no contradicting scale in the view");
    let page_text: Vec<String> = layout
        .page
        .items
        .iter()
        .filter_map(|it| match it {
            aggrade_core::layout::Item::Text { text, .. } => Some(text.clone()),
            _ => None,
        })
        .collect();
    assert!(page_text.iter().any(|t| t == &said), "the page says the same");
    assert!(!page_text.iter().any(|t| t.starts_with("horizontal scale 1:")), "and prints no scale");
    // Channel-body proportions read as percentages, never as a bare "p".
    assert!(!page_text.iter().any(|t| t.starts_with("p 0.") || t.starts_with("p 1")));
    assert!(page_text
        .iter()
        .any(|t| t.starts_with("channel bodies ") && t.ends_with("% of exposed thickness")));
    // The section table fits the pane: its last header ends inside the pane's default width.
    let datum_left = h.get_by_label("Datum").rect().left();
    // (The column behind the window has a track titled "channel bodies" too: only cells that
    // start in the pane count.)
    let cells: Vec<egui::Rect> = h
        .get_all_by_label("channel bodies")
        .map(|c| c.rect())
        .filter(|r| r.left() >= datum_left && r.left() < datum_left + PANEL_PANE_WIDTH)
        .collect();
    assert_eq!(cells.len(), 2, "the section table and the interval table");
    for r in cells {
        let right = r.right();
        assert!(right <= datum_left + PANEL_PANE_WIDTH, "header ends at {right}, pane from {datum_left}");
    }
    // Counts agree with their nouns.
    assert!(
        shown(&h, &format!("{} tie lines", layout.ties.len()))
            || layout.ties.len() == 1 && shown(&h, "1 tie line")
    );
}
