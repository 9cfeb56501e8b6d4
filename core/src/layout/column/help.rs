//! Words for what the pointer rests on in a column: each track's title and what it shows, and
//! what a mark at a height in a track is (a bed, a structure symbol, a paleocurrent, a paleosol
//! mark, a storey or body bracket, a regime, a boundary line, a named surface). The screen shows
//! them as hover help; they are worked out from the section and its interpretation, not from the
//! drawn items, with the same track positions the drawing uses.

use super::*;
use crate::rules::{DrainageBasis, PaleosolProfile, ProfileEvidence, RegimeInterval};

/// One track of the column, as the hover help names it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub enum TrackKind {
    Axis,
    Lithology,
    Structures,
    Paleocurrents,
    Paleosols,
    /// Bioturbation index (field record).
    Bioturbation,
    /// Lithofacies codes (field record).
    Facies,
    Samples,
    Photos,
    Fossils,
    Storeys,
    Bodies,
    Proportion,
    Regime,
    BoundaryLabels,
    /// The k-th measured-curve track.
    Curve(usize),
}

impl TrackKind {
    /// The title printed above the track, one line each (the height axis says its unit itself).
    pub fn title_lines(self) -> &'static [&'static str] {
        match self {
            TrackKind::Axis => &["height"],
            TrackKind::Lithology => &["lithology", "grain size \u{2192}"],
            TrackKind::Structures => &["structures"],
            TrackKind::Paleocurrents => &["paleocurrent"],
            TrackKind::Paleosols => &["paleosol"],
            TrackKind::Bioturbation => &["bioturbation index"],
            TrackKind::Facies => &["lithofacies"],
            TrackKind::Samples => &["samples"],
            TrackKind::Photos => &["photos"],
            TrackKind::Fossils => &["fossils"],
            TrackKind::Storeys => &["storeys"],
            TrackKind::Bodies => &["channel bodies"],
            TrackKind::Proportion => &["channel-body", "proportion"],
            TrackKind::Regime => &["accommodation"],
            TrackKind::BoundaryLabels => &["sequence", "boundaries,", "surfaces"],
            TrackKind::Curve(_) => &["measured curve"],
        }
    }

    /// What the track shows, in a sentence or two (hover help on its header).
    pub fn help(self) -> &'static str {
        match self {
            TrackKind::Axis => "Height above the base of the section, in the section's display unit.",
            TrackKind::Lithology => {
                "Each bed in its rock's pattern, as wide as its grain size (Wentworth classes, mud at \
                 left, gravel at right): a sloping right edge is a bed that fines or coarsens upward. \
                 The line at a bed's base is its contact: straight sharp, scalloped erosional, \
                 dashed gradational."
            }
            TrackKind::Structures => {
                "Sedimentary structures logged in each bed, one symbol each; point at a symbol for \
                 its name."
            }
            TrackKind::Paleocurrents => {
                "Paleocurrent directions with north up: an arrow per reading, or a rose of 30\u{b0} \
                 sectors from four readings on."
            }
            TrackKind::Paleosols => {
                "Fossil soils: a brown bar as wide as the soil's development (weak to very strong). \
                 A profile of several horizons is one outlined bar with a tick at its top, as wide \
                 as its maturity."
            }
            TrackKind::Bioturbation => {
                "Bioturbation index 0\u{2013}6 (Taylor & Goldring 1993): how much of the bed's \
                 fabric burrowing has destroyed, from 0 (none) to 6 (complete). The bar is 0.6 mm \
                 wide a grade, with the index beside it where the bed has room; a hairline is 0."
            }
            TrackKind::Facies => {
                "Lithofacies code of each bed (Miall 1978, 1996). In black, the code you gave; in grey with \
                 \"?\", the code suggested from the bed's rock, grain size and structures: a \
                 candidate for your review until you confirm or change it. Beds too thin for a \
                 code of their own share one label (\"Sr/Fl\"); a hairline marks where the code \
                 changes."
            }
            TrackKind::Samples => {
                "Samples (filled triangles) at the height they were taken, mid-bed when no height \
                 was written, with their ids. Where ids would overlap, neighbours share one label: \
                 all ids, else the first and last with the count (\"A \u{2026} B (5)\"), else the \
                 first and how many more."
            }
            TrackKind::Photos => {
                "Photographs (camera marks) of each bed, with their references (file names or \
                 numbers); neighbours share a label where they would overlap."
            }
            TrackKind::Fossils => {
                "Fossils named in each bed: a burrow for trace fossils, a shell for body fossils, \
                 with their names (trace fossils first); neighbours share a label where they \
                 would overlap."
            }
            TrackKind::Storeys => {
                "Storeys: each thin bracket is one channel-filling episode, from an erosional base \
                 to the next such base or the fines that cap it. Found by the rules: candidates for \
                 your review."
            }
            TrackKind::Bodies => {
                "Channel bodies: storeys stacked with only thin drapes between them, labelled with \
                 their stacking, storeys and thickness (MS = multi-storey, SS = single-storey). A \
                 dotted open end means the body runs on beyond what is seen, so its thickness is a \
                 minimum (\u{2265}). Found by the rules: candidates for your review."
            }
            TrackKind::Proportion => {
                "Channel-body proportion: the share of channel deposits in a moving window (solid \
                 curve) and between boundaries (dashed steps), 0 at left to 1 at right."
            }
            TrackKind::Regime => {
                "Accommodation regime of each stretch between boundaries: low (amalgamated bodies, \
                 little floodplain), high (isolated bodies in thick fines) or undetermined. Called \
                 by the rules: a candidate for your review."
            }
            TrackKind::BoundaryLabels => {
                "Candidate sequence boundaries (red lines): SB? unreviewed, SB accepted, rej. \
                 rejected; labelled with the surface name or correlation label, else the strength \
                 class of their evidence (weak, moderate, strong), and the thicker an unreviewed \
                 line, the stronger its evidence. Names of other surfaces at bed bases. Point at a \
                 line for its evidence."
            }
            TrackKind::Curve(_) => "A measured curve against height; its value axis is under the column.",
        }
    }
}

