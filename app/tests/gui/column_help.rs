//! The column explains itself (egui_kittest, the real window on the demo): the legend toggles
//! from the column's header and lists what the printed legend would, a track header and a body
//! bracket give hover help, a selected bed keeps its colours, the track headers stay at the top
//! when the column scrolls up, down and sideways, and a bed's top is grabbed across its width.

use super::harness::{app_with as app, harness_of as harness};
use aggrade::gui::AggradeApp;
use aggrade_core::layout::{column_legend, column_tracks, TrackKind};
use aggrade_core::model::{BedId, Lithology};
use aggrade_core::rules::Stacking;
use egui::epaint::ClippedShape;
use egui::{Color32, Pos2, Rect};
use egui_kittest::kittest::{NodeT, Queryable};
use egui_kittest::Harness;

/// A header title no other widget of the window carries.
const PROPORTION: &str = "channel-body proportion";

/// The lithology track's header title.
const LITHOLOGY: &str = "lithology grain size \u{2192}";

fn demo() -> (tempfile::TempDir, Harness<'static, AggradeApp>) {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness(app(None, data.path(), vec![]));
    h.run();
    (data, h)
}

/// How many nodes are labelled exactly `label`.
fn shown(h: &Harness<'static, AggradeApp>, label: &str) -> usize {
    h.query_all_by_label(label).count()
}

/// The header cell of a track (its accessible label is the track's title).
fn header_rect(h: &Harness<'static, AggradeApp>, title: &str) -> Rect {
    h.get_by_label(title).rect()
}

/// Colours filled inside `r` by the frame's shapes (strokes left out): what shows there.
fn fills_inside(shapes: &[ClippedShape], r: Rect) -> Vec<Color32> {
    fn walk(s: &egui::Shape, r: Rect, out: &mut Vec<Color32>) {
        match s {
            egui::Shape::Vec(v) => v.iter().for_each(|s| walk(s, r, out)),
            egui::Shape::Rect(x) if x.rect.intersects(r) => out.push(x.fill),
            egui::Shape::Path(p) if p.visual_bounding_rect().intersects(r) => out.push(p.fill),
            egui::Shape::Mesh(m) => {
                out.extend(m.vertices.iter().filter(|v| r.contains(v.pos)).map(|v| v.color))
            }
            _ => {}
        }
    }
    let mut out = Vec::new();
    for c in shapes {
        walk(&c.shape, r, &mut out);
    }
    out.retain(|c| *c != Color32::TRANSPARENT);
    out.sort_by_key(|c| c.to_array());
    out.dedup();
    out
}

/// Strokes of rectangles drawn round `r` (each at least as large as `r`).
fn outlines_round(shapes: &[ClippedShape], r: Rect) -> Vec<egui::Stroke> {
    let mut out = Vec::new();
    for c in shapes {
        if let egui::Shape::Rect(x) = &c.shape {
            if x.stroke.width > 0.0 && x.rect.contains_rect(r) && x.rect.width() < r.width() + 12.0 {
                out.push(x.stroke);
            }
        }
    }
    out
}

/// Bring a bed's middle into view and give its screen rectangle.
fn bed_in_view(h: &mut Harness<'static, AggradeApp>, id: BedId) -> Rect {
    let section = h.state().doc.section().clone();
    let i = section.bed_index(id).expect("bed");
    h.state_mut().scroll_canvas_to(section.base_heights_m()[i] + section.beds[i].thickness_m / 2.0);
    h.run();
    h.state().bed_rect_on_screen(id).expect("bed drawn")
}

#[test]
fn the_legend_toggles_from_the_column_header_and_lists_what_the_printed_legend_would() {
    let (_data, mut h) = demo();
    let (section, interp, layout) = {
        let app = h.state_mut();
        let interp = app.interpretation().clone();
        (app.doc.section().clone(), interp, app.layout.clone())
    };
    let entries = column_legend(&section, &interp, &layout);
    assert!(entries.len() >= 10, "the demo draws many kinds of mark: {entries:?}");
    let before: Vec<usize> = entries.iter().map(|e| shown(&h, &e.label())).collect();
    assert_eq!(shown(&h, "storey (one channel fill)"), 0, "no legend at first");
    h.get_by_label("Legend").click();
    h.run();
    for (e, n) in entries.iter().zip(&before) {
        assert!(shown(&h, &e.label()) > *n, "legend entry {:?} not shown", e.label());
    }
    // The words on the column and in the legend are one spelling.
    assert!(entries.iter().all(|e| !e.label().contains("story")));
    // The key hides it again, and the choice outlives opening another file in the session.
    h.key_press(egui::Key::L);
    h.run();
    assert_eq!(shown(&h, "storey (one channel fill)"), 0, "L hides the legend");
    h.key_press(egui::Key::L);
    h.run();
    assert_eq!(shown(&h, "storey (one channel fill)"), 1, "L shows it");
    let demo_file = super::harness::demo_file();
    h.state_mut().open_path(&demo_file);
    h.run();
    assert_eq!(shown(&h, "storey (one channel fill)"), 1, "still shown after opening a file");
}

