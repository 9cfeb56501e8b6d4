//! The correlation panel laid out from small projects: order, datum, gaps, ties and notes.

use super::*;
use crate::layout::{Orientation, Paper};
use crate::model::{
    Bed, BedId, GrainSize, Lithology, Project, ReviewDecision, ReviewState, Surface, SurfaceKind,
    WentworthClass,
};
use crate::rules::{interpret, RuleParams};

fn section(name: &str, beds: &[(f64, Lithology, Option<&str>)]) -> Section {
    let mut s = Section::new(name);
    for (k, (t, l, surf)) in beds.iter().enumerate() {
        let g = match l {
            Lithology::Sandstone => WentworthClass::MediumSand,
            _ => WentworthClass::Silt,
        };
        let mut b = Bed::new(BedId(k as u64 + 1), *t, *l, Some(GrainSize::Class(g)));
        b.base_surface = surf.map(|n| Surface { name: n.to_string(), kind: SurfaceKind::Incision });
        s.beds.push(b);
    }
    s
}

fn three() -> Project {
    use Lithology::*;
    let mut a =
        section("A", &[(3.0, Mudstone, None), (2.0, Sandstone, Some("SB-1")), (4.0, Mudstone, Some("T"))]);
    let mut b =
        section("B", &[(1.5, Mudstone, None), (2.0, Sandstone, Some("SB-1")), (1.0, Mudstone, Some("T"))]);
    let mut c = section("C", &[(5.0, Mudstone, None), (1.0, Sandstone, None)]);
    a.panel_position_m = Some(0.0);
    b.panel_position_m = Some(800.0);
    c.panel_position_m = Some(300.0);
    c.review.push(ReviewDecision::new(BedId(2), ReviewState::Accepted, ""));
    Project::new(vec![a, b, c])
}

fn interps(p: &Project) -> Vec<Interpretation> {
    p.sections.iter().map(|s| interpret(s, &RuleParams::default())).collect()
}

fn opts(datum: &str) -> PanelOptions {
    PanelOptions {
        datum: Datum::parse(datum),
        layout: LayoutOptions {
            scale_denominator: 100.0,
            paper: Paper::A3,
            orientation: Orientation::Landscape,
            ..Default::default()
        },
        ..Default::default()
    }
}

#[test]
fn ordered_by_position_and_hung_on_the_datum() {
    let p = three();
    let l = panel_layout(&p, &interps(&p), &opts("SB-1"), &PrintMeta::default()).expect("panel");
    let names: Vec<&str> = l.columns.iter().map(|c| c.name.as_str()).collect();
    assert_eq!(names, ["A", "C", "B"], "ordered by panel position 0, 300, 800 m");
    // SB-1 at 3 m in A and 1.5 m in B sits at the datum y in both (construction, exact).
    assert!((l.columns[0].heights.y_mm(3.0) - l.datum_y_mm).abs() < 1e-9);
    assert!((l.columns[2].heights.y_mm(1.5) - l.datum_y_mm).abs() < 1e-9);
    // C lacks SB-1: hung on its base, and flagged.
    assert_eq!(l.columns[1].datum_height_m, None);
    assert!((l.columns[1].heights.y_mm(0.0) - l.datum_y_mm).abs() < 1e-9);
    assert!(l.notes.iter().any(|n| n.starts_with("C: has no SB-1")), "{:?}", l.notes);
    // Columns never overlap, and gaps keep at least the minimum.
    for w in l.columns.windows(2) {
        assert!(w[1].x_mm >= w[0].x_mm + w[0].width_mm + 10.0 - 1e-9);
    }
}

#[test]
fn gaps_follow_the_horizontal_scale() {
    let p = three();
    let o = PanelOptions { horizontal_scale_denominator: Some(10_000.0), ..opts("base") };
    let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
    // 300 m at 1:10 000 is 30 mm; 500 m is 50 mm (computed).
    let gap = |k: usize| l.columns[k + 1].x_mm - (l.columns[k].x_mm + l.columns[k].width_mm);
    assert!((gap(0) - 30.0).abs() < 1e-9, "{}", gap(0));
    assert!((gap(1) - 50.0).abs() < 1e-9, "{}", gap(1));
    assert!(l.horizontal.widened_gaps.is_empty());
    // At 1:100 000, 3 mm and 5 mm gaps are widened to the 10 mm minimum and flagged.
    let o = PanelOptions { horizontal_scale_denominator: Some(100_000.0), ..opts("base") };
    let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
    assert_eq!(l.horizontal.widened_gaps, vec![0, 1]);
    assert!(l.notes.iter().any(|n| n.contains("NOT to horizontal scale")));
}

