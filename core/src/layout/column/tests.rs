//! Column drawing checked on small sections: axis steps, track placement, feet axes, contacts.

use super::frame::axis_step;
use super::*;

#[test]
fn axis_steps_suit_the_scale() {
    // 1:100 → 10 mm per m → 1 m steps; 1:500 → 2 mm per m → 5 m; 1:10 → 0.1 m (common practice).
    assert_eq!(axis_step(10.0), 1.0);
    assert_eq!(axis_step(2.0), 5.0);
    assert_eq!(axis_step(100.0), 0.1);
    assert_eq!(axis_step(20.0), 0.5);
}

#[test]
fn tracks_do_not_overlap() {
    for show in [true, false] {
        let opts = LayoutOptions { show_interpretation: show, ..Default::default() };
        let t = Tracks::new(&opts);
        let mut list = vec![t.axis, t.lithology, t.structures, t.paleocurrents, t.paleosols];
        list.extend([t.storeys, t.bodies, t.proportion, t.regime, t.boundary_labels].into_iter().flatten());
        assert_eq!(list.len(), if show { 10 } else { 5 });
        for w in list.windows(2) {
            assert!(w[0].x_mm + w[0].w_mm <= w[1].x_mm + 1e-9, "{w:?}");
        }
        let last = list[list.len() - 1];
        assert!(last.x_mm + last.w_mm <= t.width_mm + 1e-9);
    }
}

#[test]
fn feet_sections_get_a_feet_axis() {
    use crate::layout::sample::{sample_interpretation, sample_section};
    let mut s = sample_section();
    s.display_unit = LengthUnit::Foot;
    let i = sample_interpretation(&s);
    let opts = LayoutOptions::default();
    let strip = crate::layout::column_strip(&s, &i, &opts);
    let texts: Vec<(&str, f64)> = strip
        .items
        .iter()
        .filter_map(|it| match it {
            Item::Text { text, pos, .. } => Some((text.as_str(), pos.y)),
            _ => None,
        })
        .collect();
    assert!(texts.iter().any(|(t, _)| *t == "height (ft)"));
    // At 1:100 a foot is 3.048 mm (1 ft = 0.3048 m exactly), so labels every 5 ft (15.24 mm).
    // The "100" label sits at 100 ft = 30.48 m above the base.
    let (_, y) = texts.iter().find(|(t, _)| *t == "100").expect("100 ft label");
    let baseline_offset = 0.8;
    assert!((strip.heights.height_m(y - baseline_offset) - 30.48).abs() < 1e-9);
    assert!(!texts.iter().any(|(t, _)| *t == "102"), "no label off the 5 ft grid");
}

#[test]
fn contacts_differ() {
    let mut s = Vec::new();
    draw_contact(Contact::Sharp, 0.0, 10.0, 5.0, &mut s);
    let mut e = Vec::new();
    draw_contact(Contact::Erosional, 0.0, 10.0, 5.0, &mut e);
    let mut g = Vec::new();
    draw_contact(Contact::Gradational, 0.0, 10.0, 5.0, &mut g);
    let Item::Polyline { points, stroke } = &s[0] else { panic!() };
    assert_eq!(points.len(), 2);
    assert!(stroke.dash_mm.is_empty());
    let Item::Polyline { points, .. } = &e[0] else { panic!() };
    assert!(points.len() > 8 && points.iter().any(|p| p.y > 5.5), "scallops dip below the line");
    assert!((points[points.len() - 1].x - 10.0).abs() < 1e-9);
    let Item::Polyline { stroke, .. } = &g[0] else { panic!() };
    assert!(!stroke.dash_mm.is_empty(), "gradational is broken");
}

mod record {
    //! The field-record tracks: sample ids and facies codes placed without overlaps at 1:100 and
    //! 1:500, suggested codes told apart from the geologist's, hover help and legend.
    use super::super::*;
    use crate::layout::legend::{legend_entries, LegendEntry};
    use crate::layout::sample::{sample_interpretation, sample_section};
    use crate::model::{BedId, FaciesCode, GrainSize, Lithology, Sample, Structure};