#[test]
fn a_track_header_and_a_body_bracket_say_what_they_are() {
    let (_data, mut h) = demo();
    let title = TrackKind::Bodies.title_lines().join(" ");
    assert_eq!(shown(&h, TrackKind::Bodies.help()), 0);
    h.get_by_label(&title).hover();
    h.run();
    assert_eq!(shown(&h, TrackKind::Bodies.help()), 1, "the header's help shows when pointed at");

    // A single-storey channel body, pointed at half-way up its bracket.
    let (section, body, layout) = {
        let app = h.state_mut();
        let body = app
            .interpretation()
            .channel_bodies
            .iter()
            .find(|b| b.stacking == Stacking::SingleStory)
            .expect("the demo has a single-storey body")
            .clone();
        (app.doc.section().clone(), body, app.layout.clone())
    };
    let mid = (body.base_m + body.top_m) / 2.0;
    let i = section.base_heights_m().iter().rposition(|b| *b <= mid).expect("a bed there");
    let r = bed_in_view(&mut h, section.beds[i].id);
    let ppm = h.state().points_per_m().expect("laid out");
    // Screen points per strip millimetre: a metre is 1000 / scale mm on the strip.
    let zoom = ppm * layout.scale() as f32 / 1000.0;
    let tracks = column_tracks(&section, &layout);
    let bodies = tracks.bodies.expect("interpretation shown");
    // The bed's box starts at the lithology track; the bodies track lies further right.
    let x = r.left() + ((bodies.x_mm + bodies.w_mm / 2.0 - tracks.lithology.x_mm) as f32) * zoom;
    let y = r.bottom() - ((mid - section.base_heights_m()[i]) as f32) * ppm;
    h.hover_at(Pos2::new(x, y));
    h.run();
    let help: Vec<String> = h
        .query_all_by_label_contains("Single-storey channel body, 1 storey")
        .filter_map(|n| n.accesskit_node().label())
        .collect();
    assert_eq!(help.len(), 1, "one tooltip at the bracket: {help:?}");
    assert!(help[0].contains(&body.thickness_text()), "{}", help[0]);
    assert!(help[0].contains("A candidate for your review."), "{}", help[0]);
}

#[test]
fn a_selected_sandstone_keeps_its_colours_and_gets_an_outline() {
    let (_data, mut h) = demo();
    let sand = h
        .state()
        .doc
        .section()
        .beds
        .iter()
        .filter(|b| b.lithology == Lithology::Sandstone)
        .max_by(|a, b| a.thickness_m.total_cmp(&b.thickness_m))
        .expect("the demo has sandstone")
        .id;
    h.state_mut().doc.selected_bed = None;
    let r = bed_in_view(&mut h, sand);
    h.run();
    let inside = r.shrink(4.0);
    let before = fills_inside(&h.output().shapes, inside);
    assert!(!before.is_empty(), "the bed is painted");
    assert!(outlines_round(&h.output().shapes, r).is_empty(), "no outline before selecting");
    h.state_mut().doc.selected_bed = Some(sand);
    h.run();
    assert_eq!(h.state().bed_rect_on_screen(sand), Some(r), "the view stayed put");
    assert_eq!(fills_inside(&h.output().shapes, inside), before, "selecting changed the bed's colours");
    let outline = outlines_round(&h.output().shapes, r);
    assert!(outline.iter().any(|s| s.width >= 2.0), "a thick outline marks the selection: {outline:?}");
}