impl Tracks {
    /// The tracks left to right with their extent (interpretation tracks only when shown,
    /// measured curves last).
    pub fn in_order(&self) -> Vec<(TrackKind, Track)> {
        let mut v = vec![
            (TrackKind::Axis, self.axis),
            (TrackKind::Lithology, self.lithology),
            (TrackKind::Structures, self.structures),
            (TrackKind::Paleocurrents, self.paleocurrents),
            (TrackKind::Paleosols, self.paleosols),
        ];
        let record = [
            (TrackKind::Bioturbation, self.bioturbation),
            (TrackKind::Facies, self.facies),
            (TrackKind::Samples, self.samples),
            (TrackKind::Photos, self.photos),
            (TrackKind::Fossils, self.fossils),
        ];
        v.extend(record.into_iter().filter_map(|(k, t)| t.map(|t| (k, t))));
        let interp = [
            (TrackKind::Storeys, self.storeys),
            (TrackKind::Bodies, self.bodies),
            (TrackKind::Proportion, self.proportion),
            (TrackKind::Regime, self.regime),
            (TrackKind::BoundaryLabels, self.boundary_labels),
        ];
        v.extend(interp.into_iter().filter_map(|(k, t)| t.map(|t| (k, t))));
        for k in 0..self.curves.count {
            if let Some((x_mm, w_mm)) = self.curves.track(k) {
                v.push((TrackKind::Curve(k), Track { x_mm, w_mm }));
            }
        }
        v
    }

    /// The track at `x_mm` from the segment's left edge; a point in the gap between two tracks
    /// belongs to the nearer.
    pub fn at_x(&self, x_mm: f64) -> Option<(TrackKind, Track)> {
        let all = self.in_order();
        let gap = |t: &Track| if x_mm < t.x_mm { t.x_mm - x_mm } else { (x_mm - t.x_mm - t.w_mm).max(0.0) };
        all.into_iter().filter(|(_, t)| gap(t) <= 1.0).min_by(|a, b| gap(&a.1).total_cmp(&gap(&b.1)))
    }
}

/// What hover help is asked about: a point of the column at `x_mm` from its left edge and
/// `height_m` above the section base, with `tolerance_m` (about the pointer's size) for lines.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pointed {
    pub x_mm: f64,
    pub height_m: f64,
    pub tolerance_m: f64,
}