    /// 60 sandstone beds 0.4 m thick (0.8 mm at 1:500), alternating trough cross-bedded and
    /// ripple laminated, each with two samples 0.2 m apart, and every third bed's code given.
    fn dense() -> Section {
        let mut s = Section::new("Dense");
        s.beds = (0..60u64)
            .map(|k| {
                let mut b = Bed::new(
                    BedId(k + 1),
                    0.4,
                    Lithology::Sandstone,
                    Some(GrainSize::Class(WentworthClass::MediumSand)),
                );
                b.structures = vec![if k % 2 == 0 {
                    Structure::TroughCrossBedding
                } else {
                    Structure::RippleCrossLamination
                }];
                b.samples = vec![
                    Sample { id: format!("D{}", 2 * k + 1), kind: None, height_in_bed_m: Some(0.1) },
                    Sample { id: format!("D{}", 2 * k + 2), kind: None, height_in_bed_m: Some(0.3) },
                ];
                if k % 3 == 0 {
                    b.facies = Some(FaciesCode::Sh);
                }
                b
            })
            .collect();
        s
    }

    fn drawn(s: &Section, scale: f64) -> (Vec<Item>, Tracks) {
        let interp = sample_interpretation(&sample_section());
        let opts =
            LayoutOptions { scale_denominator: scale, show_interpretation: false, ..Default::default() };
        let ctx = ColumnCtx::new(s, &interp, &opts);
        let t = HeightTransform::new(300.0, 0.0, scale);
        let (mut out, mut boxes) = (Vec::new(), Vec::new());
        ctx.draw_range(0.0, ctx.total_m, 0.0, &t, &mut out, &mut boxes);
        (out, ctx.tracks)
    }

    /// Texts wholly or partly inside a track: (text, colour, bounds).
    fn texts_in(out: &[Item], tr: Track) -> Vec<(String, Rgba, RectMm)> {
        out.iter()
            .filter_map(|it| match it {
                Item::Text { text, color, .. } => {
                    let b = it.bounds();
                    (b.x < tr.x_mm + tr.w_mm && b.x + b.w > tr.x_mm).then(|| (text.clone(), *color, b))
                }
                _ => None,
            })
            .collect()
    }

    fn overlap(a: &RectMm, b: &RectMm) -> bool {
        let e = 0.02;
        a.x + e < b.x + b.w && b.x + e < a.x + a.w && a.y + e < b.y + b.h && b.y + e < a.y + a.h
    }

    /// How many samples a label names: "A, B" (2), "A … B (n)" (n), "A +k" (k + 1).
    fn named(label: &str) -> usize {
        if let Some(n) = label.strip_suffix(')').and_then(|l| l.rsplit_once('(')).map(|p| p.1) {
            return n.parse().expect("a count");
        }
        if let Some((_, k)) = label.rsplit_once(" +") {
            return k.parse::<usize>().expect("a count") + 1;
        }
        label.split(", ").count()
    }

    #[test]
    fn sample_ids_never_overlap_and_every_sample_is_named_at_1_100_and_1_500() {
        let s = dense();
        for scale in [100.0, 500.0] {
            let (out, tr) = drawn(&s, scale);
            let st = tr.samples.expect("a samples track: the section has samples");
            let labels = texts_in(&out, st);
            assert!(!labels.is_empty());
            for (i, (a, _, ra)) in labels.iter().enumerate() {
                assert!(
                    ra.x >= st.x_mm - 1e-9 && ra.x + ra.w <= st.x_mm + st.w_mm + 1e-9,
                    "{a} leaves the track"
                );
                for (b, _, rb) in &labels[i + 1..] {
                    assert!(!overlap(ra, rb), "1:{scale}: {a:?} {ra:?} overlaps {b:?} {rb:?}");
                }
            }
            let total: usize = labels.iter().map(|(l, _, _)| named(l)).sum();
            assert_eq!(total, 120, "1:{scale}: every sample in one label");
            if scale == 100.0 {
                // At 1:100 (4 mm a bed) every id is printed in full.
                let all: Vec<&str> = labels.iter().flat_map(|(l, _, _)| l.split(", ")).collect();
                for k in 1..=120 {
                    assert!(all.contains(&format!("D{k}").as_str()), "D{k} missing at 1:100: {all:?}");
                }
            } else {
                assert!(labels.len() < 60, "pooled at 1:500: {} labels", labels.len());
            }
            // One triangle per sample, at its own height: 0.1 m and 0.3 m above each bed's base.
            let t = HeightTransform::new(300.0, 0.0, scale);
            let tips: Vec<f64> = out
                .iter()
                .filter_map(|it| match it {
                    Item::Polygon { points, fill: Some(_), .. }
                        if points.len() == 3 && (points[0].x - st.x_mm).abs() < 1e-9 =>
                    {
                        Some(points[0].y)
                    }
                    _ => None,
                })
                .collect();
            assert_eq!(tips.len(), 120);
            assert!((tips[0] - t.y_mm(0.1)).abs() < 1e-9 && (tips[3] - t.y_mm(0.7)).abs() < 1e-9);
        }
    }

