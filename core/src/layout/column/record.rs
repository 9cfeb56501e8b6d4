//! The field record beside the column: each bed's lithofacies code (the geologist's, else the
//! suggested one, marked as such), the bioturbation index, and marks at a height with their
//! labels — samples with their ids, photographs with their references, fossils with their names.
//! Labels are placed by [`place_marks`] (as the paleocurrent marks are), so no two overlap at
//! any scale: where they would, neighbours share one label.

use super::beds::place_marks;
use super::*;
use crate::layout::MM_PER_PT;
use crate::model::FaciesCode;
use crate::rules::facies::facies_of;

/// The lithofacies code a bed shows and whether it is only suggested (a candidate for the
/// geologist's review) rather than the geologist's own.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct ShownFacies {
    pub code: FaciesCode,
    pub suggested: bool,
}

/// The code a bed shows: the geologist's when given, else the one the rules suggest (if any;
/// see [`facies_of`]).
pub fn shown_facies(bed: &Bed) -> Option<ShownFacies> {
    facies_of(bed).map(|(code, suggested)| ShownFacies { code, suggested })
}

/// A facies code as printed: a suggested code ends in "?" ("St?"), the geologist's does not.
pub fn facies_label(f: ShownFacies) -> String {
    if f.suggested {
        format!("{}?", f.code.code())
    } else {
        f.code.code().to_string()
    }
}

/// The colour a facies code is printed in: ink for the geologist's, grey for a suggested one.
pub fn facies_colour(suggested: bool) -> Rgba {
    if suggested {
        GREY
    } else {
        INK
    }
}

/// Fill of the bioturbation-index bar.
pub const ICHNO_OLIVE: Rgba = Rgba(122, 128, 64, 255);
/// Width of the bioturbation-index bar per grade of the index, mm (6 → 3.6 mm).
pub const ICHNO_MM_PER_GRADE: f64 = 0.6;
/// Photograph marks and references.
pub const PHOTO_TEAL: Rgba = Rgba(20, 100, 110, 255);
/// Fossil marks and names.
pub const FOSSIL_BROWN: Rgba = Rgba(110, 70, 40, 255);

/// Least distance between the baselines of two labels in a record track, mm (a 5.5 pt line).
pub const LABEL_PITCH_MM: f64 = 2.3;
/// Smallest size a label is shrunk to before it is shortened, pt.
const MIN_LABEL_PT: f64 = 4.0;

/// Which field-record tracks the column of `section` gets with `opts`: those asked for that
/// have something to show.
pub fn record_shown(section: &Section, opts: &LayoutOptions) -> tracks::RecordShown {
    let beds = &section.beds;
    [
        opts.show_bioturbation && beds.iter().any(|b| b.bioturbation_index.is_some()),
        opts.show_facies && beds.iter().any(|b| shown_facies(b).is_some()),
        opts.show_sample_ids && beds.iter().any(|b| b.samples.iter().any(|s| !s.id.trim().is_empty())),
        opts.show_photos && beds.iter().any(|b| b.photos.iter().any(|p| !p.reference.trim().is_empty())),
        opts.show_fossils && beds.iter().any(has_fossils),
    ]
}

fn has_fossils(bed: &Bed) -> bool {
    bed.trace_fossils.iter().chain(&bed.body_fossils).any(|n| !n.trim().is_empty())
}

/// A small mark drawn at a height in a record track.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Glyph {
    /// A sample: a filled triangle pointing at the column.
    Sample,
    /// A photograph: a small camera.
    Photo,
    /// Trace fossils: a burrow.
    Trace,
    /// Body fossils: a shell.
    Body,
}

impl Glyph {
    /// Width of the glyph's slot, mm.
    pub const SLOT_MM: f64 = 1.9;

    /// The colour of the glyph and of its labels.
    pub fn colour(self) -> Rgba {
        match self {
            Glyph::Sample => INK,
            Glyph::Photo => PHOTO_TEAL,
            Glyph::Trace | Glyph::Body => FOSSIL_BROWN,
        }
    }

