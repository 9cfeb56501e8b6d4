//! Paleocurrent statistics: vector mean, mean resultant length, circular spread, Rayleigh test
//! and rose-diagram bins, per bed, per channel body, per interval and per section.
//!
//! Readings enter as flow directions: restored to horizontal when the section has a bedding
//! attitude, imbrication turned downstream, accretion-surface dips left out
//! ([`super::attitude::flow_of`]). The grouped statistics ([`grouped`]) keep one-way flow
//! readings, two-way readings (parting lineation, groove casts: summarised as axes) and
//! accretion-surface dips apart, never pooling accretion surfaces with flow (Miall 1974).
//! See `docs/paleocurrents.md`.
//!
//! Formulas: mean direction atan2(ΣsinΘ, ΣcosΘ), mean resultant length R̄ = R/n and circular
//! standard deviation √(−2 ln R̄) (Mardia & Jupp 2000, eqs 2.2.4 and 2.3.11). Axial data
//! (e.g. the trend of a channel axis, where 10° and 190° mean the same) are handled the usual
//! way: double the angles, compute on the doubled angles, halve the mean direction and the
//! circular standard deviation (Mardia & Jupp 2000, on axial data). The Rayleigh test of
//! uniformity uses z = nR̄² and, by default, Zar's (1999) approximation of p.

use super::attitude::{flow_of, restore_reading, AttitudeError, Sense};
use super::AnalysisError;
use crate::model::{Bed, BeddingAttitude, Indicator, Section};
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

/// Statistics for every bed with at least two readings (restored flow readings as in
/// [`flow_readings`], of the kind in `params`).
pub fn per_bed(section: &Section, params: &CircularParams) -> Result<Vec<BedPaleocurrents>, AnalysisError> {
    let bases = section.base_heights_m();
    let mut out = Vec::new();
    for (i, bed) in section.beds.iter().enumerate() {
        let readings = bed_readings(bed, section.bedding.as_ref(), params.kind);
        if readings.len() >= 2 {
            let summary = circular_summary(&readings, params).map_err(|e| bed_error(section, i, e))?;
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

/// The flow azimuths of one bed, degrees, for the statistics of `kind`: restored to horizontal
/// when `bedding` is given, imbrication turned downstream, accretion surfaces left out.
/// `Directional` takes the one-way readings only (two-way lineations and groove casts tell no
/// sense of flow); `Axial` takes every flow reading as an axis. A reading that cannot be restored
/// (an azimuth or dip out of range, a bad bedding attitude) is passed on as measured, so that the
/// statistics reject it by name rather than drop it silently.
pub fn bed_readings(bed: &Bed, bedding: Option<&BeddingAttitude>, kind: DataKind) -> Vec<f64> {
    bed.paleocurrents
        .iter()
        .filter(|p| p.indicator.is_flow())
        .filter_map(|p| match flow_of(p, bedding) {
            Ok(Some(f)) => (kind == DataKind::Axial || f.sense == Sense::OneWay).then_some(f.azimuth_deg),
            Ok(None) => None,
            Err(_) => Some(p.azimuth_deg),
        })
        .collect()
}

/// The flow azimuths a column draws for one bed, degrees: every flow reading (one-way and
/// two-way; a two-way reading is drawn at its measured end), restored to horizontal when
/// `bedding` is given and imbrication turned downstream. As many values as
/// [`Bed::flow_azimuths`]; a reading that cannot be restored is drawn as measured.
pub fn bed_flow_azimuths(bed: &Bed, bedding: Option<&BeddingAttitude>) -> Vec<f64> {
    bed_readings(bed, bedding, DataKind::Axial)
}

/// The flow readings of the beds whose base lies in `base_m ≤ h < top_m`, of `kind`
/// ([`bed_readings`], restored with the section's bedding attitude).
pub fn flow_readings_in_interval(section: &Section, base_m: f64, top_m: f64, kind: DataKind) -> Vec<f64> {
    let bases = section.base_heights_m();
    flow_readings_of_beds(section, beds_in_interval(&bases, base_m, top_m), kind)
}

/// The beds whose base lies in `base_m ≤ h < top_m`, found by bisection in the ascending bed
/// bases (`Section::base_heights_m`; thicknesses are positive once validated), so that cutting a
/// long section into many intervals stays linear.
pub fn beds_in_interval(bases: &[f64], base_m: f64, top_m: f64) -> std::ops::Range<usize> {
    let first = bases.partition_point(|h| *h < base_m);
    first..bases.partition_point(|h| *h < top_m).max(first)
}

/// The flow readings of a run of beds, of `kind` ([`bed_readings`], restored with the section's
/// bedding attitude).
pub fn flow_readings_of_beds(section: &Section, beds: std::ops::Range<usize>, kind: DataKind) -> Vec<f64> {
    section.beds.range(beds).flat_map(|b| bed_readings(b, section.bedding.as_ref(), kind)).collect()
}

/// One-way flow readings of the beds whose base lies in `base_m ≤ h < top_m`
/// ([`flow_readings_in_interval`] with [`DataKind::Directional`]).
pub fn readings_in_interval(section: &Section, base_m: f64, top_m: f64) -> Vec<f64> {
    flow_readings_in_interval(section, base_m, top_m, DataKind::Directional)
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
            let readings = flow_readings_in_interval(section, w[0], top, params.kind);
            let summary = if readings.len() >= 2 { Some(circular_summary(&readings, params)?) } else { None };
            Ok(IntervalPaleocurrents { base_m: w[0], top_m: w[1], summary })
        })
        .collect()
}

/// The flow readings of a section of `kind`, beds pooled ([`bed_readings`]).
pub fn flow_readings(section: &Section, kind: DataKind) -> Vec<f64> {
    section.beds.iter().flat_map(|b| bed_readings(b, section.bedding.as_ref(), kind)).collect()
}

/// The one-way flow readings of a section, beds pooled, restored to horizontal when it has a
/// bedding attitude ([`flow_readings`] with [`DataKind::Directional`]).
pub fn section_readings(section: &Section) -> Vec<f64> {
    flow_readings(section, DataKind::Directional)
}

/// How many readings of one indicator a group holds.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct IndicatorCount {
    /// The indicator's name ("trough axis", "accretion surface").
    pub indicator: &'static str,
    pub n: usize,
}