#[test]
fn ties_join_same_names_and_accepted_boundaries() {
    let mut p = three();
    // Put C far away so A and B are neighbours; accept SB-1 in both A and B.
    p.sections[2].panel_position_m = Some(5000.0);
    for s in &mut p.sections[..2] {
        s.review.push(ReviewDecision::new(BedId(2), ReviewState::Accepted, ""));
    }
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    let sb1 = l.ties.iter().find(|t| t.name == "SB-1").expect("SB-1 tie");
    assert!(sb1.accepted);
    assert_eq!((sb1.left_height_m, sb1.right_height_m), (3.0, 1.5));
    assert!((sb1.from.y - l.columns[0].heights.y_mm(3.0)).abs() < 1e-9);
    assert!((sb1.to.y - l.columns[1].heights.y_mm(1.5)).abs() < 1e-9);
    let top = l.ties.iter().find(|t| t.name == "T").expect("T tie");
    assert!(!top.accepted);
    assert_eq!((top.left_height_m, top.right_height_m), (5.0, 3.5));
    // B and C (neighbours): B has no unnamed accepted boundary, C has one: no tie, no note.
    assert!(l.ties.iter().all(|t| t.right != 2 || t.name != "accepted:C@5.00"));
    assert_eq!(l.ties.len(), 2);
}

/// Accept the boundary at the base of bed `id` with an optional correlation label.
fn accept(s: &mut Section, id: u64, link: Option<&str>) {
    let mut d = ReviewDecision::new(BedId(id), ReviewState::Accepted, "");
    d.link = link.map(str::to_string);
    s.review.retain(|r| r.bed != BedId(id));
    s.review.push(d);
}

/// Unnamed boundaries: A has two accepted, B one; without labels the counts differ, so
/// order pairing gives nothing (A–B are neighbours: C is moved far away).
fn unnamed_pair() -> Project {
    use Lithology::*;
    let mut a = section("A", &[(2.0, Mudstone, None), (1.0, Sandstone, None), (3.0, Sandstone, None)]);
    let mut b = section("B", &[(1.0, Mudstone, None), (4.0, Sandstone, None), (2.0, Sandstone, None)]);
    a.panel_position_m = Some(0.0);
    b.panel_position_m = Some(500.0);
    accept(&mut a, 2, None);
    accept(&mut a, 3, None);
    accept(&mut b, 3, None);
    Project::new(vec![a, b])
}

#[test]
fn a_link_ties_boundaries_that_order_pairing_could_not() {
    let mut p = unnamed_pair();
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    assert!(l.ties.is_empty(), "{:?}", l.ties);
    assert!(l.notes.iter().any(|n| n.contains("have 2 and 1 accepted boundaries")), "{:?}", l.notes);
    // Label A's upper boundary (base of bed 3 at 3 m) and B's (base of bed 3 at 5 m) SB-2.
    accept(&mut p.sections[0], 3, Some("SB-2"));
    accept(&mut p.sections[1], 3, Some(" SB-2 "));
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    assert_eq!(l.ties.len(), 1, "{:?}", l.ties);
    let t = &l.ties[0];
    assert!(t.linked && t.accepted);
    assert_eq!(t.name, "SB-2");
    assert_eq!((t.left_height_m, t.right_height_m), (3.0, 5.0));
    assert!((t.from.y - l.columns[0].heights.y_mm(3.0)).abs() < 1e-9);
    assert!((t.to.y - l.columns[1].heights.y_mm(5.0)).abs() < 1e-9);
    // A linked boundary is no longer unnamed: A has one unnamed left, B none; no note.
    assert!(!l.notes.iter().any(|n| n.contains("accepted boundaries without")), "{:?}", l.notes);
    // Drawn solid in the link colour, and the label written once, in the link colour.
    let solid_link = l.page.items.iter().filter(|it| {
        matches!(it, Item::Polyline { points, stroke } if stroke.color == LINK_TEAL
            && stroke.dash_mm.is_empty() && points.len() == 2 && points[0] == t.from)
    });
    assert_eq!(solid_link.count(), 1);
    let labels =
        l.page.items.iter().filter(
            |it| matches!(it, Item::Text { text, color, .. } if text == "SB-2" && *color == LINK_TEAL),
        );
    assert_eq!(labels.count(), 1);
}