    #[test]
    fn facies_codes_tell_suggested_from_given_and_never_overlap() {
        let s = dense();
        for scale in [100.0, 500.0] {
            let (out, tr) = drawn(&s, scale);
            let ft = tr.facies.expect("a facies track");
            let codes = texts_in(&out, ft);
            for (i, (a, _, ra)) in codes.iter().enumerate() {
                assert!(
                    ra.x >= ft.x_mm - 1e-9 && ra.x + ra.w <= ft.x_mm + ft.w_mm + 1e-9,
                    "{a} leaves the track"
                );
                for (b, _, rb) in &codes[i + 1..] {
                    assert!(!overlap(ra, rb), "1:{scale}: {a:?} overlaps {b:?}");
                }
            }
            // Whatever is shown: a code with "?" is grey, a code without is ink.
            for (t, c, _) in codes.iter().filter(|(t, _, _)| t != "/" && t != "\u{2026}") {
                assert_eq!(*c, if t.ends_with('?') { GREY } else { INK }, "{t}");
            }
            if scale == 100.0 {
                // 4 mm a bed: every bed its own code (60 runs of one bed: codes change every bed).
                // The geologist's Sh in ink, without "?"; the suggested St (trough cross-bedded
                // sand) and Sr (ripple cross-laminated) in grey with "?" (Miall 1996 codes).
                let n = |code: &str| codes.iter().filter(|(t, _, _)| t == code).count();
                assert_eq!((n("Sh"), n("St?"), n("Sr?")), (20, 20, 20), "{codes:?}");
            } else {
                // 0.8 mm a bed: three beds to a label, none of the codes thicker than the others.
                assert!(codes.len() >= 20 && codes.len() <= 60, "{} pieces", codes.len());
            }
        }
    }

    #[test]
    fn record_tracks_come_only_when_asked_for_and_there_is_something_to_show() {
        let s = sample_section();
        let interp = sample_interpretation(&s);
        let opts = LayoutOptions::default();
        // The demo beds carry no samples: no samples track; their rocks suggest codes.
        let tr = Tracks::for_section(&s, &opts);
        assert!(tr.samples.is_none() && tr.facies.is_some());
        assert!(tr.bioturbation.is_none() && tr.photos.is_none() && tr.fossils.is_none(), "off by default");
        let off = LayoutOptions { show_facies: false, show_sample_ids: false, ..Default::default() };
        assert_eq!(Tracks::for_section(&dense(), &off).record_shown(), [false; 5]);
        let mut rich = dense();
        rich.beds[2].bioturbation_index = Some(4);
        rich.beds[2].photos = vec![crate::model::Photo { reference: "IMG_2041".into(), file: None }];
        rich.beds[5].trace_fossils = vec!["Skolithos".into()];
        let all =
            LayoutOptions { show_photos: true, show_bioturbation: true, show_fossils: true, ..opts.clone() };
        let tr = Tracks::for_section(&rich, &all);
        assert_eq!(tr.record_shown(), [true; 5]);
        let mut list = vec![tr.paleosols];
        list.extend([tr.bioturbation, tr.facies, tr.samples, tr.photos, tr.fossils].into_iter().flatten());
        list.extend(tr.storeys);
        for w in list.windows(2) {
            assert!(w[0].x_mm + w[0].w_mm <= w[1].x_mm + 1e-9, "{w:?}");
        }
        // Legend and hover help cover the marks.
        let ctx = ColumnCtx::new(&rich, &interp, &all);
        let entries = legend_entries(&ctx);
        for e in [
            LegendEntry::Bioturbation,
            LegendEntry::FaciesGiven,
            LegendEntry::FaciesSuggested,
            LegendEntry::Sample,
            LegendEntry::Photo,
            LegendEntry::TraceFossil,
        ] {
            assert!(entries.contains(&e), "{e:?} not in {entries:?}");
        }
        assert!(!entries.contains(&LegendEntry::BodyFossil));
        assert!(LegendEntry::FaciesSuggested.label().contains("review"));
        let at = |t: Option<Track>, h: f64| {
            let t = t.expect("track");
            ctx.help_at(Pointed { x_mm: t.x_mm + t.w_mm / 2.0, height_m: h, tolerance_m: 0.05 })
        };
        let bed3 = 1.0; // bed 3: 0.8–1.2 m
        assert_eq!(
            at(ctx.tracks.bioturbation, bed3).as_deref(),
            Some("Bioturbation index 4 in bed 3 (Taylor & Goldring 1993: 0 none, 6 complete).")
        );
        let f = at(ctx.tracks.facies, bed3).expect("facies help");
        assert!(f.starts_with("Bed 3: lithofacies St (") && f.contains("candidate for your review"), "{f}");
        let f = at(ctx.tracks.facies, 0.2).expect("facies help");
        assert!(f.starts_with("Bed 1: lithofacies Sh (") && f.ends_with("given by you."), "{f}");
        let samples = at(ctx.tracks.samples, 0.9).expect("samples help");
        assert!(samples.contains("D5 in bed 3, 0.10 m above its base"), "{samples}");
        assert_eq!(at(ctx.tracks.photos, bed3).as_deref(), Some("Photographs of bed 3: IMG_2041."));
        assert_eq!(
            at(ctx.tracks.fossils, 2.2).as_deref(),
            Some("Fossils in bed 6: trace fossils Skolithos.")
        );
    }

