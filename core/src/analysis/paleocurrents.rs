//! Paleocurrent statistics: vector mean, mean resultant length, circular spread, Rayleigh test
//! and rose-diagram bins, per bed, per interval and per section.
//!
//! Formulas: mean direction atan2(ΣsinΘ, ΣcosΘ), mean resultant length R̄ = R/n and circular
//! standard deviation √(−2 ln R̄) (Mardia & Jupp 2000, eqs 2.2.4 and 2.3.11). Axial data
//! (e.g. the trend of a channel axis, where 10° and 190° mean the same) are handled the usual
//! way: double the angles, compute on the doubled angles, halve the mean direction and the
//! circular standard deviation (Mardia & Jupp 2000, on axial data). The Rayleigh test of
//! uniformity uses z = nR̄² and, by default, Zar's (1999) approximation of p.

use super::AnalysisError;
use crate::model::Section;
use serde::Serialize;
use std::f64::consts::PI;

/// Whether readings are flow directions or undirected axes.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum DataKind {
    /// Flow azimuths (0–360°): a ripple or cross-bed foreset dip direction.
    #[default]
    Directional,
    /// Axes (0–180° meaningful): parting lineation, channel-axis trends.
    Axial,
}

/// How the Rayleigh p-value is approximated.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum RayleighApproximation {
    /// p ≈ exp(√(1 + 4n + 4(n² − R²)) − (1 + 2n)), R = nR̄ (Zar 1999, Biostatistical
    /// Analysis, 4th ed., eq. 27.4; equation number from memory).
    #[default]
    Zar1999,
    /// p ≈ e^(−z)·[1 + (2z − z²)/(4n) − (24z − 132z² + 76z³ − 9z⁴)/(288n²)] for n < 50 and
    /// e^(−z) above (the series expansion quoted by Wilkie 1983, Applied Statistics 32; from
    /// memory). This is the form astropy's `rayleightest` uses.
    SeriesExpansion,
}

/// Parameters of the paleocurrent statistics.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct CircularParams {
    pub kind: DataKind,
    pub rayleigh: RayleighApproximation,
}

impl Default for CircularParams {
    fn default() -> Self {
        CircularParams { kind: DataKind::Directional, rayleigh: RayleighApproximation::Zar1999 }
    }
}

/// Summary statistics of a set of azimuths.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CircularSummary {
    pub kind: DataKind,
    /// Number of readings.
    pub n: usize,
    /// Vector-mean azimuth in degrees, 0 ≤ a < 360 (0 ≤ a < 180 for axial data); `None` when the
    /// resultant is (numerically) zero and no mean direction exists.
    pub mean_azimuth_deg: Option<f64>,
    /// Mean resultant length R̄, 0–1 (of the doubled angles for axial data).
    pub mean_resultant_length: f64,
    /// Circular standard deviation √(−2 ln R̄), in degrees (halved for axial data);
    /// infinite when R̄ = 0.
    pub circular_std_deg: f64,
    /// Rayleigh statistic z = nR̄².
    pub rayleigh_z: f64,
    /// Probability of a resultant this long or longer from a uniform distribution.
    pub rayleigh_p: f64,
}

/// Resultant of angles in radians: (ΣcosΘ, ΣsinΘ).
fn resultant(angles_rad: impl Iterator<Item = f64>) -> (f64, f64) {
    angles_rad.fold((0.0, 0.0), |(c, s), a| (c + a.cos(), s + a.sin()))
}

/// Rayleigh p-value for n readings with mean resultant length `rbar`, clamped to 0–1.
pub fn rayleigh_p(n: usize, rbar: f64, approximation: RayleighApproximation) -> f64 {
    let nf = n as f64;
    let z = nf * rbar * rbar;
    let p = match approximation {
        RayleighApproximation::Zar1999 => {
            let r = nf * rbar;
            ((1.0 + 4.0 * nf + 4.0 * (nf * nf - r * r)).sqrt() - (1.0 + 2.0 * nf)).exp()
        }
        RayleighApproximation::SeriesExpansion => {
            let correction = if n < 50 {
                1.0 + (2.0 * z - z * z) / (4.0 * nf)
                    - (24.0 * z - 132.0 * z.powi(2) + 76.0 * z.powi(3) - 9.0 * z.powi(4)) / (288.0 * nf * nf)
            } else {
                1.0
            };
            (-z).exp() * correction
        }
    };
    p.clamp(0.0, 1.0)
}

/// Check that every azimuth is a finite number in 0–360°.
fn validate(azimuths_deg: &[f64]) -> Result<(), AnalysisError> {
    for (i, &a) in azimuths_deg.iter().enumerate() {
        if !a.is_finite() || !(0.0..=360.0).contains(&a) {
            return Err(AnalysisError::OutOfRange {
                field: format!("azimuth #{}", i + 1),
                value: a,
                valid: "azimuths must lie between 0 and 360 degrees".into(),
            });
        }
    }
    Ok(())
}

