//! Decompaction of buried beds with an exponential porosity–depth law (Sclater & Christie 1980).
//!
//! Porosity φ(z) = φ0·exp(−c·z), z depth below the surface. A layer keeps its solid (grain)
//! thickness when it moves: for a layer between depths z1 and z2,
//! solid = (z2 − z1) − (φ0/c)(e^(−c·z1) − e^(−c·z2)).
//! Moving it to a new top depth z1′ means finding z2′ with the same solid thickness, solved here
//! by Newton's method (the function is monotonic and convex in z2′, so Newton from the solid
//! thickness converges), with bisection as a fallback.

use super::AnalysisError;
use crate::model::{Lithology, Section};
use serde::Serialize;
use std::collections::BTreeMap;

/// Surface porosity and compaction coefficient of one rock type.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct PorosityLaw {
    /// Porosity at the surface, 0 ≤ φ0 < 1.
    pub surface_porosity: f64,
    /// Compaction coefficient c, per km.
    pub coefficient_per_km: f64,
}

impl PorosityLaw {
    /// Shale 0.63 / 0.51 km⁻¹ (Sclater & Christie 1980, as tabulated by Wangen 2010, Table 2.1).
    pub const SHALE: PorosityLaw = PorosityLaw { surface_porosity: 0.63, coefficient_per_km: 0.51 };
    /// Sandstone 0.49 / 0.27 km⁻¹ (same source).
    pub const SANDSTONE: PorosityLaw = PorosityLaw { surface_porosity: 0.49, coefficient_per_km: 0.27 };
    /// Chalk 0.70 / 0.71 km⁻¹ (same source).
    pub const CHALK: PorosityLaw = PorosityLaw { surface_porosity: 0.70, coefficient_per_km: 0.71 };
    /// Shaly sandstone 0.56 / 0.39 km⁻¹. Doubtful: recalled, not confirmed; one textbook table
    /// gives c = 0.41. Check against the original before relying on it.
    pub const SHALY_SANDSTONE: PorosityLaw = PorosityLaw { surface_porosity: 0.56, coefficient_per_km: 0.39 };
    /// No porosity loss (rocks kept at their present thickness, e.g. evaporites).
    pub const RIGID: PorosityLaw = PorosityLaw { surface_porosity: 0.0, coefficient_per_km: 0.0 };

    /// Porosity at depth `z_m` metres.
    pub fn porosity_at(&self, z_m: f64) -> f64 {
        self.surface_porosity * (-self.coefficient_per_km * z_m / 1000.0).exp()
    }

    /// Pore-space thickness between depths z1 and z2 (m): ∫φ dz.
    fn pore_thickness_m(&self, z1_m: f64, z2_m: f64) -> f64 {
        if self.coefficient_per_km == 0.0 {
            return self.surface_porosity * (z2_m - z1_m);
        }
        let c = self.coefficient_per_km / 1000.0;
        self.surface_porosity / c * ((-c * z1_m).exp() - (-c * z2_m).exp())
    }

    /// Solid thickness of a layer between depths z1 and z2 (m).
    pub fn solid_thickness_m(&self, z1_m: f64, z2_m: f64) -> f64 {
        (z2_m - z1_m) - self.pore_thickness_m(z1_m, z2_m)
    }

    fn validate(&self, what: &str) -> Result<(), AnalysisError> {
        if !(0.0..1.0).contains(&self.surface_porosity) {
            return Err(AnalysisError::OutOfRange {
                field: format!("{what} surface porosity"),
                value: self.surface_porosity,
                valid: "a fraction from 0 up to (not including) 1".into(),
            });
        }
        if !(self.coefficient_per_km.is_finite() && self.coefficient_per_km >= 0.0) {
            return Err(AnalysisError::OutOfRange {
                field: format!("{what} compaction coefficient"),
                value: self.coefficient_per_km,
                valid: "a coefficient ≥ 0 per km".into(),
            });
        }
        Ok(())
    }
}

/// Deepest depth accepted, metres: far below any sedimentary basin floor (sediment piles reach
/// roughly 20 km at most; common practice), so larger numbers are typing errors.
pub const MAX_DEPTH_M: f64 = 50_000.0;