#[test]
fn track_headers_stay_at_the_top_when_the_column_scrolls() {
    let (_data, mut h) = demo();
    let section = h.state().doc.section().clone();
    let top_bed = section.beds.last().expect("beds").id;
    let first = header_rect(&h, PROPORTION);
    let bed_before = h.state().bed_rect_on_screen(top_bed).expect("the top bed shows first");
    assert!(first.bottom() <= bed_before.top(), "the header sits above the column");
    // Down to the base: the beds move, the headers do not.
    h.state_mut().scroll_canvas_to(1.0);
    h.run();
    let low = header_rect(&h, PROPORTION);
    assert_eq!(low, first);
    let base_bed = h.state().bed_rect_on_screen(section.beds[0].id).expect("the base shows");
    assert!(base_bed.top() > first.bottom(), "the column scrolled under the header");
    // The mouse wheel over the column: the same.
    let over = Pos2::new(base_bed.center().x, base_bed.top() - 40.0);
    h.hover_at(over);
    h.event(egui::Event::MouseWheel {
        unit: egui::MouseWheelUnit::Point,
        delta: egui::vec2(0.0, 200.0),
        phase: egui::TouchPhase::Move,
        source: egui::MouseWheelSource::Unknown,
        modifiers: egui::Modifiers::NONE,
    });
    // The wheel scrolls smoothly over a few frames, and the tooltip waits for a still pointer.
    h.run_steps(20);
    assert_eq!(header_rect(&h, PROPORTION), first);
    // With the legend beside it the column is wider than its room: sideways, the header cells
    // follow their tracks and keep their titles in view.
    h.get_by_label("Legend").click();
    h.run();
    let bed = h.state().bed_rect_on_screen(section.beds[0].id).expect("base bed");
    let cell = header_rect(&h, LITHOLOGY);
    h.hover_at(over);
    h.event(egui::Event::MouseWheel {
        unit: egui::MouseWheelUnit::Point,
        delta: egui::vec2(-120.0, 0.0),
        phase: egui::TouchPhase::Move,
        source: egui::MouseWheelSource::Unknown,
        modifiers: egui::Modifiers::NONE,
    });
    // The wheel scrolls smoothly over a few frames, and the tooltip waits for a still pointer.
    h.run_steps(20);
    let moved = h.state().bed_rect_on_screen(section.beds[0].id).expect("base bed");
    let dx = moved.left() - bed.left();
    assert!(dx < -20.0, "the column panned sideways: {dx}");
    // The cell's part in view: its right edge follows the track (its left may pass under the
    // ruler).
    let cell_now = header_rect(&h, LITHOLOGY);
    assert!((cell_now.right() - (cell.right() + dx)).abs() < 1.0, "the cell follows its track");
    assert_eq!(cell_now.top(), cell.top(), "and stays at the top");
}

#[test]
fn a_beds_top_is_grabbed_across_the_wider_bed_a_few_points_off_the_line() {
    let (_data, mut h) = demo();
    // A bed whose top carries a narrower bed: grabbed at the right of the lower one, where the
    // upper one does not reach, and 4 points above the line.
    let section = h.state().doc.section().clone();
    let k = (0..section.beds.len() - 1)
        .find(|&k| {
            // A box is as wide as the coarser end of its bed.
            let w = |b: &aggrade_core::model::Bed| {
                [b.grain_base, b.grain_top].into_iter().flatten().map(|g| g.class().rank()).max().unwrap_or(0)
            };
            w(&section.beds[k]) >= w(&section.beds[k + 1]) + 3 && section.beds[k + 1].thickness_m > 0.5
        })
        .expect("a coarse bed under a fine one");
    let bed = section.beds[k].clone();
    let lower = bed_in_view(&mut h, bed.id);
    let upper = h.state().bed_rect_on_screen(section.beds[k + 1].id).expect("the bed above");
    assert!(lower.right() > upper.right() + 20.0, "the lower bed is the wider");
    let grab = Pos2::new(lower.right() - 6.0, lower.top() - 4.0);
    let ppm = h.state().points_per_m().expect("laid out");
    h.hover_at(grab);
    h.run();
    assert_eq!(h.output().platform_output.cursor_icon, egui::CursorIcon::ResizeVertical);
    // Grabbing selects the bed, and the bed table scrolls to it meanwhile: a few more frames.
    h.drag_at(grab);
    h.run_steps(10);
    for f in [0.25, 0.5, 0.75, 1.0] {
        h.hover_at(grab + egui::vec2(0.0, -ppm * f));
        h.run_steps(10);
    }
    h.drop_at(grab + egui::vec2(0.0, -ppm));
    h.run_steps(10);
    let after = h.state().doc.section().beds[k].thickness_m;
    // Dragged a metre up; the thickness snaps to a 5 or 10 cm grid at this zoom.
    let grew = after - bed.thickness_m;
    assert!((grew - 1.0).abs() <= 0.05 + 1e-9, "dragged 1 m up: {} -> {after}", bed.thickness_m);
}