/// The paleocurrent readings of one stretch of section, kept apart by what they tell.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ReadingGroup {
    #[serde(rename = "base")]
    pub base_m: f64,
    #[serde(rename = "top")]
    pub top_m: f64,
    /// Readings of each indicator present, in the vocabulary's order.
    pub indicators: Vec<IndicatorCount>,
    /// Restored one-way flow azimuths (flow = imbrication + 180°).
    pub flow_deg: Vec<f64>,
    /// Their statistics as directions; `None` below two readings.
    pub flow: Option<CircularSummary>,
    /// Restored trends of two-way readings (parting lineation, groove casts).
    pub axes_deg: Vec<f64>,
    /// Their statistics as axial data (doubled angles); `None` below two readings.
    pub axes: Option<CircularSummary>,
    /// Restored dip directions of accretion surfaces: roughly across the flow, never pooled with it.
    pub accretion_deg: Vec<f64>,
    /// Their statistics as directions; `None` below two readings.
    pub accretion: Option<CircularSummary>,
    /// Mean restored dip of the accretion surfaces read with a dip, degrees.
    pub accretion_mean_dip_deg: Option<f64>,
}

impl ReadingGroup {
    /// Every reading of the group, of any indicator.
    pub fn total(&self) -> usize {
        self.indicators.iter().map(|c| c.n).sum()
    }
}

/// The paleocurrents of one channel body of the rules.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BodyReadings {
    /// Index into `Interpretation::channel_bodies`.
    pub body: usize,
    /// Lowest and highest bed of the body (indices into the section's beds, inclusive).
    pub first_bed: usize,
    pub last_bed: usize,
    pub group: ReadingGroup,
}

/// Paleocurrents of a section grouped per section, per channel body and per interval.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct GroupedPaleocurrents {
    /// The bedding attitude the readings were restored with; `None`: not tilt-corrected (the
    /// section has no bedding attitude).
    pub restored_with: Option<BeddingAttitude>,
    pub section: ReadingGroup,
    pub bodies: Vec<BodyReadings>,
    pub intervals: Vec<ReadingGroup>,
}