    /// Draw the glyph with the left of its slot at `x` and its middle at `y`.
    pub fn draw(self, x: f64, y: f64, out: &mut Vec<Item>) {
        let c = self.colour();
        match self {
            Glyph::Sample => out.push(Item::Polygon {
                points: vec![
                    PtMm { x, y },
                    PtMm { x: x + 1.5, y: y - 0.65 },
                    PtMm { x: x + 1.5, y: y + 0.65 },
                ],
                fill: Some(c),
                stroke: None,
            }),
            Glyph::Photo => {
                // A body 1.6 × 1.0 mm, a viewfinder hump on top, a round lens.
                out.push(Item::Polygon {
                    points: vec![
                        PtMm { x: x + 0.1, y: y - 0.45 },
                        PtMm { x: x + 0.45, y: y - 0.45 },
                        PtMm { x: x + 0.6, y: y - 0.7 },
                        PtMm { x: x + 1.1, y: y - 0.7 },
                        PtMm { x: x + 1.25, y: y - 0.45 },
                        PtMm { x: x + 1.7, y: y - 0.45 },
                        PtMm { x: x + 1.7, y: y + 0.55 },
                        PtMm { x: x + 0.1, y: y + 0.55 },
                    ],
                    fill: Some(c),
                    stroke: None,
                });
                out.push(Item::Circle {
                    center: PtMm { x: x + 0.9, y: y + 0.05 },
                    radius_mm: 0.3,
                    fill: Some(Rgba::WHITE),
                    stroke: None,
                });
            }
            Glyph::Trace => {
                // A burrow: a U-shaped tube seen in section.
                let pts: Vec<PtMm> = (0..=10)
                    .map(|k| {
                        let a = std::f64::consts::PI * k as f64 / 10.0;
                        PtMm { x: x + 0.85 - 0.6 * a.cos(), y: y - 0.5 + 1.0 * a.sin() }
                    })
                    .collect();
                out.push(Item::Polyline { points: pts, stroke: solid(THIN_MM * 1.6, c) });
            }
            Glyph::Body => {
                // A shell: a half disc with two ribs.
                let mut pts: Vec<PtMm> = (0..=10)
                    .map(|k| {
                        let a = std::f64::consts::PI * k as f64 / 10.0;
                        PtMm { x: x + 0.85 + 0.75 * a.cos(), y: y + 0.4 - 0.9 * a.sin() }
                    })
                    .collect();
                pts.push(pts[0]);
                out.push(Item::Polyline { points: pts, stroke: solid(THIN_MM, c) });
                for dx in [-0.3, 0.3] {
                    out.push(Item::Polyline {
                        points: vec![
                            PtMm { x: x + 0.85, y: y + 0.4 },
                            PtMm { x: x + 0.85 + dx, y: y - 0.35 },
                        ],
                        stroke: solid(HAIR_MM, c),
                    });
                }
            }
        }
    }
}

/// One mark wanted at a height in a record track: where (mm down the page), the glyphs that
/// mark it and the words of its label.
#[derive(Debug, Clone, PartialEq)]
pub struct WantedMark {
    pub y_mm: f64,
    pub glyphs: Vec<Glyph>,
    /// What the label names: sample ids, photograph references, fossil names.
    pub names: Vec<String>,
}

/// The label of a group of marks placed together, longest first: every label, the first and
/// the last with the count ("SC-1 … SC-9 (9)"), the first and how many more ("SC-1 +8").
pub fn group_labels(labels: &[&str]) -> Vec<String> {
    match labels {
        [] => Vec::new(),
        [one] => vec![one.to_string()],
        [first, .., last] => vec![
            labels.join(", "),
            format!("{first} \u{2026} {last} ({})", labels.len()),
            format!("{first} +{}", labels.len() - 1),
        ],
    }
}

