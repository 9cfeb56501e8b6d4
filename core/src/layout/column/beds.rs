//! The beds of a segment: outline at their grain size, lithology pattern, basal contact,
//! structures, paleocurrents and paleosols.

use super::*;

impl ColumnCtx<'_> {
    pub(super) fn draw_bed(
        &self,
        i: usize,
        part: &Part<'_>,
        g: &GrainScale,
        out: &mut Vec<Item>,
        boxes: &mut Vec<BedBox>,
    ) {
        let Part { lo, hi, x0, t } = *part;
        let bed = &self.section.beds[i];
        let (base, top) = (self.bases_m[i], self.top_m(i));
        let (b, tp) = (base.max(lo), top.min(hi));
        let xl = g.left_mm;
        if tp <= b {
            // Zero-thickness or out of range: nothing to draw, but keep its place for picking.
            if top >= lo && base <= hi && bed.usable_thickness_m() == 0.0 {
                boxes.push(BedBox { bed_index: i, rect: RectMm { x: xl, y: t.y_mm(base), w: 0.0, h: 0.0 } });
            }
            return;
        }
        let (yb, yt) = (t.y_mm(b), t.y_mm(tp));
        let (xb, xt) = (self.right_x(i, b, g), self.right_x(i, tp, g));
        let outline =
            [PtMm { x: xl, y: yb }, PtMm { x: xb, y: yb }, PtMm { x: xt, y: yt }, PtMm { x: xl, y: yt }];
        // Anchor patterns to the section base so they run on across beds and segments.
        fill_bed(bed.lithology, &outline, PtMm { x: xl, y: t.y_mm(0.0) }, out);
        out.push(Item::Polyline {
            points: vec![PtMm { x: xb, y: yb }, PtMm { x: xt, y: yt }],
            stroke: solid(LINE_MM, INK),
        });
        // Basal contact, drawn across the wider of this bed and the one below.
        if base >= lo - 1e-9 {
            let below = if i > 0 { self.right_x(i - 1, base, g) } else { xb };
            let xr = xb.max(below);
            let contact = if i == 0 { Contact::Sharp } else { bed.base_contact };
            draw_contact(contact, xl, xr, yb, out);
        } else {
            // The bed continues from the previous segment.
            out.push(Item::Polyline {
                points: vec![PtMm { x: xl, y: yb }, PtMm { x: xb, y: yb }],
                stroke: dashed(HAIR_MM, GREY, &[0.6, 0.6]),
            });
        }
        if top <= hi + 1e-9 {
            if i + 1 == self.section.beds.len() {
                out.push(Item::Polyline {
                    points: vec![PtMm { x: xl, y: yt }, PtMm { x: xt, y: yt }],
                    stroke: solid(LINE_MM, INK),
                });
            }
        } else {
            out.push(Item::Polyline {
                points: vec![PtMm { x: xl, y: yt }, PtMm { x: xt, y: yt }],
                stroke: dashed(HAIR_MM, GREY, &[0.6, 0.6]),
            });
        }
        let h_mm = yb - yt;
        if bed.is_covered() && h_mm >= 2.2 {
            let label = "no exposure";
            let size = fit_size(label, xb.min(xt) - xl - 1.0, SMALL_PT, 3.5);
            if let Some(size) = size {
                let w = width(label, size);
                let x = xl + ((xb.min(xt) - xl) - w) / 2.0;
                let y = (yb + yt) / 2.0 + size * 0.35 * 0.353;
                out.push(Item::Rect {
                    rect: RectMm {
                        x: x - 0.4,
                        y: y - size * 0.353 * 0.85,
                        w: w + 0.8,
                        h: size * 0.353 * 1.2,
                    },
                    fill: Some(Rgba::WHITE),
                    stroke: None,
                });
                text(out, x, y, label, size, GREY);
            }
        }
        boxes.push(BedBox { bed_index: i, rect: RectMm { x: xl, y: yt, w: xb.max(xt) - xl, h: h_mm } });
        let y_mid = (yb + yt) / 2.0;
        self.draw_structures(bed, x0, y_mid, h_mm, out);
        self.draw_paleocurrents(bed, x0, y_mid, h_mm, out);
        // Beds of a profile are drawn as one mark by `draw_paleosol_profiles`.
        if bed.paleosol != PaleosolDevelopment::None && !self.in_profile.get(i).copied().unwrap_or(false) {
            let tr = self.tracks.paleosols;
            let w = paleosol_bar_mm(bed.paleosol);
            out.push(Item::Rect {
                rect: RectMm { x: x0 + tr.x_mm + 0.5, y: yt, w, h: h_mm },
                fill: Some(PALEOSOL_BROWN),
                stroke: None,
            });
        }
    }

    /// One mark per paleosol profile in the paleosol track: a bar as wide as the profile's
    /// maturity over its whole height (however many beds its horizons were logged as), outlined,
    /// with a tick at the profile's top.
    pub(super) fn draw_paleosol_profiles(&self, part: &Part<'_>, out: &mut Vec<Item>) {
        let Part { lo, hi, x0, t } = *part;
        let tr = self.tracks.paleosols;
        for p in &self.interp.paleosols[self.spans.paleosols.range(lo, hi)] {
            let (b, tp) = (p.base_m.max(lo), p.top_m.min(hi));
            if tp.is_nan() || b.is_nan() || tp <= b {
                continue;
            }
            let (yb, yt) = (t.y_mm(b), t.y_mm(tp));
            let w = paleosol_bar_mm(p.maturity).max(0.6);
            let x = x0 + tr.x_mm + 0.5;
            out.push(Item::Rect {
                rect: RectMm { x, y: yt, w, h: yb - yt },
                fill: Some(PALEOSOL_BROWN),
                stroke: Some(solid(HAIR_MM, INK)),
            });
            if p.top_m <= hi + 1e-9 {
                out.push(Item::Polyline {
                    points: vec![PtMm { x: x - 0.4, y: yt }, PtMm { x: x + tr.w_mm - 0.6, y: yt }],
                    stroke: solid(THIN_MM, INK),
                });
            }
        }
    }

    fn draw_structures(&self, bed: &Bed, x0: f64, y_mid: f64, h_mm: f64, out: &mut Vec<Item>) {
        if bed.structures.is_empty() {
            return;
        }
        let tr = self.tracks.structures;
        let size = (h_mm * 0.9).clamp(2.0, 3.6);
        let pitch = size + 1.0;
        let fit = ((tr.w_mm + 1.0) / pitch).floor().max(1.0) as usize;
        let n = bed.structures.len();
        let shown = if n > fit { fit - 1 } else { n };
        for (k, s) in bed.structures.iter().take(shown).enumerate() {
            let c = PtMm { x: x0 + tr.x_mm + size / 2.0 + k as f64 * pitch, y: y_mid };
            structure_symbol(*s, c, size, out);
        }
        if shown < n {
            let label = format!("+{}", n - shown);
            text(out, x0 + tr.x_mm + shown as f64 * pitch, y_mid + 0.8, &label, SMALL_PT, INK);
        }
    }

    fn draw_paleocurrents(&self, bed: &Bed, x0: f64, y_mid: f64, h_mm: f64, out: &mut Vec<Item>) {
        let readings: Vec<f64> = bed.paleocurrents_deg.iter().copied().filter(|a| a.is_finite()).collect();
        if readings.is_empty() {
            return;
        }
        let tr = self.tracks.paleocurrents;
        let c = PtMm { x: x0 + tr.x_mm + tr.w_mm / 2.0, y: y_mid };
        if readings.len() >= 4 {
            paleocurrent_rose(c, &readings, (tr.w_mm / 2.0 - 0.5).min(3.8), out);
        } else {
            let len = (h_mm.max(3.0)).min(tr.w_mm - 1.5).min(5.0);
            for a in readings {
                paleocurrent_arrow(c, a, len, INK, out);
            }
        }
    }
}