/// Thickness (m) of a layer now between depths `top_m` and `base_m` once moved so that its top
/// lies at `new_top_m` (0 for the surface).
///
/// ```
/// use aggrade_core::analysis::decompaction::{decompact_layer, PorosityLaw};
/// // A 1 km shale layer from 3–4 km depth restored to the surface.
/// let t = decompact_layer(&PorosityLaw::SHALE, 3000.0, 4000.0, 0.0).unwrap();
/// assert!((t - 1575.3).abs() < 0.05);
/// ```
pub fn decompact_layer(
    law: &PorosityLaw,
    top_m: f64,
    base_m: f64,
    new_top_m: f64,
) -> Result<f64, AnalysisError> {
    law.validate("porosity law")?;
    for (field, v) in [("layer top depth", top_m), ("new top depth", new_top_m)] {
        if !(v.is_finite() && v >= 0.0) {
            return Err(AnalysisError::OutOfRange {
                field: field.into(),
                value: v,
                valid: "a depth ≥ 0 m".into(),
            });
        }
    }
    if !(base_m.is_finite() && base_m > top_m) {
        return Err(AnalysisError::OutOfRange {
            field: "layer base depth".into(),
            value: base_m,
            valid: format!("a depth greater than the layer top ({top_m} m) and at most {MAX_DEPTH_M} m"),
        });
    }
    let solid = law.solid_thickness_m(top_m, base_m);
    // f(t) = t − pore(new_top, new_top + t) − solid; f' = 1 − φ(new_top + t) > 0.
    let f = |t: f64| law.solid_thickness_m(new_top_m, new_top_m + t) - solid;
    let mut t = solid / (1.0 - law.porosity_at(new_top_m)).max(1e-9);
    for _ in 0..100 {
        let step = f(t) / (1.0 - law.porosity_at(new_top_m + t));
        t -= step;
        if step.abs() < 1e-10 * t.abs().max(1.0) {
            return Ok(t);
        }
    }
    // Bisection fallback: f(solid) ≤ 0 and f grows without bound.
    let (mut lo, mut hi) = (solid, solid.max(1.0));
    while f(hi) < 0.0 {
        hi *= 2.0;
    }
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if f(mid) < 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Ok(0.5 * (lo + hi))
}

/// Porosity laws per lithology: an editable table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DecompactionParams {
    /// Law for each lithology; a lithology missing here is kept at its present thickness and
    /// listed in [`SectionDecompaction::not_decompacted`].
    pub laws: BTreeMap<Lithology, PorosityLaw>,
}

impl Default for DecompactionParams {
    /// Mud rocks as shale; siltstone and marl as shaly sandstone (our assumption: mixed grain
    /// sizes); sandstone and conglomerate/breccia as sandstone; limestone and dolostone as chalk
    /// (a crude stand-in: Sclater & Christie give no law for other carbonates); covered intervals
    /// as shale, because covered slopes in river successions are usually recessive mudrock
    /// (common practice) — the same reading as the rules' `covered_as_fines` bound of the
    /// channel-body proportion; the decompacted proportion itself, like the rules' own, is of the
    /// exposed thickness only. Coal, evaporite and tuff have no law here.
    fn default() -> Self {
        use Lithology::*;
        let laws = [
            (Claystone, PorosityLaw::SHALE),
            (Mudstone, PorosityLaw::SHALE),
            (Shale, PorosityLaw::SHALE),
            (Siltstone, PorosityLaw::SHALY_SANDSTONE),
            (Marl, PorosityLaw::SHALY_SANDSTONE),
            (Sandstone, PorosityLaw::SANDSTONE),
            (Conglomerate, PorosityLaw::SANDSTONE),
            (Breccia, PorosityLaw::SANDSTONE),
            (Limestone, PorosityLaw::CHALK),
            (Dolostone, PorosityLaw::CHALK),
            (Covered, PorosityLaw::SHALE),
        ]
        .into_iter()
        .collect();
        DecompactionParams { laws }
    }
}

/// One bed before and after decompaction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DecompactedBed {
    pub bed_index: usize,
    pub present_thickness_m: f64,
    pub decompacted_thickness_m: f64,
}

/// A section restored to the moment its top bed was at the surface.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SectionDecompaction {
    /// Depth of the section top today, m.
    pub burial_depth_m: f64,
    pub beds: Vec<DecompactedBed>,
    pub present_thickness_m: f64,
    pub decompacted_thickness_m: f64,
    /// Channel-deposit proportion of the exposed thickness today and decompacted; `None`
    /// when nothing is exposed or no channel flags were given.
    pub present_channel_proportion: Option<f64>,
    pub decompacted_channel_proportion: Option<f64>,
    /// Lithologies kept at their present thickness for want of a law.
    pub not_decompacted: Vec<Lithology>,
    /// Present thickness of covered intervals, m.
    pub covered_m: f64,
    /// What was assumed for covered intervals, in words (`None` when there are none).
    pub covered_assumption: Option<String>,
}