/// The first of `candidates` that fits `max_w_mm` at `SMALL_PT` (so labels keep one size where
/// they can), else the first that fits shrunk down to [`MIN_LABEL_PT`], with its size; else the
/// last shortened (its end replaced by "…") until it fits at `SMALL_PT` (the hover help gives
/// it whole).
pub fn fitted_label(candidates: &[String], max_w_mm: f64) -> Option<(String, f64)> {
    for min_pt in [SMALL_PT, MIN_LABEL_PT] {
        for c in candidates {
            if let Some(size) = fit_size(c, max_w_mm, SMALL_PT, min_pt) {
                return Some((c.clone(), size));
            }
        }
    }
    let last: Vec<char> = candidates.last()?.chars().collect();
    (1..last.len()).rev().find_map(|n| {
        let short = format!("{}\u{2026}", last[..n].iter().collect::<String>());
        (width(&short, SMALL_PT) <= max_w_mm).then_some((short, SMALL_PT))
    })
}

/// Baseline of a label whose middle is at `y_mid`, mm (the middle of a capital at that size).
fn baseline(y_mid: f64, size_pt: f64) -> f64 {
    y_mid + size_pt * MM_PER_PT * 0.36
}

/// Draw marks wanted in a record track (absolute left `x`, width `w`): each mark's glyphs at its
/// own height at the left of the track, and the labels beside them placed by [`place_marks`]
/// (neighbours closer than a line share one label, see [`group_labels`]), a hairline leading
/// from a glyph to its label where the label had to move. Returns the labels' baselines.
pub fn draw_marks(x: f64, w: f64, wanted: &[WantedMark], out: &mut Vec<Item>) -> Vec<f64> {
    let slots = wanted.iter().map(|m| m.glyphs.len()).max().unwrap_or(0) as f64;
    let x_label = x + slots * Glyph::SLOT_MM + 0.5;
    let ys: Vec<f64> = wanted.iter().map(|m| m.y_mm).collect();
    let mut baselines = Vec::new();
    for m in wanted {
        for (k, g) in m.glyphs.iter().enumerate() {
            g.draw(x + k as f64 * Glyph::SLOT_MM, m.y_mm, out);
        }
    }
    for placed in place_marks(&ys, LABEL_PITCH_MM) {
        let members = &wanted[placed.members.clone()];
        let labels: Vec<&str> = members.iter().flat_map(|m| m.names.iter().map(String::as_str)).collect();
        let Some((label, size)) = fitted_label(&group_labels(&labels), x + w - x_label - 0.2) else {
            continue;
        };
        for m in members {
            if (m.y_mm - placed.y_mm).abs() > 0.4 {
                let x_end = x + m.glyphs.len() as f64 * Glyph::SLOT_MM;
                out.push(Item::Polyline {
                    points: vec![PtMm { x: x_end, y: m.y_mm }, PtMm { x: x_label - 0.2, y: placed.y_mm }],
                    stroke: solid(HAIR_MM, GREY),
                });
            }
        }
        let colour = members[0].glyphs.first().map(|g| g.colour()).unwrap_or(INK);
        let y = baseline(placed.y_mm, size);
        text(out, x_label, y, &label, size, colour);
        baselines.push(y);
    }
    baselines
}

