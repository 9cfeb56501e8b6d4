//! Markers and tie pairing: the named levels of each section (surfaces, accepted boundaries and
//! their correlation labels), the datum found among them, and which levels of neighbouring
//! columns are tied.

use super::{PanelColumn, TieLine};
use crate::layout::column::bed_bases_m;
use crate::layout::items::PtMm;
use crate::model::{Bed, Project, ReviewState, Section};
use serde::Serialize;

/// What the panel is hung on.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub enum Datum {
    /// Each section's base (0 m).
    Base,
    /// A named surface (`Bed::base_surface`), an accepted boundary's correlation label, or an
    /// accepted sequence boundary by its marker name (see [`section_markers`]); a name is
    /// looked up before a label, each exactly first and then ignoring ASCII case.
    Named(String),
}

impl Datum {
    /// `base` (any case) for the section base, anything else for a marker name.
    pub fn parse(text: &str) -> Datum {
        let t = text.trim();
        if t.eq_ignore_ascii_case("base") {
            Datum::Base
        } else {
            Datum::Named(t.to_string())
        }
    }

    /// As printed in the header.
    pub fn label(&self) -> String {
        match self {
            Datum::Base => "section base".to_string(),
            Datum::Named(n) => n.clone(),
        }
    }
}

/// A named level in a section that the panel can hang on or tie between.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Marker {
    /// The surface's name; for an accepted boundary on an unnamed bed boundary,
    /// `accepted:<section>@<height, m, 2 decimals>`.
    pub name: String,
    /// Height above the section base, m.
    pub height_m: f64,
    /// True when the geologist accepted a sequence boundary here.
    pub accepted: bool,
    /// True for an accepted boundary with neither a surface name nor a correlation label (tied by
    /// order, not by name).
    pub unnamed: bool,
    /// True when `name` is a surface name (`Bed::base_surface`).
    pub surface: bool,
    /// The correlation label of an accepted boundary (trimmed); `None` when it has none, or when
    /// a lower accepted boundary of the section already carries it.
    pub link: Option<String>,
}

/// The markers of one section and what the panel notes about them.
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct SectionMarkers {
    /// Named surfaces and accepted boundaries, lowest first.
    pub markers: Vec<Marker>,
    /// Surface names that occur more than once (the lowest is used), in order met.
    pub repeated_names: Vec<String>,
    /// Correlation labels on more than one accepted boundary: (label, height of an unused one, m).
    pub repeated_links: Vec<(String, f64)>,
    /// Correlation labels on boundaries that are not accepted: (label, height, m); kept, not drawn.
    pub unaccepted_links: Vec<(String, f64)>,
}

/// Name given to an accepted boundary at an unnamed bed boundary.
pub fn accepted_marker_name(section: &str, height_m: f64) -> String {
    format!("accepted:{section}@{height_m:.2}")
}

/// Named surfaces and accepted boundaries of a section, lowest first. A surface name that occurs
/// twice keeps its lowest occurrence, and so does a correlation label; the others are listed for
/// a note, as are labels on boundaries that are not accepted.
pub fn section_markers(section: &Section) -> SectionMarkers {
    let ctx_bases = bed_bases_m(section);
    let mut out = SectionMarkers::default();
    for (i, bed) in section.beds.iter().enumerate() {
        let decision = section.decision_for(bed.id);
        let accepted = decision.is_some_and(|d| d.state == ReviewState::Accepted);
        let label = decision.and_then(|d| d.link_label());
        let surface = bed.base_surface.as_ref().map(|s| s.name.trim()).filter(|n| !n.is_empty());
        let h = ctx_bases[i];
        if let (Some(l), false) = (label, accepted) {
            out.unaccepted_links.push((l.to_string(), h));
        }
        let mut link = label.filter(|_| accepted).map(str::to_string);
        if let Some(l) = &link {
            if out.markers.iter().any(|m| m.link.as_deref() == Some(l.as_str())) {
                out.repeated_links.push((l.clone(), h));
                link = None;
            }
        }
        let labelled = accepted && label.is_some();
        let (name, unnamed) = match (surface, accepted) {
            (Some(n), _) => (n.to_string(), false),
            (None, true) => (accepted_marker_name(&section.name, h), !labelled),
            (None, false) => continue,
        };
        if out.markers.iter().any(|m| m.name == name) {
            out.repeated_names.push(name);
            continue;
        }
        out.markers.push(Marker { name, height_m: h, accepted, unnamed, surface: surface.is_some(), link });
    }
    out
}