#[test]
fn link_and_name_on_the_same_levels_give_one_tie() {
    let mut p = three();
    p.sections[2].panel_position_m = Some(5000.0);
    for s in &mut p.sections[..2] {
        accept(s, 2, Some("K-1"));
    }
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    // SB-1 (bed 2 base) in A and B is both named and linked: one linked tie; T still by name.
    let names: Vec<(&str, bool)> = l.ties.iter().map(|t| (t.name.as_str(), t.linked)).collect();
    assert_eq!(names, [("K-1", true), ("T", false)]);
    // The datum may be the label: A hangs at 3 m, B at 1.5 m.
    let l = panel_layout(&p, &interps(&p), &opts("k-1"), &PrintMeta::default()).expect("panel");
    assert_eq!(l.columns[0].datum_height_m, Some(3.0));
    assert_eq!(l.columns[1].datum_height_m, Some(1.5));
    assert_eq!(l.columns[2].datum_height_m, None);
}

#[test]
fn repeated_and_unaccepted_labels_are_noted() {
    let mut p = unnamed_pair();
    // A: SB-2 on both accepted boundaries (the lowest, at 2 m, is tied); B: SB-2 accepted at
    // 5 m, and SB-3 on a boundary that is only a candidate.
    accept(&mut p.sections[0], 2, Some("SB-2"));
    accept(&mut p.sections[0], 3, Some("SB-2"));
    accept(&mut p.sections[1], 3, Some("SB-2"));
    let mut d = ReviewDecision::new(BedId(2), ReviewState::Candidate, "");
    d.link = Some("SB-3".into());
    p.sections[1].review.push(d);
    let m = section_markers(&p.sections[0]);
    assert_eq!(m.repeated_links, vec![("SB-2".to_string(), 3.0)]);
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    let linked: Vec<(f64, f64)> =
        l.ties.iter().filter(|t| t.linked).map(|t| (t.left_height_m, t.right_height_m)).collect();
    assert_eq!(linked, [(2.0, 5.0)]);
    assert!(l.notes.iter().any(|n| n.starts_with("A: correlation label \"SB-2\" is on more than one")));
    assert!(l
        .notes
        .iter()
        .any(|n| n
            .starts_with("B: correlation label \"SB-3\" at 1.00 m is on a boundary that is not accepted")));
    // The repeat is neither tied by label nor paired by order (it carries a label).
    assert_eq!(l.ties.len(), 1, "{:?}", l.ties);
}

#[test]
fn a_label_without_a_neighbour_is_noted() {
    let mut p = three();
    // C (at 300 m, between A and B) has the label; neither neighbour does.
    accept(&mut p.sections[2], 2, Some("SB-9"));
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    assert!(l.ties.iter().all(|t| !t.linked));
    assert!(
        l.notes.iter().any(|n| n
            == "C: correlation label \"SB-9\" at 5.00 m has no match in a neighbouring column: not tied."),
        "{:?}",
        l.notes
    );
}

#[test]
fn unknown_datum_lists_the_names() {
    let p = three();
    let err = panel_layout(&p, &interps(&p), &opts("SB-9"), &PrintMeta::default()).expect_err("unknown");
    let msg = err.to_string();
    assert!(
        msg.contains("\"SB-9\"")
            && msg.contains("\"SB-1\"")
            && msg.contains("\"T\"")
            && msg.contains("\"accepted:C@5.00\""),
        "{msg}"
    );
    // The accepted boundary's own name works as a datum.
    let l = panel_layout(&p, &interps(&p), &opts("accepted:C@5.00"), &PrintMeta::default()).expect("panel");
    let c = l.columns.iter().find(|c| c.name == "C").expect("C");
    assert_eq!(c.datum_height_m, Some(5.0));
}