    #[test]
    fn every_record_track_on_a4_portrait_stays_inside_the_margins() {
        use crate::layout::{pages, PrintMeta};
        let mut s = dense();
        for (k, b) in s.beds.iter_mut().enumerate() {
            b.bioturbation_index = Some((k % 7) as u8);
            b.photos = vec![crate::model::Photo { reference: format!("IMG_{}", 2000 + k), file: None }];
            b.body_fossils = vec!["unionid bivalves".into()];
        }
        let interp = sample_interpretation(&sample_section());
        let opts = LayoutOptions {
            show_photos: true,
            show_bioturbation: true,
            show_fossils: true,
            ..LayoutOptions::default()
        };
        // Unnarrowed, the tracks are wider than A4's 186 mm between 12 mm margins.
        assert!(Tracks::for_section(&s, &opts).width_mm > 186.0);
        for page in pages(&s, &interp, &opts, &PrintMeta::default()) {
            for it in &page.items {
                let b = it.bounds();
                assert!(b.x >= 12.0 - 0.5 && b.x + b.w <= 210.0 - 12.0 + 0.5, "{it:?} outside the margins");
            }
        }
    }

    #[test]
    fn shared_labels_shorten_in_steps_and_the_index_bar_grows_by_grade() {
        use super::super::record::{fitted_label, group_labels};
        assert_eq!(group_labels(&["A1"]), vec!["A1"]);
        assert_eq!(group_labels(&["A1", "A2", "A3"]), vec!["A1, A2, A3", "A1 \u{2026} A3 (3)", "A1 +2"]);
        assert!(group_labels(&[]).is_empty());
        let c = group_labels(&["TG-101", "TG-102", "TG-103", "TG-104"]);
        // Wide: the whole list at full size; narrower: the range, then the count, still full size.
        assert_eq!(fitted_label(&c, 60.0), Some((c[0].clone(), SMALL_PT)));
        let w_range = width(&c[1], SMALL_PT);
        assert_eq!(fitted_label(&c, w_range + 0.1), Some((c[1].clone(), SMALL_PT)));
        let w_count = width(&c[2], SMALL_PT);
        assert_eq!(fitted_label(&c, w_count + 0.1), Some((c[2].clone(), SMALL_PT)));
        // Narrower still: shrunk; then shortened with "…" at full size, never wider than the room.
        let (l, size) = fitted_label(&c, w_count * 0.9).expect("shrunk");
        assert!(l == c[2] && size < SMALL_PT && width(&l, size) <= w_count * 0.9 + 1e-9);
        let (l, size) = fitted_label(&c, 3.5).expect("shortened");
        assert!(l.ends_with('\u{2026}') && size == SMALL_PT && width(&l, size) <= 3.5, "{l}");
        // The bioturbation-index bar: 0.6 mm a grade (BI 4 → 2.4 mm), a hairline for 0.
        let mut s = dense();
        s.beds[0].bioturbation_index = Some(4);
        s.beds[1].bioturbation_index = Some(0);
        let interp = sample_interpretation(&sample_section());
        let opts =
            LayoutOptions { show_bioturbation: true, show_interpretation: false, ..Default::default() };
        let ctx = ColumnCtx::new(&s, &interp, &opts);
        let t = HeightTransform::new(300.0, 0.0, 100.0);
        let (mut out, mut boxes) = (Vec::new(), Vec::new());
        ctx.draw_range(0.0, 0.8, 0.0, &t, &mut out, &mut boxes);
        let bars: Vec<f64> = out
            .iter()
            .filter_map(|it| match it {
                Item::Rect { rect, fill: Some(f), .. } if *f == ICHNO_OLIVE => Some(rect.w),
                _ => None,
            })
            .collect();
        assert_eq!(bars, vec![4.0 * ICHNO_MM_PER_GRADE]);
        assert!(out
            .iter()
            .any(|it| matches!(it, Item::Polyline { stroke, .. } if stroke.color == ICHNO_OLIVE)));
    }