fn attitude_error(section: &Section, bed: Option<usize>, e: AttitudeError) -> AnalysisError {
    let at = match bed {
        Some(i) => format!("section {:?}, bed {}", section.name, i + 1),
        None => format!("section {:?}", section.name),
    };
    match e {
        AttitudeError::OutOfRange { field, value, valid } => {
            AnalysisError::OutOfRange { field: format!("{at} ({field})"), value, valid: valid.into() }
        }
        other => AnalysisError::OutOfRange { field: at, value: f64::NAN, valid: other.to_string() },
    }
}

fn summary_of(
    values: &[f64],
    kind: DataKind,
    params: &CircularParams,
) -> Result<Option<CircularSummary>, AnalysisError> {
    if values.len() < 2 {
        return Ok(None);
    }
    circular_summary(values, &CircularParams { kind, ..*params }).map(Some)
}

/// The readings of the beds `beds` (indices) as one group between `base_m` and `top_m`.
fn group_of(
    section: &Section,
    beds: impl Iterator<Item = usize>,
    base_m: f64,
    top_m: f64,
    params: &CircularParams,
) -> Result<ReadingGroup, AnalysisError> {
    let bedding = section.bedding.as_ref();
    let mut counts = vec![0usize; Indicator::ALL.len()];
    let (mut flow, mut axes, mut accretion, mut dips) = (Vec::new(), Vec::new(), Vec::new(), Vec::new());
    for i in beds {
        let Some(bed) = section.beds.get(i) else { continue };
        for p in &bed.paleocurrents {
            if let Some(k) = Indicator::ALL.iter().position(|x| *x == p.indicator) {
                counts[k] += 1;
            }
            match flow_of(p, bedding).map_err(|e| attitude_error(section, Some(i), e))? {
                Some(f) if f.sense == Sense::OneWay => flow.push(f.azimuth_deg),
                Some(f) => axes.push(f.azimuth_deg),
                None => {
                    let (azimuth, dip) = match bedding {
                        Some(b) => {
                            let r = restore_reading(p, b).map_err(|e| attitude_error(section, Some(i), e))?;
                            (r.azimuth_deg, p.dip_deg.and(r.dip_deg))
                        }
                        None => (p.azimuth_deg.rem_euclid(360.0), p.dip_deg),
                    };
                    accretion.push(azimuth);
                    dips.extend(dip);
                }
            }
        }
    }
    let indicators = Indicator::ALL
        .iter()
        .zip(&counts)
        .filter(|(_, n)| **n > 0)
        .map(|(i, n)| IndicatorCount { indicator: i.name(), n: *n })
        .collect();
    Ok(ReadingGroup {
        base_m,
        top_m,
        indicators,
        flow: summary_of(&flow, DataKind::Directional, params)?,
        axes: summary_of(&axes, DataKind::Axial, params)?,
        accretion: summary_of(&accretion, DataKind::Directional, params)?,
        accretion_mean_dip_deg: (!dips.is_empty()).then(|| dips.iter().sum::<f64>() / dips.len() as f64),
        flow_deg: flow,
        axes_deg: axes,
        accretion_deg: accretion,
    })
}

/// The beds (first, last; inclusive indices) of each channel body of an interpretation of the
/// section, from its storeys.
pub fn body_bed_ranges(interp: &crate::rules::Interpretation) -> Vec<(usize, usize)> {
    interp
        .channel_bodies
        .iter()
        .map(|b| {
            let storeys = b.storey_indices.iter().filter_map(|&k| interp.storeys.get(k));
            let first = storeys.clone().map(|s| s.first_bed).min().unwrap_or(0);
            let last = storeys.map(|s| s.last_bed).max().unwrap_or(0);
            (first, last)
        })
        .collect()
}