#[test]
fn bad_input_gets_errors_not_panics() {
    let p = three();
    assert_eq!(
        panel_layout(&Project::new(vec![]), &[], &opts("base"), &PrintMeta::default()),
        Err(PanelError::NoSections)
    );
    assert!(matches!(
        panel_layout(&p, &[], &opts("base"), &PrintMeta::default()),
        Err(PanelError::InterpretationCount { sections: 3, interpretations: 0 })
    ));
    let one = Project::new(vec![p.sections[0].clone()]);
    let err = panel_layout(&one, &[], &opts("base"), &PrintMeta::default()).expect_err("no interpretation");
    assert_eq!(
        err.to_string(),
        "1 section but 0 interpretations were given; give one interpretation per section, in the same order"
    );
    let mut o = opts("base");
    o.layout.scale_denominator = 0.0;
    assert!(panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).is_err());
    // NaN thickness and missing positions still give a page.
    let mut q = three();
    q.sections[0].beds[0].thickness_m = f64::NAN;
    q.sections[1].panel_position_m = None;
    let l = panel_layout(&q, &interps(&q), &opts("SB-1"), &PrintMeta::default()).expect("panel");
    assert_eq!(l.horizontal.source, PositionSource::FileOrder);
    assert!(l.page.height_mm > 0.0);
}

#[test]
fn tall_page_when_the_panel_does_not_fit() {
    let p = three();
    let mut o = opts("base");
    o.layout.scale_denominator = 10.0; // 9 m at 1:10 = 900 mm: taller than A3.
    let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
    assert!(l.page_enlarged && l.page.height_mm > 900.0);
    assert!((l.page.width_mm - 420.0).abs() < 1e-9);
    // Tall single page: the round horizontal scale at which the closest pair (300 m) gets
    // at least the 10 mm minimum: 1:25 000 (300 m → 12 mm, 500 m → 20 mm; computed).
    o.layout.paper = Paper::TallSingle;
    let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
    assert_eq!(l.horizontal.denominator, Some(25_000.0));
    assert!(l.horizontal.widened_gaps.is_empty());
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    assert!(!l.page_enlarged);
    assert_eq!((l.page.width_mm, l.page.height_mm), (420.0, 297.0));
}

/// Every text of a page with its size: (text, x, baseline y, size pt, rotation).
fn texts(l: &PanelLayout) -> Vec<(String, f64, f64, f64)> {
    l.page
        .items
        .iter()
        .filter_map(|it| match it {
            Item::Text { text, pos, size_pt, rotation_deg, .. } if rotation_deg.abs() < 1e-9 => {
                Some((text.clone(), pos.x, pos.y, *size_pt))
            }
            _ => None,
        })
        .collect()
}

#[test]
fn the_header_stays_within_the_page_and_its_lines_do_not_collide() {
    use crate::layout::text::width;
    let mut p = three();
    // A long datum name and title, a file name and a date, on the narrowest paper.
    for s in &mut p.sections[..2] {
        s.beds[1].base_surface = Some(Surface {
            name: "SB-1 regional incision surface traced along the whole escarpment".into(),
            kind: SurfaceKind::Incision,
        });
    }
    let meta =
        PrintMeta { printed_on: "2026-12-01".into(), subtitle: "a-long-project-file-name.aggrade".into() };
    for (paper, orientation) in [(Paper::A4, Orientation::Portrait), (Paper::A3, Orientation::Landscape)] {
        let mut o = opts("SB-1 regional incision surface traced along the whole escarpment");
        o.layout.paper = paper;
        o.layout.orientation = orientation;
        o.title = "Correlation of the fluvial sections along the northern escarpment, upper member".into();
        let l = panel_layout(&p, &interps(&p), &o, &meta).expect("panel");
        let m = LayoutOptions::default().margin_mm.clamp(3.0, 40.0);
        // The header: texts above the rule under it (the first full-width line on the page).
        let rule_y = l
            .page
            .items
            .iter()
            .find_map(|it| match it {
                Item::Polyline { points, .. }
                    if points.len() == 2
                        && (points[0].x - m).abs() < 1e-9
                        && (points[1].x - (l.page.width_mm - m)).abs() < 1e-9 =>
                {
                    Some(points[0].y)
                }
                _ => None,
            })
            .expect("the rule under the header");
        let head: Vec<_> = texts(&l).into_iter().filter(|t| t.2 < rule_y).collect();
        assert!(head.len() >= 5, "{head:?}");
        let mut boxes = Vec::new();
        for (t, x, y, size) in &head {
            let right = x + width(t, *size);
            assert!(
                *x >= m - 1e-9 && right <= l.page.width_mm - m + 1e-9,
                "{paper:?}: {t:?} runs off the page"
            );
            // Statements under the title are wrapped to at most 55 % of the width, so a screen
            // that draws small type up to 1.7 × larger still keeps them on the page.
            if *size < 8.0 && !t.starts_with('0') && t != "1 km" && !t.ends_with(" m") && !t.ends_with(" km")
            {
                assert!(
                    right - m <= 0.55 * (l.page.width_mm - 2.0 * m) + 1e-9,
                    "{paper:?}: {t:?} is too wide"
                );
            }
            boxes.push((*x, right, y - size * 0.3528 * 0.75, *y + size * 0.3528 * 0.2, t.clone()));
        }
        for (i, a) in boxes.iter().enumerate() {
            for b in &boxes[i + 1..] {
                let overlap = a.0 < b.1 && b.0 < a.1 && a.2 < b.3 && b.2 < a.3;
                assert!(!overlap, "{paper:?}: header texts {:?} and {:?} overlap", a.4, b.4);
            }
        }
        // The legend starts below the header.
        assert!(head.iter().any(|t| t.0.starts_with("datum: SB-1 regional")));
    }
}