/// Statistics of a set of azimuths in degrees (0–360). Needs at least two readings.
///
/// ```
/// use aggrade_core::analysis::paleocurrents::{circular_summary, CircularParams};
/// // Three ripple foresets dipping roughly south-west.
/// let s = circular_summary(&[200.0, 220.0, 240.0], &CircularParams::default()).unwrap();
/// assert!((s.mean_azimuth_deg.unwrap() - 220.0).abs() < 1e-9);
/// assert!(s.mean_resultant_length > 0.9);
/// ```
pub fn circular_summary(
    azimuths_deg: &[f64],
    params: &CircularParams,
) -> Result<CircularSummary, AnalysisError> {
    validate(azimuths_deg)?;
    let n = azimuths_deg.len();
    if n < 2 {
        return Err(AnalysisError::TooFewValues {
            what: "paleocurrent statistics".into(),
            needed: 2,
            got: n,
        });
    }
    // Axial data: work on doubled angles so that θ and θ+180° coincide.
    let factor = match params.kind {
        DataKind::Directional => 1.0,
        DataKind::Axial => 2.0,
    };
    let (c, s) = resultant(azimuths_deg.iter().map(|a| (a * factor).to_radians()));
    let r = c.hypot(s);
    let rbar = (r / n as f64).min(1.0);
    // Below this the direction is rounding noise of a balanced sample.
    let mean_azimuth_deg = (rbar > 1e-12).then(|| {
        let m = s.atan2(c).to_degrees().rem_euclid(360.0) / factor;
        // rem_euclid can return exactly 360/factor for a tiny negative angle.
        if m >= 360.0 / factor {
            0.0
        } else {
            m
        }
    });
    let circular_std_deg =
        if rbar > 0.0 { (-2.0 * rbar.ln()).sqrt() * 180.0 / PI / factor } else { f64::INFINITY };
    Ok(CircularSummary {
        kind: params.kind,
        n,
        mean_azimuth_deg,
        mean_resultant_length: rbar,
        circular_std_deg,
        rayleigh_z: n as f64 * rbar * rbar,
        rayleigh_p: rayleigh_p(n, rbar, params.rayleigh),
    })
}

/// Statistics for one bed's readings.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BedPaleocurrents {
    /// Index of the bed in the section.
    pub bed_index: usize,
    #[serde(rename = "base")]
    pub base_m: f64,
    pub summary: CircularSummary,
}

/// Statistics for every bed with at least two readings.
pub fn per_bed(section: &Section, params: &CircularParams) -> Result<Vec<BedPaleocurrents>, AnalysisError> {
    let bases = section.base_heights_m();
    let mut out = Vec::new();
    for (i, bed) in section.beds.iter().enumerate() {
        let readings: Vec<f64> = bed.flow_azimuths().collect();
        if readings.len() >= 2 {
            let summary =
                circular_summary(&readings, params).map_err(|e| bed_error(section, i, e))?;
            out.push(BedPaleocurrents { bed_index: i, base_m: bases[i], summary });
        }
    }
    Ok(out)
}

fn bed_error(section: &Section, index: usize, e: AnalysisError) -> AnalysisError {
    match e {
        AnalysisError::OutOfRange { field, value, valid } => AnalysisError::OutOfRange {
            field: format!("section {:?}, bed {} ({field})", section.name, index + 1),
            value,
            valid,
        },
        other => other,
    }
}

/// All readings of the beds whose base lies in `base_m ≤ h < top_m`.
pub fn readings_in_interval(section: &Section, base_m: f64, top_m: f64) -> Vec<f64> {
    let bases = section.base_heights_m();
    section
        .beds
        .iter()
        .zip(bases)
        .filter(|(_, h)| *h >= base_m && *h < top_m)
        .flat_map(|(b, _)| b.flow_azimuths())
        .collect()
}

/// Statistics for one interval of a section.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct IntervalPaleocurrents {
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    /// `None` when the interval holds fewer than two readings.
    pub summary: Option<CircularSummary>,
}

/// Statistics for each interval between consecutive heights in `bounds_m` (ascending, e.g.
/// section base, accepted boundaries, section top). A bed belongs to the interval holding its
/// base; the last interval also takes a bed based exactly at its top.
pub fn per_interval(
    section: &Section,
    bounds_m: &[f64],
    params: &CircularParams,
) -> Result<Vec<IntervalPaleocurrents>, AnalysisError> {
    let n = bounds_m.len();
    bounds_m
        .windows(2)
        .enumerate()
        .map(|(k, w)| {
            let top = if k + 2 == n { w[1] + 1e-9 } else { w[1] };
            let readings = readings_in_interval(section, w[0], top);
            let summary = if readings.len() >= 2 { Some(circular_summary(&readings, params)?) } else { None };
            Ok(IntervalPaleocurrents { base_m: w[0], top_m: w[1], summary })
        })
        .collect()
}