/// Width of the paleosol bar for a development grade, mm.
pub fn paleosol_bar_mm(dev: PaleosolDevelopment) -> f64 {
    match dev {
        PaleosolDevelopment::None => 0.0,
        PaleosolDevelopment::Weak => 1.2,
        PaleosolDevelopment::Moderate => 2.4,
        PaleosolDevelopment::Strong => 3.6,
        PaleosolDevelopment::VeryStrong => 4.8,
    }
}

/// Draw a basal contact from xl to xr at y: straight (sharp), scalloped (erosional) or broken
/// (gradational).
pub fn draw_contact(contact: Contact, xl: f64, xr: f64, y: f64, out: &mut Vec<Item>) {
    match contact {
        Contact::Sharp => out.push(Item::Polyline {
            points: vec![PtMm { x: xl, y }, PtMm { x: xr, y }],
            stroke: solid(LINE_MM, INK),
        }),
        Contact::Gradational => out.push(Item::Polyline {
            points: vec![PtMm { x: xl, y }, PtMm { x: xr, y }],
            stroke: dashed(LINE_MM, INK, &[1.2, 0.8]),
        }),
        Contact::Erosional => {
            // Scallops cut down into the bed below: arcs of ~2.4 mm span, 0.7 mm deep.
            let span = xr - xl;
            let n = (span / 2.4).round().max(1.0) as usize;
            let w = span / n as f64;
            let mut pts = Vec::with_capacity(n * 8 + 1);
            for k in 0..n {
                for s in 0..8 {
                    let f = s as f64 / 8.0;
                    pts.push(PtMm {
                        x: xl + (k as f64 + f) * w,
                        y: y + 0.7 * (f * std::f64::consts::PI).sin(),
                    });
                }
            }
            pts.push(PtMm { x: xr, y });
            out.push(Item::Polyline { points: pts, stroke: solid(LINE_MM * 1.2, INK) });
        }
    }
}