impl ColumnCtx<'_> {
    /// A height in the section's display unit, as written in help ("12.35 m").
    fn height_words(&self, m: f64) -> String {
        let unit = self.section.display_unit;
        format!("{:.2} {}", unit.from_metres(m), unit.name())
    }

    /// Index of the bed at a height (the lower bed at a boundary), if any.
    fn bed_at(&self, h: f64) -> Option<usize> {
        let k = self.tops_m.partition_point(|&t| t < h);
        (k < self.tops_m.len() && self.bases_m[k] <= h).then_some(k)
    }

    /// Hover help for a point of the column: what the mark there is, in words; `None` where
    /// there is nothing to say (paper between marks).
    pub fn help_at(&self, p: Pointed) -> Option<String> {
        let (kind, track) = self.tracks.at_x(p.x_mm)?;
        let h = p.height_m;
        if !h.is_finite() || h < -p.tolerance_m || h > self.total_m + p.tolerance_m {
            return None;
        }
        // A boundary line crosses the lithology column and every track to the regime's, but
        // for the record tracks of words (facies codes, samples, photographs, fossils).
        let on_line = p.x_mm >= self.tracks.lithology.x_mm - 1.5
            && matches!(
                kind,
                TrackKind::Lithology
                    | TrackKind::Structures
                    | TrackKind::Paleocurrents
                    | TrackKind::Paleosols
                    | TrackKind::Bioturbation
                    | TrackKind::Storeys
                    | TrackKind::Bodies
                    | TrackKind::Proportion
                    | TrackKind::Regime
                    | TrackKind::BoundaryLabels
            );
        if on_line && self.opts.show_interpretation {
            if let Some(c) = self.boundary_near(h, p.tolerance_m) {
                return Some(self.boundary_help(c));
            }
        }
        if matches!(kind, TrackKind::Lithology | TrackKind::BoundaryLabels) {
            if let Some(i) = self.surface_near(h, p.tolerance_m) {
                let bed = &self.section.beds[i];
                let kind = bed.base_surface.as_ref().map(|s| s.kind.name()).unwrap_or("surface");
                return Some(format!(
                    "Surface \"{}\" ({kind}) at {}, the base of bed {}: named by the geologist; not \
                     a candidate boundary shown.",
                    surface_name(bed).unwrap_or_default(),
                    self.height_words(self.bases_m[i]),
                    i + 1
                ));
            }
        }
        let within = |b: f64, t: f64| h >= b - 1e-9 && h <= t + 1e-9;
        match kind {
            TrackKind::Axis | TrackKind::Curve(_) => None,
            TrackKind::Lithology => self.bed_at(h).map(|i| self.bed_help(i)),
            TrackKind::Structures => {
                let i = self.bed_at(h)?;
                self.structure_help(i, p.x_mm - track.x_mm)
            }
            TrackKind::Paleocurrents => {
                let i = self.bed_at(h)?;
                let bedding = self.section.bedding.as_ref();
                let readings: Vec<String> =
                    crate::analysis::paleocurrents::bed_flow_azimuths(&self.section.beds[i], bedding)
                        .into_iter()
                        .filter(|a| a.is_finite())
                        .map(|a| format!("{a:03.0}\u{b0}"))
                        .collect();
                (!readings.is_empty()).then(|| {
                    let how = if readings.len() >= 4 { "a rose of 30\u{b0} sectors" } else { "arrows" };
                    let what = match bedding {
                        Some(b) => format!(
                            "flow azimuths restored to horizontal from bedding dipping {:.0}\u{b0} toward {:03.0}\u{b0}",
                            b.dip_deg, b.dip_direction_deg
                        ),
                        None => "flow azimuths".to_string(),
                    };
                    format!("Paleocurrents of bed {}: {} ({what}, north up; drawn as {how}).", i + 1, readings.join(", "))
                })
            }
            TrackKind::Paleosols => {
                if let Some(pr) = self.interp.paleosols.iter().find(|pr| within(pr.base_m, pr.top_m)) {
                    return Some(self.profile_help(pr));
                }
                let i = self.bed_at(h)?;
                let bed = &self.section.beds[i];
                (bed.paleosol != PaleosolDevelopment::None)
                    .then(|| format!("Paleosol of {} development in bed {}.", bed.paleosol.name(), i + 1))
            }
            TrackKind::Bioturbation => {
                let i = self.bed_at(h)?;
                let bi = self.section.beds[i].bioturbation_index?;
                Some(format!(
                    "Bioturbation index {bi} in bed {} (Taylor & Goldring 1993: 0 none, 6 complete).",
                    i + 1
                ))
            }
            TrackKind::Facies => self.facies_help(self.bed_at(h)?),
            TrackKind::Samples => self.samples_help(h, p.tolerance_m),
            TrackKind::Photos => {
                let i = self.bed_at(h)?;
                let refs: Vec<&str> = self.section.beds[i]
                    .photos
                    .iter()
                    .map(|p| p.reference.trim())
                    .filter(|r| !r.is_empty())
                    .collect();
                (!refs.is_empty()).then(|| format!("Photographs of bed {}: {}.", i + 1, refs.join(", ")))
            }
            TrackKind::Fossils => {
                let i = self.bed_at(h)?;
                let bed = &self.section.beds[i];
                let list = |v: &[String]| {
                    v.iter().map(|n| n.trim()).filter(|n| !n.is_empty()).collect::<Vec<_>>().join(", ")
                };
                let mut parts = Vec::new();
                for (what, names) in
                    [("trace fossils", list(&bed.trace_fossils)), ("body fossils", list(&bed.body_fossils))]
                {
                    if !names.is_empty() {
                        parts.push(format!("{what} {names}"));
                    }
                }
                (!parts.is_empty()).then(|| format!("Fossils in bed {}: {}.", i + 1, parts.join("; ")))
            }
            TrackKind::Storeys => {
                let (k, s) =
                    self.interp.storeys.iter().enumerate().find(|(_, s)| within(s.base_m, s.top_m))?;
                let body = self.interp.channel_bodies.get(s.body);
                let base = if s.amalgamated_base { "on the sand of the storey below" } else { "on fines" };
                Some(format!(
                    "Storey {} (one channel fill), {}\u{2013}{}, {:.2} m thick, its base {base}{}. \
                     A candidate for your review.",
                    k + 1,
                    self.height_words(s.base_m),
                    self.height_words(s.top_m),
                    s.top_m - s.base_m,
                    body.map(|b| format!(", in a {} body", stacking_words(b.stacking))).unwrap_or_default()
                ))
            }
            TrackKind::Bodies => {
                let b = self.interp.channel_bodies.iter().find(|b| within(b.base_m, b.top_m))?;
                Some(self.body_help(b))
            }
            TrackKind::Proportion => {
                let window = self
                    .interp
                    .proportion_curve
                    .iter()
                    .filter(|c| c.proportion.is_some())
                    .min_by(|a, b| (a.height_m - h).abs().total_cmp(&(b.height_m - h).abs()))
                    .and_then(|c| c.proportion);
                let interval = self
                    .interp
                    .interval_proportions
                    .iter()
                    .find(|ip| within(ip.base_m, ip.top_m))
                    .and_then(|ip| ip.proportion.map(|p| (ip, p)));
                let mut parts = Vec::new();
                if let Some(p) = window {
                    parts.push(format!(
                        "{p:.2} in the {:.0} m window about this height",
                        self.interp.params.window_m
                    ));
                }
                if let Some((ip, p)) = interval {
                    parts.push(format!(
                        "{p:.2} between {} and {}",
                        self.height_words(ip.base_m),
                        self.height_words(ip.top_m)
                    ));
                }
                (!parts.is_empty())
                    .then(|| format!("Channel-body proportion: {} (0 = none, 1 = all).", parts.join("; ")))
            }
            TrackKind::Regime => {
                let r = self.interp.accommodation.iter().find(|r| within(r.base_m, r.top_m))?;
                Some(self.regime_help(r))
            }
            TrackKind::BoundaryLabels => None,
        }
    }

    /// The shown candidate boundary nearest `h`, within `tol` m.
    fn boundary_near(&self, h: f64, tol: f64) -> Option<&BoundaryCandidate> {
        self.interp
            .sequence_boundary_candidates
            .iter()
            .filter(|c| self.opts.show_rejected || c.review != ReviewState::Rejected)
            .filter(|c| (c.height_m - h).abs() <= tol)
            .min_by(|a, b| (a.height_m - h).abs().total_cmp(&(b.height_m - h).abs()))
    }

    /// The bed whose named base surface lies within `tol` m of `h`.
    fn surface_near(&self, h: f64, tol: f64) -> Option<usize> {
        (0..self.section.beds.len())
            .filter(|&i| surface_name(&self.section.beds[i]).is_some())
            .filter(|&i| (self.bases_m[i] - h).abs() <= tol)
            .min_by(|&a, &b| (self.bases_m[a] - h).abs().total_cmp(&(self.bases_m[b] - h).abs()))
    }

    fn boundary_help(&self, c: &BoundaryCandidate) -> String {
        let (_, label, _) = boundary_style(c.review, c.strength, candidate_name(c));
        let mut lines = vec![
            format!("{label}: candidate sequence boundary at {}", self.height_words(c.height_m)),
            format!("{}; strength class {}; {}", c.kind.name(), c.strength.name(), review_words(c.review)),
        ];
        if let Some(n) = &c.surface_name {
            if c.label.as_deref().is_some_and(|l| l != n) {
                lines.push(format!("surface \"{n}\""));
            }
        }
        match (c.evidence.iter().find(|e| e.kind().is_some()), c.evidence.first()) {
            (Some(e), _) => lines.push(format!("evidence: {e}")),
            (None, Some(e)) => lines.push(format!("no independent evidence; {e}")),
            (None, None) => {}
        }
        lines.join("\n")
    }

    fn body_help(&self, b: &ChannelBody) -> String {
        let storeys = storeys_words(b.stories);
        let what = match b.stacking {
            Stacking::Undetermined => format!("Channel body, {storeys} seen (stacking undetermined)"),
            st => format!("{} channel body, {storeys}", capitalised(stacking_words(st))),
        };
        let open = if b.is_censored() { ", an end not seen: the thickness is a minimum" } else { "" };
        format!(
            "{what}, {} ({}\u{2013}{}){open}.\nA candidate for your review.",
            b.thickness_text_in(self.section.display_unit),
            self.height_words(b.base_m),
            self.height_words(b.top_m)
        )
    }

    fn bed_help(&self, i: usize) -> String {
        let bed = &self.section.beds[i];
        let grain = match (bed.grain_base, bed.grain_top) {
            (Some(b), Some(t)) if b.class() != t.class() => {
                format!(", {} \u{2192} {}", b.class().name(), t.class().name())
            }
            (Some(g), _) | (None, Some(g)) => format!(", {}", g.class().name()),
            (None, None) => String::new(),
        };
        let contact = if i == 0 { String::new() } else { format!(", {} base", bed.base_contact.name()) };
        format!(
            "Bed {} of {}: {}, {:.2} m{grain}{contact} ({}\u{2013}{}).",
            i + 1,
            self.section.beds.len(),
            bed.lithology.name(),
            bed.thickness_m,
            self.height_words(self.bases_m[i]),
            self.height_words(self.tops_m[i])
        )
    }

    /// The structure whose symbol lies at `dx` mm into the structure track, placed as the
    /// column draws them (`draw_structures`): symbols of `(0.9 × bed height).clamp(2, 3.6)` mm,
    /// 1 mm apart, and when they do not all fit as many as leave room for "+n" in the track.
    fn structure_help(&self, i: usize, dx: f64) -> Option<String> {
        let bed = &self.section.beds[i];
        if bed.structures.is_empty() {
            return None;
        }
        let h_mm = bed.usable_thickness_m() * 1000.0 / self.opts.scale();
        let w = self.tracks.structures.w_mm;
        let size = (h_mm * 0.9).clamp(2.0, 3.6);
        let pitch = size + 1.0;
        let fit = ((w + 1.0) / pitch).floor().max(1.0) as usize;
        let n = bed.structures.len();
        let more = |shown: usize| format!("+{}", n - shown);
        let shown = if n <= fit {
            n
        } else {
            (0..fit).rev().find(|&k| k as f64 * pitch + width(&more(k), SMALL_PT) <= w).unwrap_or(0)
        };
        let k = (dx / pitch).floor().max(0.0) as usize;
        let names: Vec<&str> = bed.structures.iter().map(|s| s.name()).collect();
        Some(if k < shown {
            format!("{} (bed {}).", capitalised(names[k]), i + 1)
        } else if shown >= n {
            // Past the last symbol, with none hidden: the empty part of the track.
            return None;
        } else {
            format!("Bed {} also shows: {}.", i + 1, names[shown..].join(", "))
        })
    }

    /// A bed's lithofacies code, what it stands for and whether it is yours or suggested.
    fn facies_help(&self, i: usize) -> Option<String> {
        let f = shown_facies(&self.section.beds[i])?;
        let whose = if f.suggested {
            "suggested from its rock, grain size and structures (shown grey with \"?\"): a candidate \
             for your review until you confirm or change it"
        } else {
            "given by you"
        };
        Some(format!("Bed {}: lithofacies {} ({}), {whose}.", i + 1, f.code.code(), f.code.meaning()))
    }

    /// The samples marked near height `h`: those of the bed there, or those whose labels may
    /// have been moved up to a label line from their height.
    fn samples_help(&self, h: f64, tol: f64) -> Option<String> {
        let reach = tol + LABEL_PITCH_MM * self.opts.scale() / 1000.0;
        let mut found = Vec::new();
        for (i, bed) in self.section.beds.iter().enumerate() {
            let t = bed.usable_thickness_m();
            if self.tops_m[i] < h - reach || self.bases_m[i] > h + reach {
                continue;
            }
            for s in bed.samples.iter().filter(|s| !s.id.trim().is_empty()) {
                let at = s.height_in_bed_m.filter(|v| v.is_finite()).map(|v| v.clamp(0.0, t));
                let hs = self.bases_m[i] + at.unwrap_or(t / 2.0);
                if (hs - h).abs() <= reach {
                    let kind = s.kind.map(|k| format!(", {}", k.name())).unwrap_or_default();
                    let place = match at {
                        Some(v) => format!("{} above its base", self.height_words(v)),
                        None => "mid-bed (no height written)".to_string(),
                    };
                    found.push(format!("{}{kind} in bed {}, {place}", s.id.trim(), i + 1));
                }
            }
        }
        match found.len() {
            0 => None,
            1 => Some(format!("Sample {}.", found[0])),
            n if n <= 8 => Some(format!("Samples: {}.", found.join("; "))),
            n => Some(format!("Samples: {}; and {} more nearby.", found[..8].join("; "), n - 8)),
        }
    }

    fn profile_help(&self, p: &PaleosolProfile) -> String {
        let beds = if p.first_bed == p.last_bed {
            format!("bed {}", p.first_bed + 1)
        } else {
            format!("beds {}\u{2013}{}", p.first_bed + 1, p.last_bed + 1)
        };
        let raised = if p.maturity != p.logged_development {
            format!(" (logged as {}, raised by what its horizons show)", p.logged_development.name())
        } else {
            String::new()
        };
        // The drainage worded from what the profile's own reading was based on.
        let sign = p.evidence.iter().find_map(|e| match e {
            ProfileEvidence::WetSign { sign, .. } => Some(sign.short()),
            _ => None,
        });
        let drainage = match (p.drainage_from, p.drainage, sign) {
            (DrainageBasis::Logged, Some(class), _) => format!("; drainage logged as {}", class.name()),
            (DrainageBasis::Gleyed | DrainageBasis::Mottled, _, Some(sign)) => {
                format!("; {} ({sign})", p.drainage_reading.words())
            }
            _ => String::new(),
        };
        format!(
            "Paleosol profile of {} maturity{raised}, {}\u{2013}{}, {beds}{drainage}.",
            p.maturity.name(),
            self.height_words(p.base_m),
            self.height_words(p.top_m)
        )
    }

    fn regime_help(&self, r: &RegimeInterval) -> String {
        let name = match r.regime {
            Regime::Low => "Low accommodation",
            Regime::High => "High accommodation",
            Regime::Undetermined => "Accommodation undetermined",
        };
        format!(
            "{name}, {}\u{2013}{}: {}.\nA candidate for your review.",
            self.height_words(r.base_m),
            self.height_words(r.top_m),
            r.why
        )
    }
}