/// All readings of a section, beds pooled.
pub fn section_readings(section: &Section) -> Vec<f64> {
    section.beds.iter().flat_map(|b| b.flow_azimuths()).collect()
}

/// How petal length relates to the number of readings in a bin.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum PetalScale {
    /// Radius ∝ count (exaggerates the modal bins).
    Count,
    /// Radius ∝ √count, so petal area ∝ count (common practice for honest roses).
    #[default]
    Area,
}

/// Parameters of rose-diagram binning.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RoseParams {
    /// Bin width in degrees; must divide 360 into a whole number of bins.
    pub bin_width_deg: f64,
    /// Azimuth where the first bin starts (e.g. −bin/2 to centre a bin on north).
    pub start_deg: f64,
    pub scale: PetalScale,
    /// For axial data every reading is also counted at its opposite azimuth (a symmetric rose).
    pub kind: DataKind,
}

impl Default for RoseParams {
    fn default() -> Self {
        RoseParams {
            bin_width_deg: 30.0,
            start_deg: 0.0,
            scale: PetalScale::Area,
            kind: DataKind::Directional,
        }
    }
}

/// One petal of a rose diagram.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RoseBin {
    /// Start azimuth of the bin (inclusive), 0 ≤ a < 360.
    pub from_deg: f64,
    /// End azimuth (exclusive); may exceed 360 when the bin straddles north.
    pub to_deg: f64,
    pub count: usize,
    /// Petal radius relative to the longest petal, 0–1.
    pub radius: f64,
}

/// A rose diagram as data, for the layout to draw.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RoseBins {
    pub params: RoseParams,
    /// Number of readings binned (axial readings count once here, though drawn twice).
    pub n: usize,
    pub bins: Vec<RoseBin>,
}

