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