#[test]
fn the_horizontal_scale_is_said_once_and_consistently() {
    let p = three();
    let all_page_text = |l: &PanelLayout| texts(l).into_iter().map(|t| t.0).collect::<Vec<_>>().join("\n");
    // At 1:1 000 000 both gaps (300 m and 500 m: 0.3 and 0.5 mm) are widened: the page says
    // they are not to scale and prints no horizontal scale.
    let o = PanelOptions { horizontal_scale_denominator: Some(1_000_000.0), ..opts("base") };
    let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
    assert_eq!(l.horizontal.widened_gaps, vec![0, 1]);
    let (said, flagged) = l.horizontal.statement(2);
    assert!(flagged && said.contains("NOT to scale") && !said.contains("1:"), "{said}");
    let text = all_page_text(&l);
    assert!(text.contains(&said));
    assert!(!text.contains("1:1\u{2009}000\u{2009}000") && !text.contains("1:1000000"), "no scale printed");
    // At 1:10 000 no gap is widened: the scale is printed once, and nothing says "not to scale".
    let o = PanelOptions { horizontal_scale_denominator: Some(10_000.0), ..opts("base") };
    let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
    let (said, flagged) = l.horizontal.statement(2);
    assert!(!flagged && said.starts_with("horizontal scale 1:10\u{2009}000"), "{said}");
    let text = all_page_text(&l);
    assert_eq!(text.matches("1:10\u{2009}000").count(), 1, "{text}");
    assert!(!text.contains("NOT to horizontal scale") && !text.contains("NOT to scale"));
    // At 1:50 000 the 300 m gap (6 mm) is widened, the 500 m one (10 mm) is not: the scale once,
    // with the exception.
    let o = PanelOptions { horizontal_scale_denominator: Some(50_000.0), ..opts("base") };
    let l = panel_layout(&p, &interps(&p), &o, &PrintMeta::default()).expect("panel");
    assert_eq!(l.horizontal.widened_gaps, vec![0]);
    let (said, flagged) = l.horizontal.statement(2);
    assert!(flagged && said.contains("1:50\u{2009}000") && said.contains("except the gaps marked n.t.s."));
    assert_eq!(all_page_text(&l).matches("1:50\u{2009}000").count(), 1);
}

#[test]
fn interval_proportions_read_as_channel_percentages_not_p_values() {
    let mut p = three();
    // Accept SB-1 in A so its intervals are printed.
    p.sections[0].review.push(ReviewDecision::new(BedId(2), ReviewState::Accepted, ""));
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    let t = texts(&l);
    assert!(!t.iter().any(|(s, ..)| s.starts_with("p ")), "no bare p: {t:?}");
    // A: mudstone 0–3 m, sandstone 3–5 m (a channel body), mudstone 5–9 m; cut at 3 m: below it
    // 0 %, above it 2 of 6 m = 33 % (computed).
    assert!(t.iter().any(|(s, ..)| s == "channel 0 %"), "{t:?}");
    assert!(t.iter().any(|(s, ..)| s == "channel 33 %"), "{t:?}");
    // The key explains the label.
    assert!(t.iter().any(|(s, ..)| s == "channel 45 %"));
    assert!(t
        .iter()
        .any(|(s, ..)| s == "channel-body proportion of the interval between accepted boundaries"));
    assert_eq!(draw::interval_proportion_label(0.456), "channel 46 %");
}