/// Bin azimuths (degrees, 0–360) into a rose diagram.
pub fn rose_bins(azimuths_deg: &[f64], params: &RoseParams) -> Result<RoseBins, AnalysisError> {
    validate(azimuths_deg)?;
    let w = params.bin_width_deg;
    let count_f = 360.0 / w;
    if !(w.is_finite() && w > 0.0 && w <= 360.0) || (count_f - count_f.round()).abs() > 1e-9 {
        return Err(AnalysisError::OutOfRange {
            field: "rose bin width".into(),
            value: w,
            valid: "the bin width must divide 360 degrees into whole bins (e.g. 10, 15, 20, 30, 45)".into(),
        });
    }
    if !params.start_deg.is_finite() {
        return Err(AnalysisError::OutOfRange {
            field: "rose start azimuth".into(),
            value: params.start_deg,
            valid: "a finite angle in degrees".into(),
        });
    }
    let nbins = count_f.round() as usize;
    let start = params.start_deg.rem_euclid(w);
    let mut counts = vec![0usize; nbins];
    let mut add = |a: f64| {
        // Index of the bin holding `a`, bins starting at `start`.
        let k = ((a - start).rem_euclid(360.0) / w).floor() as usize;
        counts[k.min(nbins - 1)] += 1;
    };
    for &a in azimuths_deg {
        add(a);
        if params.kind == DataKind::Axial {
            add((a + 180.0).rem_euclid(360.0));
        }
    }
    let max = counts.iter().copied().max().unwrap_or(0) as f64;
    let bins = counts
        .iter()
        .enumerate()
        .map(|(k, &count)| {
            let rel = if max > 0.0 { count as f64 / max } else { 0.0 };
            let from_deg = start + k as f64 * w;
            RoseBin {
                from_deg,
                to_deg: from_deg + w,
                count,
                radius: match params.scale {
                    PetalScale::Count => rel,
                    PetalScale::Area => rel.sqrt(),
                },
            }
        })
        .collect();
    Ok(RoseBins { params: *params, n: azimuths_deg.len(), bins })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn deg(rad: &[f64]) -> Vec<f64> {
        rad.iter().map(|r| r.to_degrees()).collect()
    }

    #[test]
    #[allow(clippy::approx_constant)] // 3.141 is a data value of the worked example, not π.
    fn worked_example_matches_published_values() {
        // The data of astropy's `astropy.stats.circstats` documentation example (Rayleigh test after
        // Mardia & Jupp 2000, §6.3.1 from memory; recomputed with astropy in tests/tests/analysis_paleocurrents.rs): z = 1.236,
        // p = 0.3048, R̄ = 0.4972, mean 58.04°.
        let a = deg(&[0.785, 1.570, 3.141, 0.839, 5.934]);
        let s = circular_summary(&a, &CircularParams::default()).expect("valid data");
        assert!((s.rayleigh_z - 1.236).abs() < 5e-4, "{s:?}");
        assert!((s.rayleigh_p - 0.3048).abs() < 5e-5, "{s:?}");
        assert!((s.mean_resultant_length - 0.4972).abs() < 5e-5, "{s:?}");
        assert!((s.mean_azimuth_deg.expect("mean") - 58.04).abs() < 5e-3, "{s:?}");
    }

    #[test]
    fn axial_data_ignore_sense_of_direction() {
        // An axis read at 10° or 190° is the same axis (Mardia & Jupp 2000, axial data).
        let p = CircularParams { kind: DataKind::Axial, ..Default::default() };
        let s = circular_summary(&[10.0, 190.0, 20.0, 200.0], &p).expect("valid");
        assert!((s.mean_azimuth_deg.expect("mean") - 15.0).abs() < 1e-9, "{s:?}");
        // As flow directions the same readings almost cancel.
        let d = circular_summary(&[10.0, 190.0, 20.0, 200.0], &CircularParams::default()).expect("valid");
        assert!(d.mean_resultant_length < 1e-9, "{d:?}");
        assert_eq!(d.mean_azimuth_deg, None);
    }

    #[test]
    fn mean_wraps_across_north() {
        let s = circular_summary(&[350.0, 10.0], &CircularParams::default()).expect("valid");
        let m = s.mean_azimuth_deg.expect("mean");
        assert!(m < 1e-9 || (360.0 - m) < 1e-9, "{m}");
    }

    #[test]
    fn rejects_bad_azimuths_and_too_few() {
        assert!(matches!(
            circular_summary(&[10.0, 400.0], &CircularParams::default()),
            Err(AnalysisError::OutOfRange { .. })
        ));
        assert!(matches!(
            circular_summary(&[10.0], &CircularParams::default()),
            Err(AnalysisError::TooFewValues { .. })
        ));
    }

    #[test]
    fn intervals_split_readings_by_bed_base() {
        use crate::model::{Bed, BedId, Lithology};
        let mut s = Section::new("Test");
        for (i, pcs) in [vec![10.0, 20.0], vec![], vec![200.0, 210.0, 220.0]].into_iter().enumerate() {
            let mut b = Bed::new(BedId(i as u64 + 1), 2.0, Lithology::Sandstone, None);
            b.paleocurrents = pcs.into_iter().map(crate::model::Paleocurrent::azimuth).collect();
            s.beds.push(b);
        }
        let r = per_interval(&s, &[0.0, 2.0, 6.0], &CircularParams::default()).expect("valid");
        assert_eq!(r[0].summary.as_ref().map(|x| x.n), Some(2));
        assert_eq!(r[1].summary.as_ref().map(|x| x.n), Some(3));
        assert!((r[1].summary.as_ref().and_then(|x| x.mean_azimuth_deg).expect("mean") - 210.0).abs() < 1e-9);
        let per = per_bed(&s, &CircularParams::default()).expect("valid");
        assert_eq!(per.iter().map(|b| b.bed_index).collect::<Vec<_>>(), vec![0, 2]);
        assert_eq!(per[1].base_m, 4.0);
    }

    #[test]
    fn rose_bins_count_and_area_scaling() {
        let a = [5.0, 15.0, 25.0, 95.0, 359.0];
        let count = rose_bins(
            &a,
            &RoseParams { bin_width_deg: 90.0, scale: PetalScale::Count, ..Default::default() },
        )
        .expect("valid");
        assert_eq!(count.bins.iter().map(|b| b.count).collect::<Vec<_>>(), vec![3, 1, 0, 1]);
        assert!((count.bins[1].radius - 1.0 / 3.0).abs() < 1e-12);
        let area = rose_bins(&a, &RoseParams { bin_width_deg: 90.0, ..Default::default() }).expect("valid");
        assert!((area.bins[1].radius - (1.0f64 / 3.0).sqrt()).abs() < 1e-12);
        // Centring a bin on north moves 359° and 5° into the same bin.
        let centred =
            rose_bins(&a, &RoseParams { bin_width_deg: 90.0, start_deg: -45.0, ..Default::default() })
                .expect("valid");
        assert_eq!(centred.bins[3].from_deg, 315.0);
        assert_eq!(centred.bins[3].count, 4, "{centred:?}"); // 359, 5, 15, 25 in 315–405
        assert!(rose_bins(&a, &RoseParams { bin_width_deg: 7.0, ..Default::default() }).is_err());
    }

    #[test]
    fn axial_rose_is_symmetric() {
        let r = rose_bins(
            &[10.0, 20.0],
            &RoseParams { bin_width_deg: 90.0, kind: DataKind::Axial, ..Default::default() },
        )
        .expect("valid");
        assert_eq!(r.bins.iter().map(|b| b.count).collect::<Vec<_>>(), vec![2, 0, 2, 0]);
    }
}