impl ColumnCtx<'_> {
    /// The field-record tracks of a part of the column.
    pub(super) fn draw_record(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        if let Some(tr) = self.tracks.bioturbation {
            self.draw_bioturbation(tr, part, out);
        }
        if let Some(tr) = self.tracks.facies {
            self.draw_facies(tr, part, out);
        }
        let x0 = part.x0;
        if let Some(tr) = self.tracks.samples {
            draw_marks(x0 + tr.x_mm, tr.w_mm, &self.sample_marks(part), out);
        }
        if let Some(tr) = self.tracks.photos {
            draw_marks(x0 + tr.x_mm, tr.w_mm, &self.photo_marks(part), out);
        }
        if let Some(tr) = self.tracks.fossils {
            draw_marks(x0 + tr.x_mm, tr.w_mm, &self.fossil_marks(part), out);
        }
    }

    /// The part of bed `i` inside the part drawn, as page y of its base and top.
    fn bed_ys(&self, i: usize, part: &Part<'_>) -> Option<(f64, f64)> {
        let (b, tp) = (self.bases_m[i].max(part.lo), self.top_m(i).min(part.hi));
        (tp > b).then(|| (part.t.y_mm(b), part.t.y_mm(tp)))
    }

    /// Where each sample is marked, lowest first: at its height above the bed's base (mid-bed
    /// when none was written), labelled with its id.
    pub(super) fn sample_marks(&self, part: &Part<'_>) -> Vec<WantedMark> {
        let mut v = Vec::new();
        for i in self.beds_in(part.lo, part.hi) {
            let bed = &self.section.beds[i];
            let t = bed.usable_thickness_m();
            let mut at: Vec<(f64, &str)> = bed
                .samples
                .iter()
                .filter(|s| !s.id.trim().is_empty())
                .map(|s| {
                    let h = s
                        .height_in_bed_m
                        .filter(|h| h.is_finite())
                        .map(|h| h.clamp(0.0, t))
                        .unwrap_or(t / 2.0);
                    (self.bases_m[i] + h, s.id.trim())
                })
                .filter(|(h, _)| *h >= part.lo - 1e-9 && *h <= part.hi + 1e-9)
                .collect();
            at.sort_by(|a, b| a.0.total_cmp(&b.0));
            v.extend(at.into_iter().map(|(h, id)| WantedMark {
                y_mm: part.t.y_mm(h),
                glyphs: vec![Glyph::Sample],
                names: vec![id.to_string()],
            }));
        }
        v
    }

    /// One photograph mark per bed with photographs, mid-bed, labelled with their references.
    fn photo_marks(&self, part: &Part<'_>) -> Vec<WantedMark> {
        self.beds_in(part.lo, part.hi)
            .filter_map(|i| {
                let refs: Vec<String> = self.section.beds[i]
                    .photos
                    .iter()
                    .map(|p| p.reference.trim().to_string())
                    .filter(|r| !r.is_empty())
                    .collect();
                let (yb, yt) = self.bed_ys(i, part)?;
                (!refs.is_empty()).then(|| WantedMark {
                    y_mm: (yb + yt) / 2.0,
                    glyphs: vec![Glyph::Photo],
                    names: refs,
                })
            })
            .collect()
    }

    /// One fossil mark per bed with fossils named, mid-bed: a burrow for trace fossils, a shell
    /// for body fossils, labelled with their names (trace fossils first).
    fn fossil_marks(&self, part: &Part<'_>) -> Vec<WantedMark> {
        self.beds_in(part.lo, part.hi)
            .filter_map(|i| {
                let bed = &self.section.beds[i];
                let names = |v: &[String]| -> Vec<String> {
                    v.iter().map(|n| n.trim().to_string()).filter(|n| !n.is_empty()).collect()
                };
                let (traces, bodies) = (names(&bed.trace_fossils), names(&bed.body_fossils));
                let (yb, yt) = self.bed_ys(i, part)?;
                let mut glyphs = Vec::new();
                if !traces.is_empty() {
                    glyphs.push(Glyph::Trace);
                }
                if !bodies.is_empty() {
                    glyphs.push(Glyph::Body);
                }
                (!glyphs.is_empty()).then(|| WantedMark {
                    y_mm: (yb + yt) / 2.0,
                    glyphs,
                    names: traces.into_iter().chain(bodies).collect(),
                })
            })
            .collect()
    }

    /// The bioturbation-index track: a bar as wide as the index (0.6 mm a grade) over each bed
    /// it was logged for, with the index beside it where the bed is tall enough; index 0 (no
    /// bioturbation seen) is a hairline.
    fn draw_bioturbation(&self, tr: Track, part: &Part<'_>, out: &mut Vec<Item>) {
        let x = part.x0 + tr.x_mm + 0.3;
        for i in self.beds_in(part.lo, part.hi) {
            let Some(bi) = self.section.beds[i].bioturbation_index else { continue };
            let Some((yb, yt)) = self.bed_ys(i, part) else { continue };
            let bi = bi.min(6);
            if bi == 0 {
                out.push(Item::Polyline {
                    points: vec![PtMm { x, y: yb }, PtMm { x, y: yt }],
                    stroke: solid(HAIR_MM, ICHNO_OLIVE),
                });
            } else {
                out.push(Item::Rect {
                    rect: RectMm { x, y: yt, w: bi as f64 * ICHNO_MM_PER_GRADE, h: yb - yt },
                    fill: Some(ICHNO_OLIVE),
                    stroke: None,
                });
            }
            if yb - yt >= 2.4 {
                // The index just right of its bar, so it reads with the bar, not the next track.
                let digit = bi.to_string();
                let size = SMALL_PT - 0.5;
                let xd = x + bi as f64 * ICHNO_MM_PER_GRADE + 0.3;
                text(out, xd, baseline((yb + yt) / 2.0, size), &digit, size, INK);
            }
        }
    }

    /// The lithofacies track: each run of beds with one code is one interval, a hairline where
    /// the code changes, its code at its middle; codes are placed by [`place_marks`], so runs
    /// too thin for their own code share one label ("Sr/Fl", or the thickest code and "…" where
    /// they do not all fit). Suggested codes are grey with "?".
    fn draw_facies(&self, tr: Track, part: &Part<'_>, out: &mut Vec<Item>) {
        let (xa, xb) = (part.x0 + tr.x_mm, part.x0 + tr.x_mm + tr.w_mm);
        // Runs: (code shown, base y, top y).
        let mut runs: Vec<(Option<ShownFacies>, f64, f64)> = Vec::new();
        for i in self.beds_in(part.lo, part.hi) {
            let Some((yb, yt)) = self.bed_ys(i, part) else { continue };
            let f = shown_facies(&self.section.beds[i]);
            match runs.last_mut() {
                Some(last) if last.0 == f => last.2 = yt,
                _ => runs.push((f, yb, yt)),
            }
        }
        for w in runs.windows(2) {
            let y = w[1].1;
            out.push(Item::Polyline {
                points: vec![PtMm { x: xa, y }, PtMm { x: xb, y }],
                stroke: solid(HAIR_MM, GREY),
            });
        }
        // Coded runs: (code, middle y, height on the page).
        let coded: Vec<(ShownFacies, f64, f64)> =
            runs.iter().filter_map(|(f, yb, yt)| f.map(|f| (f, (yb + yt) / 2.0, yb - yt))).collect();
        let ys: Vec<f64> = coded.iter().map(|c| c.1).collect();
        for placed in place_marks(&ys, LABEL_PITCH_MM) {
            // A shared label names the codes thickest in its runs first, so that where only one
            // fits it is the one that makes up most of the stretch.
            let mut codes: Vec<(ShownFacies, f64)> = Vec::new();
            for (f, _, h) in &coded[placed.members.clone()] {
                match codes.iter_mut().find(|c| c.0 == *f) {
                    Some(c) => c.1 += h,
                    None => codes.push((*f, *h)),
                }
            }
            codes.sort_by(|a, b| b.1.total_cmp(&a.1));
            let codes: Vec<ShownFacies> = codes.into_iter().map(|c| c.0).collect();
            draw_codes(&codes, xa + 0.4, xb - 0.3, placed.y_mm, out);
        }
    }
}

/// Codes of one label, each in its own colour ("St/Sr?"), from `xa`, fitted into `xb − xa`:
/// all codes; else the first and "…".
fn draw_codes(codes: &[ShownFacies], xa: f64, xb: f64, y_mid: f64, out: &mut Vec<Item>) {
    let pieces = |n: usize| -> Vec<(String, Rgba)> {
        let mut v = Vec::new();
        for (k, f) in codes.iter().take(n).enumerate() {
            if k > 0 {
                v.push(("/".to_string(), GREY));
            }
            v.push((facies_label(*f), facies_colour(f.suggested)));
        }
        if n < codes.len() {
            v.push(("\u{2026}".to_string(), GREY));
        }
        v
    };
    let whole = |p: &[(String, Rgba)]| p.iter().map(|(s, _)| s.as_str()).collect::<String>();
    for n in [codes.len(), 1] {
        let p = pieces(n);
        let Some(size) = fit_size(&whole(&p), xb - xa, SMALL_PT, MIN_LABEL_PT) else { continue };
        let y = baseline(y_mid, size);
        let mut x = xa;
        for (s, c) in &p {
            text(out, x, y, s, size, *c);
            x += width(s, size);
        }
        return;
    }
}