    #[test]
    fn the_correlation_panel_draws_and_lists_no_record_marks() {
        use crate::layout::{panel_layout, Datum, PanelOptions, PrintMeta};
        use crate::model::Project;
        // The dense section has samples and suggested codes; the panel's narrow columns have no
        // record tracks, so its legend must not list them either.
        let mut a = dense();
        a.panel_position_m = Some(0.0);
        let mut b = dense();
        b.name = "Dense 2".into();
        b.panel_position_m = Some(500.0);
        let p = Project::new(vec![a, b]);
        let interps: Vec<_> =
            p.sections.iter().map(|s| crate::rules::interpret(s, &Default::default())).collect();
        let opts = PanelOptions { datum: Datum::parse("base"), ..Default::default() };
        let l = panel_layout(&p, &interps, &opts, &PrintMeta::default()).expect("panel");
        let texts: Vec<&str> = l
            .page
            .items
            .iter()
            .filter_map(|it| if let Item::Text { text, .. } = it { Some(text.as_str()) } else { None })
            .collect();
        assert!(!texts.is_empty());
        for t in &texts {
            assert!(!t.starts_with("D1") && !t.contains("suggested code") && !t.contains("sample,"), "{t}");
        }
    }

    #[test]
    fn boundary_lines_leave_the_facies_codes_and_sample_ids_clear() {
        let s = dense();
        let interp = sample_interpretation(&sample_section());
        let opts = LayoutOptions::default();
        let ctx = ColumnCtx::new(&s, &interp, &opts);
        let t = HeightTransform::new(300.0, 0.0, 100.0);
        let (mut out, mut boxes) = (Vec::new(), Vec::new());
        ctx.draw_range(0.0, ctx.total_m, 0.0, &t, &mut out, &mut boxes);
        let st = ctx.tracks.samples.expect("samples track");
        let (lith, regime) = (ctx.tracks.lithology, ctx.tracks.regime.expect("interpretation shown"));
        let lines: Vec<&Vec<PtMm>> = out
            .iter()
            .filter_map(|it| match it {
                Item::Polyline { points, stroke } if stroke.color == BOUNDARY_RED => Some(points),
                _ => None,
            })
            .collect();
        // The sample's boundaries below 24 m: each drawn in two pieces around those tracks.
        assert!(lines.len() >= 2 && lines.len().is_multiple_of(2), "{} pieces", lines.len());
        for p in &lines {
            let (a, b) = (p[0].x.min(p[1].x), p[0].x.max(p[1].x));
            assert!(b <= st.x_mm || a >= st.x_mm + st.w_mm, "a boundary crosses the sample ids: {p:?}");
            let ft = ctx.tracks.facies.expect("facies track");
            assert!(b <= ft.x_mm || a >= ft.x_mm + ft.w_mm, "a boundary crosses the facies codes: {p:?}");
            assert!(a >= lith.x_mm - 1.5 - 1e-9 && b <= regime.x_mm + regime.w_mm + 1e-9);
        }
    }
}