/// Height of a section's top (m): the sum of its beds' usable thicknesses, lowest first.
pub(super) fn top_m(section: &Section) -> f64 {
    section.beds.iter().map(Bed::usable_thickness_m).fold(0.0, |h, t| h + t)
}

/// The marker a datum names in a section: a surface or marker name first, then a correlation
/// label, each exact first and then ignoring ASCII case.
pub fn find_marker<'m>(markers: &'m [Marker], name: &str) -> Option<&'m Marker> {
    let link_is = |m: &Marker, exact: bool| {
        m.link.as_deref().is_some_and(|l| if exact { l == name } else { l.eq_ignore_ascii_case(name) })
    };
    markers
        .iter()
        .find(|m| m.name == name)
        .or_else(|| markers.iter().find(|m| m.name.eq_ignore_ascii_case(name)))
        .or_else(|| markers.iter().find(|m| link_is(m, true)))
        .or_else(|| markers.iter().find(|m| link_is(m, false)))
}

/// Height of the datum in each section (m); `None` where the section lacks it.
pub(super) fn datum_heights(markers: &[SectionMarkers], datum: &Datum) -> Vec<Option<f64>> {
    match datum {
        Datum::Base => vec![Some(0.0); markers.len()],
        Datum::Named(name) => {
            markers.iter().map(|m| find_marker(&m.markers, name).map(|m| m.height_m)).collect()
        }
    }
}

/// All marker names and correlation labels of a project, sorted, for the unknown-datum message.
pub(super) fn all_marker_names(project: &Project) -> Vec<String> {
    let mut v: Vec<String> = project
        .sections
        .iter()
        .flat_map(|s| {
            section_markers(s).markers.into_iter().flat_map(|m| std::iter::once(m.name).chain(m.link))
        })
        .collect();
    v.sort();
    v.dedup();
    v
}

/// How two markers in neighbouring columns came to be tied.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum TieKind {
    /// Accepted boundaries carrying the same correlation label.
    Link,
    /// Surfaces of the same name.
    Name,
    /// Unnamed, unlabelled accepted boundaries paired in stratigraphic order.
    Order,
}

/// Two tied markers: (index in the left column's markers, index in the right's, how).
pub type TiePair = (usize, usize, TieKind);

/// Which markers of two neighbouring columns are tied: (index in `left`, index in `right`, how),
/// links first, then names (unless the same two levels are already linked), then order. The
/// second value gives the counts of unnamed accepted boundaries when both columns have some but
/// not the same number, so that nothing says which goes with which.
pub fn tie_pairs(left: &[Marker], right: &[Marker]) -> (Vec<TiePair>, Option<(usize, usize)>) {
    let mut pairs: Vec<TiePair> = Vec::new();
    for (i, m) in left.iter().enumerate() {
        let Some(l) = &m.link else { continue };
        if let Some(j) = right.iter().position(|o| o.link.as_ref() == Some(l)) {
            pairs.push((i, j, TieKind::Link));
        }
    }
    for (i, m) in left.iter().enumerate().filter(|(_, m)| m.surface) {
        if let Some(j) = right.iter().position(|o| o.surface && o.name == m.name) {
            if !pairs.iter().any(|&(a, b, _)| (a, b) == (i, j)) {
                pairs.push((i, j, TieKind::Name));
            }
        }
    }
    let ua: Vec<usize> = (0..left.len()).filter(|&i| left[i].unnamed).collect();
    let ub: Vec<usize> = (0..right.len()).filter(|&j| right[j].unnamed).collect();
    let mut unpaired = None;
    if ua.len() == ub.len() {
        pairs.extend(ua.into_iter().zip(ub).map(|(i, j)| (i, j, TieKind::Order)));
    } else if !ua.is_empty() && !ub.is_empty() {
        unpaired = Some((ua.len(), ub.len()));
    }
    (pairs, unpaired)
}