/// The text with its first letter in capitals.
fn capitalised(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(f) => f.to_uppercase().chain(c).collect(),
        None => String::new(),
    }
}

/// Hover help for a point of the column of `section` laid out with `opts` (see
/// [`ColumnCtx::help_at`]).
pub fn column_help_at(
    section: &Section,
    interp: &Interpretation,
    opts: &LayoutOptions,
    p: Pointed,
) -> Option<String> {
    ColumnCtx::new(section, interp, opts).help_at(p)
}

/// The tracks of the column of `section` laid out with `opts` (with its curve tracks).
pub fn column_tracks(section: &Section, opts: &LayoutOptions) -> Tracks {
    Tracks::for_section(section, opts).with_curves(section.curves.len().min(MAX_CURVE_TRACKS))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::sample::{sample_interpretation, sample_section};
    use crate::model::{Structure, Surface, SurfaceKind};

    fn pointed(x_mm: f64, height_m: f64) -> Pointed {
        Pointed { x_mm, height_m, tolerance_m: 0.05 }
    }

    fn mid(t: Track) -> f64 {
        t.x_mm + t.w_mm / 2.0
    }

    #[test]
    fn every_track_is_found_at_its_middle_and_has_a_title_and_help() {
        for show in [true, false] {
            let opts = LayoutOptions { show_interpretation: show, ..Default::default() };
            let tracks = Tracks::new(&opts).with_curves(2);
            let all = tracks.in_order();
            assert_eq!(all.len(), if show { 12 } else { 7 });
            for (kind, t) in all {
                assert_eq!(tracks.at_x(mid(t)).map(|(k, _)| k), Some(kind));
                assert!(!kind.title_lines().is_empty() && kind.help().len() > 40, "{kind:?}");
            }
            assert_eq!(tracks.at_x(tracks.width_mm + 20.0), None, "past the last track");
        }
    }

    #[test]
    fn a_body_bracket_says_its_stacking_storeys_thickness_and_that_it_is_for_review() {
        let s = sample_section();
        let i = sample_interpretation(&s);
        let opts = LayoutOptions::default();
        let ctx = ColumnCtx::new(&s, &i, &opts);
        let bodies = ctx.tracks.bodies.expect("interpretation shown");
        // The sample's first body: storeys on beds 3–4 and bed 5, 2.4–9.1 m (1.8 + 0.6 below it;
        // 2.2 + 2.6 + 1.9 thick).
        let help = ctx.help_at(pointed(mid(bodies), 5.0)).expect("a body there");
        assert!(
            help.starts_with("Multi-storey channel body, 2 storeys, 6.70 m (2.40 m\u{2013}9.10 m)"),
            "{help}"
        );
        assert!(help.contains("candidate for your review"), "{help}");
        assert_eq!(ctx.help_at(pointed(mid(bodies), 1.0)), None, "no body below 2.4 m");
    }

    #[test]
    fn a_boundary_line_says_its_name_strength_review_state_and_evidence() {
        let mut s = sample_section();
        s.beds[14].base_surface = Some(Surface { name: "RG-E1".into(), kind: SurfaceKind::Incision });
        let mut i = sample_interpretation(&s);
        i.sequence_boundary_candidates[1].surface_name = Some("RG-E1".into());
        let opts = LayoutOptions::default();
        let ctx = ColumnCtx::new(&s, &i, &opts);
        let h = ctx.bases_m[14];
        for x in [mid(ctx.tracks.lithology), mid(ctx.tracks.regime.expect("shown"))] {
            let help = ctx.help_at(pointed(x, h + 0.03)).expect("the line");
            let first = help.lines().next().unwrap_or_default();
            assert_eq!(first, format!("SB? RG-E1: candidate sequence boundary at {h:.2} m"));
            assert!(help.contains("channel-body base; strength class moderate; unreviewed: for you to judge"));
            // The sample's evidence is a free note, no independent kind.
            assert!(
                help.contains("no independent evidence; erosional relief beyond the storey below"),
                "{help}"
            );
        }
        // Off the line, the lithology track tells the bed instead.
        let bed = ctx.help_at(pointed(mid(ctx.tracks.lithology), h + 0.5)).expect("a bed");
        assert!(
            bed.starts_with("Bed 15 of 21: sandstone, 3.20 m, very coarse sand \u{2192} fine sand"),
            "{bed}"
        );
        // A rejected candidate is hidden, and so is its help, unless rejected ones are shown.
        let rejected = ctx.bases_m[6];
        assert!(!ctx
            .help_at(pointed(mid(ctx.tracks.lithology), rejected))
            .unwrap_or_default()
            .contains("rej."));
        let shown = LayoutOptions { show_rejected: true, ..Default::default() };
        let ctx = ColumnCtx::new(&s, &i, &shown);
        let help = ctx.help_at(pointed(mid(ctx.tracks.lithology), rejected)).expect("the rejected line");
        assert!(help.starts_with("rej. weak") && help.contains("rejected by you"), "{help}");
    }

    #[test]
    fn a_named_surface_that_is_no_candidate_is_named() {
        let mut s = sample_section();
        s.beds[9].base_surface = Some(Surface { name: "Ash-3".into(), kind: SurfaceKind::Other });
        let i = sample_interpretation(&s);
        let opts = LayoutOptions::default();
        let ctx = ColumnCtx::new(&s, &i, &opts);
        let help = ctx.help_at(pointed(mid(ctx.tracks.lithology), ctx.bases_m[9])).expect("the surface");
        assert!(help.starts_with("Surface \"Ash-3\" (other)") && help.contains("base of bed 10"), "{help}");
    }

    #[test]
    fn a_profile_says_its_drainage_from_what_it_was_read_from() {
        // Mottles in a red 5YR 4/4 matrix: imperfectly drained (Kraus & Aslan 1993), not
        // "poorly drained (gleyed or mottled)"; a grey 2.5Y 5/2 matrix: poorly drained (gleyed,
        // chroma 2 or less); a logged class: said as logged; no wet sign: nothing said.
        use crate::model::{Drainage, Munsell, PaleosolFeature};
        let help_for = |munsell: Option<&str>, mottled: bool, class: Option<Drainage>| {
            let mut s = sample_section();
            let bed = &mut s.beds[7];
            bed.paleosol_features
                .retain(|f| *f != PaleosolFeature::Mottling && *f != PaleosolFeature::Gleying);
            bed.structures.retain(|st| *st != crate::model::Structure::Mottling);
            if mottled {
                bed.paleosol_features.push(PaleosolFeature::Mottling);
            }
            bed.munsell = munsell.map(|m| Munsell::parse(m).expect("munsell"));
            bed.drainage = class;
            let i = crate::rules::interpret(&s, &crate::rules::RuleParams::default());
            let opts = LayoutOptions::default();
            let ctx = ColumnCtx::new(&s, &i, &opts);
            let h = (ctx.bases_m[7] + ctx.tops_m[7]) / 2.0;
            ctx.help_at(pointed(mid(ctx.tracks.paleosols), h)).expect("a profile")
        };
        let red = help_for(Some("5YR 4/4"), true, None);
        assert!(
            red.contains("; imperfectly (somewhat poorly) drained (mottles in a 5YR 4/4 matrix)."),
            "{red}"
        );
        assert!(!red.contains("gleyed"), "{red}");
        let grey = help_for(Some("2.5Y 5/2"), true, None);
        assert!(grey.contains("; poorly drained (mottles in a low-chroma 2.5Y 5/2 matrix)."), "{grey}");
        let bare = help_for(None, true, None);
        assert!(bare.contains("(mottles, matrix colour not logged)"), "{bare}");
        let logged = help_for(Some("2.5Y 5/2"), true, Some(Drainage::ModeratelyWellDrained));
        assert!(logged.contains("; drainage logged as moderately well drained."), "{logged}");
        let dry = help_for(Some("5YR 4/4"), false, None);
        assert!(!dry.contains("drained"), "{dry}");
    }

    #[test]
    fn symbols_paleocurrents_paleosols_and_regimes_are_named() {
        let s = sample_section();
        let i = sample_interpretation(&s);
        let opts = LayoutOptions::default();
        let ctx = ColumnCtx::new(&s, &i, &opts);
        let tr = ctx.tracks;
        // Bed 5 is 1.9 m: 19 mm at 1:100, so symbols of 3.6 mm every 4.6 mm (mud clasts first).
        let h = (ctx.bases_m[4] + ctx.tops_m[4]) / 2.0;
        let at = |dx: f64| ctx.help_at(pointed(tr.structures.x_mm + dx, h));
        assert_eq!(at(1.8).as_deref(), Some("Mud clasts (bed 5)."));
        assert_eq!(at(4.6 + 1.8).as_deref(), Some("Trough cross-bedding (bed 5)."));
        // Five symbols do not fit the 14 mm track: two, then "+3" for the rest.
        let mut crowded = s.clone();
        crowded.beds[4].structures = vec![
            Structure::MudClasts,
            Structure::TroughCrossBedding,
            Structure::BasalLag,
            Structure::Imbrication,
            Structure::Massive,
        ];
        let c2 = ColumnCtx::new(&crowded, &i, &opts);
        let more = c2.help_at(pointed(tr.structures.x_mm + 2.0 * 4.6 + 1.0, h)).expect("the count");
        assert_eq!(more, "Bed 5 also shows: basal lag, imbrication, massive.");
        // Right of the last symbol of a bed whose symbols all fit, the track says nothing.
        assert_eq!(at(12.0), None, "no empty 'also shows' help");
        // Bed 4 has six readings: a rose.
        let h4 = (ctx.bases_m[3] + ctx.tops_m[3]) / 2.0;
        let pc = ctx.help_at(pointed(mid(tr.paleocurrents), h4)).expect("readings");
        assert!(
            pc.starts_with("Paleocurrents of bed 4: 192\u{b0}, 205\u{b0}") && pc.contains("rose"),
            "{pc}"
        );
        let h8 = (ctx.bases_m[7] + ctx.tops_m[7]) / 2.0;
        let soil = ctx.help_at(pointed(mid(tr.paleosols), h8)).expect("a paleosol");
        assert_eq!(soil, "Paleosol of very strong development in bed 8.");
        let regime = ctx.help_at(pointed(mid(tr.regime.expect("shown")), 5.0)).expect("a regime");
        assert!(regime.starts_with("Low accommodation, 2.40 m") && regime.contains("amalgamated storeys"));
        assert!(regime.contains("candidate for your review"));
    }
}