/// What decompaction assumes for covered intervals under these laws, in words.
pub fn covered_assumption(params: &DecompactionParams) -> String {
    let proportion = "left out of the channel-body proportion, which is of the exposed thickness only";
    match params.laws.get(&Lithology::Covered) {
        Some(law) if *law == PorosityLaw::SHALE => format!(
            "covered intervals decompacted as shale (read as mudrock, as the covered-as-fines bound) and {proportion}"
        ),
        Some(law) => format!(
            "covered intervals decompacted with surface porosity {:.2} and c = {:.2}/km, and {proportion}",
            law.surface_porosity, law.coefficient_per_km
        ),
        None => format!("covered intervals kept at their present thickness and {proportion}"),
    }
}

/// Decompact a whole section whose top is now `burial_depth_m` below the surface: every bed
/// keeps its solid thickness and the beds are restacked from the top down with the top at the
/// surface (backstripping the section to the end of its own deposition).
/// `channel_flags` (one per bed, e.g. from the rules' elements) marks channel deposits.
pub fn decompact_section(
    section: &Section,
    burial_depth_m: f64,
    channel_flags: Option<&[bool]>,
    params: &DecompactionParams,
) -> Result<SectionDecompaction, AnalysisError> {
    if !(burial_depth_m.is_finite() && burial_depth_m >= 0.0) {
        return Err(AnalysisError::OutOfRange {
            field: "burial depth".into(),
            value: burial_depth_m,
            valid: "a depth ≥ 0 m to the section top".into(),
        });
    }
    if let Some(flags) = channel_flags {
        if flags.len() != section.beds.len() {
            return Err(AnalysisError::OutOfRange {
                field: "channel flags".into(),
                value: flags.len() as f64,
                valid: format!("one flag per bed ({} beds)", section.beds.len()),
            });
        }
    }
    for (lith, law) in &params.laws {
        law.validate(lith.name())?;
    }
    let mut beds = Vec::with_capacity(section.beds.len());
    let mut not_decompacted = Vec::new();
    let mut depth_now = burial_depth_m;
    let mut depth_then = 0.0;
    // Work from the top bed down.
    for (i, bed) in section.beds.iter().enumerate().rev() {
        let t = bed.thickness_m;
        if !(t.is_finite() && t > 0.0) {
            return Err(AnalysisError::OutOfRange {
                field: format!("section {:?}, bed {} thickness", section.name, i + 1),
                value: t,
                valid: "a thickness > 0 m".into(),
            });
        }
        let new_t = match params.laws.get(&bed.lithology) {
            Some(law) => decompact_layer(law, depth_now, depth_now + t, depth_then)?,
            None => {
                if !not_decompacted.contains(&bed.lithology) {
                    not_decompacted.push(bed.lithology);
                }
                t
            }
        };
        beds.push(DecompactedBed { bed_index: i, present_thickness_m: t, decompacted_thickness_m: new_t });
        depth_now += t;
        depth_then += new_t;
    }
    beds.reverse();
    not_decompacted.sort();
    let proportion = |thick: fn(&DecompactedBed) -> f64| -> Option<f64> {
        let flags = channel_flags?;
        let exposed: f64 = beds.iter().filter(|b| !section.beds[b.bed_index].is_covered()).map(thick).sum();
        let channel: f64 = beds.iter().filter(|b| flags[b.bed_index]).map(thick).sum();
        (exposed > 0.0).then(|| channel / exposed)
    };
    let covered_m: f64 = section.beds.iter().filter(|b| b.is_covered()).map(|b| b.thickness_m).sum();
    Ok(SectionDecompaction {
        covered_m,
        covered_assumption: (covered_m > 0.0).then(|| covered_assumption(params)),
        burial_depth_m,
        present_thickness_m: depth_now - burial_depth_m,
        decompacted_thickness_m: depth_then,
        present_channel_proportion: proportion(|b| b.present_thickness_m),
        decompacted_channel_proportion: proportion(|b| b.decompacted_thickness_m),
        beds,
        not_decompacted,
    })
}