#[test]
fn heights_in_notes_and_heads_are_in_the_section_display_unit() {
    use crate::model::LengthUnit;
    let mut p = three();
    p.sections[2].display_unit = LengthUnit::Foot;
    // C (at 300 m, between A and B) has a label no neighbour has, at 5 m = 16.40 ft (5 / 0.3048).
    accept(&mut p.sections[2], 2, Some("SB-9"));
    let l = panel_layout(&p, &interps(&p), &opts("base"), &PrintMeta::default()).expect("panel");
    assert!(
        l.notes.iter().any(|n| n
            == "C: correlation label \"SB-9\" at 16.40 ft has no match in a neighbouring column: not tied."),
        "{:?}",
        l.notes
    );
    // C is 6 m = 19.7 ft thick.
    assert!(texts(&l).iter().any(|(s, ..)| s == "hung on base; 19.7 ft thick"));
}

#[test]
fn a_panel_drawn_in_pieces_prints_as_the_panel_drawn_whole() {
    use crate::layout::sample::generated_section;
    // Three long sections (500, 900, 1,300 beds): every column comes in several pieces.
    let sections: Vec<Section> = [500, 900, 1_300]
        .iter()
        .enumerate()
        .map(|(k, &n)| {
            let mut s = generated_section(n).0;
            s.name = format!("G{k}");
            s.panel_position_m = Some(k as f64 * 500.0);
            s
        })
        .collect();
    let p = Project::new(sections);
    let i = interps(&p);
    let o = PanelOptions {
        layout: LayoutOptions { scale_denominator: 500.0, ..opts("base").layout },
        ..opts("base")
    };
    let meta = PrintMeta::default();
    let whole = panel_layout(&p, &i, &o, &meta).expect("panel");
    let mut pieces: Vec<Vec<Item>> = Vec::new();
    let mut sizes = Vec::new();
    let streamed = panel_layout_in_pieces(&p, &i, &o, &meta, &mut |size, items| {
        sizes.push(size);
        pieces.push(items.to_vec());
        true
    })
    .expect("panel in pieces");
    assert!(sizes.iter().all(|s| *s == (whole.page.width_mm, whole.page.height_mm)));
    assert_eq!(
        (streamed.columns.clone(), streamed.ties.clone()),
        (whole.columns.clone(), whole.ties.clone())
    );
    assert!(streamed.page.items.is_empty(), "the items went to the sink");
    let largest = pieces.iter().map(Vec::len).max().unwrap_or(0);
    assert!(pieces.len() >= 14, "{} pieces", pieces.len());
    assert!(largest * 5 < whole.page.items.len(), "largest piece {largest} of {}", whole.page.items.len());
    // One after another, the pieces print the same page: at 60 dpi at most one pixel in a
    // thousand differs visibly (a tick or a label at a cut drawn twice).
    let joined = Page { items: pieces.concat(), ..whole.page.clone() };
    let a = crate::export::rasterise(&whole.page, 60.0).expect("whole panel rasterises");
    let b = crate::export::rasterise(&joined, 60.0).expect("joined pieces rasterise");
    let differ = a
        .data()
        .chunks_exact(4)
        .zip(b.data().chunks_exact(4))
        .filter(|(p, q)| p.iter().zip(q.iter()).any(|(x, y)| x.abs_diff(*y) > 48))
        .count();
    let total = (a.width() * a.height()) as usize;
    assert!(differ * 1000 <= total, "{differ} of {total} pixels differ");
    // A sink that refuses stops the drawing.
    let mut calls = 0;
    let stopped = panel_layout_in_pieces(&p, &i, &o, &meta, &mut |_, _| {
        calls += 1;
        false
    });
    assert!(stopped.is_ok());
    assert_eq!(calls, 1, "nothing handed over after the sink refused");
}