/// The tie lines between neighbouring columns, left to right, with the notes they need: pairs of
/// columns whose unnamed accepted boundaries cannot be paired, then correlation labels that found
/// no match in a neighbour. A tie runs from the right edge of the left column's strip to just
/// left of the right column's lithology track (`lithology_x_mm` from the column's left edge).
/// `sections` are the project's (for the unit heights are written in).
pub(super) fn tie_lines(
    sections: &[Section],
    columns: &[PanelColumn],
    markers: &[SectionMarkers],
    lithology_x_mm: f64,
) -> (Vec<TieLine>, Vec<String>) {
    let mut ties: Vec<TieLine> = Vec::new();
    let mut notes: Vec<String> = Vec::new();
    // Linked markers that found their label in a neighbour: (column, marker index).
    let mut linked_ends: Vec<(usize, usize)> = Vec::new();
    for k in 0..columns.len().saturating_sub(1) {
        let (a, b) = (&columns[k], &columns[k + 1]);
        let (ma, mb) = (&markers[a.section_index].markers, &markers[b.section_index].markers);
        let (pairs, unpaired) = tie_pairs(ma, mb);
        if let Some((na, nb)) = unpaired {
            notes.push(format!(
                "{} and {} have {na} and {nb} accepted boundaries without surface names or correlation labels: not tied (name the surfaces or give them labels to tie them).",
                a.name, b.name
            ));
        }
        for (i, j, kind) in pairs {
            let (m, o) = (&ma[i], &mb[j]);
            let from = PtMm { x: a.x_mm + a.width_mm, y: a.heights.y_mm(m.height_m) };
            let to = PtMm { x: b.x_mm + lithology_x_mm - 1.0, y: b.heights.y_mm(o.height_m) };
            let name = match (kind, &m.link) {
                (TieKind::Link, Some(l)) => {
                    linked_ends.extend([(k, i), (k + 1, j)]);
                    l.clone()
                }
                _ => m.name.clone(),
            };
            ties.push(TieLine {
                name,
                accepted: m.accepted && o.accepted,
                linked: kind == TieKind::Link,
                left: k,
                right: k + 1,
                left_height_m: m.height_m,
                right_height_m: o.height_m,
                from,
                to,
            });
        }
    }
    for (k, c) in columns.iter().enumerate() {
        for (i, m) in markers[c.section_index].markers.iter().enumerate() {
            if let Some(l) = m.link.as_ref().filter(|_| !linked_ends.contains(&(k, i))) {
                notes.push(format!(
                    "{}: correlation label {l:?} at {} has no match in a neighbouring column: not tied.",
                    c.name,
                    super::words::height_text(&sections[c.section_index], m.height_m)
                ));
            }
        }
    }
    (ties, notes)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pairing_rules() {
        let m = |name: &str, h: f64, surface: bool, unnamed: bool, link: Option<&str>| Marker {
            name: name.into(),
            height_m: h,
            accepted: unnamed || link.is_some(),
            unnamed,
            surface,
            link: link.map(str::to_string),
        };
        let left = [
            m("SB-1", 1.0, true, false, None),
            m("accepted:L@2.00", 2.0, false, true, None),
            m("accepted:L@3.00", 3.0, false, false, Some("X")),
            m("T", 4.0, true, false, Some("Y")),
        ];
        let right = [
            m("accepted:R@0.50", 0.5, false, false, Some("Y")),
            m("SB-1", 1.5, true, false, None),
            m("accepted:R@2.50", 2.5, false, true, None),
            m("T", 6.0, true, false, None),
            m("accepted:R@7.00", 7.0, false, false, Some("X")),
        ];
        let (pairs, unpaired) = tie_pairs(&left, &right);
        // Links first (X: 2→4, Y: 3→0), then names (SB-1; T 3→3 is a different level from the
        // link Y 3→0, so both are drawn), then order (one unnamed each side).
        assert_eq!(
            pairs,
            vec![
                (2, 4, TieKind::Link),
                (3, 0, TieKind::Link),
                (0, 1, TieKind::Name),
                (3, 3, TieKind::Name),
                (1, 2, TieKind::Order)
            ]
        );
        assert_eq!(unpaired, None);
        // Two unnamed against one: no order pairs, and the counts are returned for the note.
        let (pairs, unpaired) =
            tie_pairs(&left[..2], &[right[2].clone(), m("accepted:R@9.00", 9.0, false, true, None)]);
        assert_eq!(pairs, vec![]);
        assert_eq!(unpaired, Some((1, 2)));
    }
}