/// Write decompacted bed thicknesses as CSV:
/// `section,bed,bed_id,lithology,present_thickness_m,decompacted_thickness_m` (4 decimals).
pub fn write_decompaction_csv<W: std::io::Write>(
    section: &Section,
    result: &SectionDecompaction,
    out: W,
) -> Result<(), super::bodies::CsvWriteError> {
    let mut w = csv::Writer::from_writer(out);
    w.write_record([
        "section",
        "bed",
        "bed_id",
        "lithology",
        "present_thickness_m",
        "decompacted_thickness_m",
    ])?;
    for b in &result.beds {
        let bed = &section.beds[b.bed_index];
        w.write_record([
            super::bodies::escape_text_cell(&section.name),
            (b.bed_index + 1).to_string(),
            bed.id.0.to_string(),
            bed.lithology.name().to_string(),
            format!("{:.4}", b.present_thickness_m),
            format!("{:.4}", b.decompacted_thickness_m),
        ])?;
    }
    w.flush()?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Bed, BedId};

    #[test]
    fn worked_values() {
        // Computed from the porosity–depth laws of Sclater & Christie 1980 (table 1, from memory): 3–4 km to the surface:
        // chalk 1612.6 m, shale 1575.3 m, sandstone 1370.2 m; shale 1–2 km → 1303.5 m.
        let cases = [
            (PorosityLaw::CHALK, 3000.0, 4000.0, 1612.6),
            (PorosityLaw::SHALE, 3000.0, 4000.0, 1575.3),
            (PorosityLaw::SANDSTONE, 3000.0, 4000.0, 1370.2),
            (PorosityLaw::SHALE, 1000.0, 2000.0, 1303.5),
        ];
        for (law, top, base, want) in cases {
            let got = decompact_layer(&law, top, base, 0.0).expect("valid");
            assert!((got - want).abs() < 0.05, "{law:?}: {got} vs {want}");
            // Solid thickness is conserved (the defining equation).
            assert!((law.solid_thickness_m(0.0, got) - law.solid_thickness_m(top, base)).abs() < 1e-6);
        }
        // Shale porosity at 1 km: 0.63·e^(−0.51) = 0.3783 (Sclater & Christie 1980, table 1 from memory; computed).
        assert!((PorosityLaw::SHALE.porosity_at(1000.0) - 0.3783).abs() < 5e-5);
    }

    #[test]
    fn burying_then_unburying_is_identity() {
        let law = PorosityLaw::SANDSTONE;
        let buried = decompact_layer(&law, 0.0, 100.0, 2500.0).expect("valid");
        assert!(buried < 100.0);
        let back = decompact_layer(&law, 2500.0, 2500.0 + buried, 0.0).expect("valid");
        assert!((back - 100.0).abs() < 1e-6, "{back}");
    }

    #[test]
    fn section_channel_proportion_rises_as_mud_compacts_more() {
        let mut s = Section::new("Test");
        s.beds.push(Bed::new(BedId(1), 10.0, Lithology::Mudstone, None));
        s.beds.push(Bed::new(BedId(2), 10.0, Lithology::Sandstone, None));
        s.beds.push(Bed::new(BedId(3), 5.0, Lithology::Coal, None));
        let flags = [false, true, false];
        let r = decompact_section(&s, 2000.0, Some(&flags), &DecompactionParams::default()).expect("valid");
        assert_eq!(r.not_decompacted, vec![Lithology::Coal]);
        assert_eq!((r.covered_m, r.covered_assumption.as_deref()), (0.0, None));
        let mut with_cover = s.clone();
        with_cover.beds.push(Bed::new(BedId(4), 2.0, Lithology::Covered, None));
        let c = decompact_section(
            &with_cover,
            2000.0,
            Some(&[false, true, false, false]),
            &DecompactionParams::default(),
        )
        .expect("valid");
        assert_eq!(c.covered_m, 2.0);
        assert!(c.covered_assumption.as_deref().is_some_and(|a| a.contains("as shale")), "{c:?}");
        // The proportion stays exposed-only: the same 10 m of channel over 25 m exposed today.
        assert!((c.present_channel_proportion.expect("exposed") - 0.4).abs() < 1e-12);
        assert_eq!(r.beds[2].decompacted_thickness_m, 5.0);
        assert!((r.present_channel_proportion.expect("exposed") - 0.4).abs() < 1e-12);
        // Mudstone loses more porosity with depth than sandstone, so restoring it lowers the
        // channel share (Sclater & Christie laws: shale c = 0.51 > sandstone c = 0.27).
        assert!(r.decompacted_channel_proportion.expect("exposed") < 0.4, "{r:?}");
        assert!(r.beds[0].decompacted_thickness_m > r.beds[1].decompacted_thickness_m);
        assert!(decompact_section(&s, -1.0, None, &DecompactionParams::default()).is_err());
        assert!(decompact_section(&s, 1e300, None, &DecompactionParams::default()).is_err());
        assert!(decompact_section(&s, 1.0, Some(&[true]), &DecompactionParams::default()).is_err());
    }
}