/// Paleocurrents per section, per channel body of `interp` (the rules' interpretation of this
/// section) and per interval between consecutive heights of `bounds_m` (ascending; a bed belongs
/// to the interval holding its base, the last interval also takes a bed based at its top, as in
/// [`per_interval`]). `params.kind` is not used: each part of a group has its own kind. Errors
/// name the section and bed of a reading that cannot be restored, or a bad bedding attitude.
pub fn grouped(
    section: &Section,
    interp: &crate::rules::Interpretation,
    bounds_m: &[f64],
    params: &CircularParams,
) -> Result<GroupedPaleocurrents, AnalysisError> {
    if let Some(b) = &section.bedding {
        super::attitude::check_bedding(b).map_err(|e| attitude_error(section, None, e))?;
    }
    let bases = section.base_heights_m();
    let n = section.beds.len();
    let whole = group_of(section, 0..n, 0.0, section.total_thickness_m(), params)?;
    let bodies = body_bed_ranges(interp)
        .into_iter()
        .zip(&interp.channel_bodies)
        .enumerate()
        .map(|(k, ((first, last), body))| {
            Ok(BodyReadings {
                body: k,
                first_bed: first,
                last_bed: last,
                group: group_of(
                    section,
                    first..=last.min(n.saturating_sub(1)),
                    body.base_m,
                    body.top_m,
                    params,
                )?,
            })
        })
        .collect::<Result<Vec<_>, AnalysisError>>()?;
    let m = bounds_m.len();
    let intervals = bounds_m
        .windows(2)
        .enumerate()
        .map(|(k, w)| {
            let top = if k + 2 == m { w[1] + 1e-9 } else { w[1] };
            group_of(section, beds_in_interval(&bases, w[0], top), w[0], w[1], params)
        })
        .collect::<Result<Vec<_>, AnalysisError>>()?;
    Ok(GroupedPaleocurrents { restored_with: section.bedding, section: whole, bodies, intervals })
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

    fn reading(
        azimuth_deg: f64,
        indicator: crate::model::Indicator,
        dip_deg: Option<f64>,
    ) -> crate::model::Paleocurrent {
        crate::model::Paleocurrent { azimuth_deg, indicator, dip_deg }
    }

    /// Two beds: a trough-cross-bedded sand with imbricated gravel and a lineated sand with
    /// lateral-accretion surfaces.
    fn mixed_section() -> Section {
        use crate::model::{Bed, BedId, Indicator as I, Lithology};
        let mut s = Section::new("Mixed");
        let mut a = Bed::new(BedId(1), 2.0, Lithology::Sandstone, None);
        a.paleocurrents = vec![
            reading(200.0, I::TroughAxis, None),
            reading(220.0, I::TroughAxis, None),
            reading(30.0, I::Imbrication, Some(20.0)),
        ];
        let mut b = Bed::new(BedId(2), 3.0, Lithology::Sandstone, None);
        b.paleocurrents = vec![
            reading(20.0, I::PartingLineation, None),
            reading(200.0, I::PartingLineation, None),
            reading(300.0, I::AccretionSurface, Some(10.0)),
            reading(310.0, I::AccretionSurface, Some(14.0)),
        ];
        s.beds = vec![a, b].into();
        s
    }

    #[test]
    fn groups_keep_flow_axes_and_accretion_apart() {
        let s = mixed_section();
        let interp = crate::rules::interpret(&s, &crate::rules::RuleParams::default());
        let g = grouped(&s, &interp, &[0.0, 2.0, 5.0], &CircularParams::default()).expect("valid");
        assert_eq!(g.restored_with, None);
        let w = &g.section;
        // Imbrication dips upstream: 030 becomes a flow toward 210 (common practice).
        assert_eq!(w.flow_deg, vec![200.0, 220.0, 210.0]);
        assert!((w.flow.as_ref().and_then(|f| f.mean_azimuth_deg).expect("mean") - 210.0).abs() < 1e-9);
        // Parting lineation is two-way: 020 and 200 are one axis (Mardia & Jupp 2000, axial data).
        let axes = w.axes.as_ref().expect("two axes");
        assert!((axes.mean_azimuth_deg.expect("mean") - 20.0).abs() < 1e-9, "{axes:?}");
        assert!((axes.mean_resultant_length - 1.0).abs() < 1e-12);
        // Accretion surfaces stay out of the flow (Miall 1974).
        assert_eq!(w.accretion_deg, vec![300.0, 310.0]);
        assert_eq!(w.accretion_mean_dip_deg, Some(12.0));
        assert_eq!(w.total(), 7);
        let names: Vec<_> = w.indicators.iter().map(|c| (c.indicator, c.n)).collect();
        assert_eq!(
            names,
            vec![("trough axis", 2), ("imbrication", 1), ("parting lineation", 2), ("accretion surface", 2)]
        );
        // Intervals split by bed base.
        assert_eq!(g.intervals[0].flow_deg.len(), 3);
        assert_eq!(g.intervals[1].flow_deg.len(), 0);
        assert_eq!(g.intervals[1].accretion_deg.len(), 2);
        // The plain statistics take one-way readings only, or every flow reading as axes.
        assert_eq!(section_readings(&s), vec![200.0, 220.0, 210.0]);
        assert_eq!(flow_readings(&s, DataKind::Axial).len(), 5);
        // The column draws every flow reading, as many as Bed::flow_azimuths gives.
        assert_eq!(bed_flow_azimuths(&s.beds[0], None), vec![200.0, 220.0, 210.0]);
        assert_eq!(bed_flow_azimuths(&s.beds[1], None).len(), s.beds[1].flow_azimuths().count());
    }

    #[test]
    fn bodies_take_the_readings_of_their_beds() {
        use crate::model::{Bed, BedId, Contact, GrainSize, Lithology, WentworthClass};
        // Mudstone, an erosive-based channel sandstone with readings, mudstone with a reading.
        let mut s = Section::new("Body");
        let mut mud = Bed::new(BedId(1), 3.0, Lithology::Mudstone, None);
        mud.paleocurrents = vec![crate::model::Paleocurrent::azimuth(90.0)];
        let mut sand =
            Bed::new(BedId(2), 4.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand)));
        sand.base_contact = Contact::Erosional;
        sand.paleocurrents = [100.0, 120.0, 110.0].map(crate::model::Paleocurrent::azimuth).to_vec();
        let mut top = Bed::new(BedId(3), 3.0, Lithology::Mudstone, None);
        top.paleocurrents = vec![crate::model::Paleocurrent::azimuth(300.0)];
        s.beds = vec![mud, sand, top].into();
        let interp = crate::rules::interpret(&s, &crate::rules::RuleParams::default());
        assert_eq!(interp.channel_bodies.len(), 1, "{:?}", interp.channel_bodies);
        let g = grouped(&s, &interp, &[0.0, 10.0], &CircularParams::default()).expect("valid");
        assert_eq!(g.bodies.len(), 1);
        assert_eq!((g.bodies[0].first_bed, g.bodies[0].last_bed), (1, 1));
        assert_eq!(g.bodies[0].group.flow_deg, vec![100.0, 120.0, 110.0]);
        assert_eq!(g.section.flow_deg.len(), 5);
    }

    #[test]
    fn tilted_sections_are_restored_before_pooling() {
        use crate::model::{BeddingAttitude, Indicator as I};
        let mut s = mixed_section();
        // Bedding 30° toward 090 (strike 000): a trough axis trending 045 in the bedding restores
        // to 049.107 (rake relation, see analysis::attitude).
        s.bedding = Some(BeddingAttitude { dip_deg: 30.0, dip_direction_deg: 90.0 });
        s.beds[0].paleocurrents =
            vec![reading(45.0, I::TroughAxis, None), reading(45.0, I::TroughAxis, None)];
        let interp = crate::rules::interpret(&s, &crate::rules::RuleParams::default());
        let g = grouped(&s, &interp, &[0.0, 5.0], &CircularParams::default()).expect("valid");
        assert_eq!(g.restored_with, s.bedding);
        assert!((g.section.flow_deg[0] - 49.1066).abs() < 1e-3, "{:?}", g.section.flow_deg);
        assert!((section_readings(&s)[0] - 49.1066).abs() < 1e-3);
        // A bad bedding attitude is an error naming the section.
        s.bedding = Some(BeddingAttitude { dip_deg: 120.0, dip_direction_deg: 90.0 });
        let e = grouped(&s, &interp, &[0.0, 5.0], &CircularParams::default()).expect_err("bad dip");
        assert!(e.to_string().contains("section \"Mixed\" (bedding dip)"), "{e}");
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
