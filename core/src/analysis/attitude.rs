//! Orientation arithmetic of a measured section: paleocurrent readings restored to horizontal
//! when the beds are tilted, the flow direction each indicator gives, and true thickness from a
//! distance measured along the ground. See `docs/paleocurrents.md`.
//!
//! # Frame and conventions
//! Vectors are (east, north, up). A line of trend `t` and plunge `p` (degrees, plunge positive
//! downward) is `(sin t·cos p, cos t·cos p, −sin p)`. The upward pole of a plane dipping `δ`
//! toward `β` is `(sin δ·sin β, sin δ·cos β, cos δ)`. Azimuths are degrees clockwise from north,
//! returned in 0 ≤ a < 360.
//!
//! # Restoring to horizontal
//! The standard stereonet procedure for tilted paleocurrents (Potter & Pettijohn 1977,
//! Paleocurrents and Basin Analysis, 2nd ed.; Ragan, Structural Geology: An Introduction to
//! Geometrical Techniques, on rotations;
//! Marshak & Mitra 1988, Basic Methods of Structural Geology): rotate every measurement about the
//! strike of bedding by the bedding dip, in the sense that brings bedding back to horizontal.
//! Here the rotation is done with vectors (Rodrigues' formula) instead of on a net. Small
//! corrections are not skipped: a bedding dip of 2° is restored like one of 40°. A single
//! rotation about strike assumes the beds were tilted about a horizontal axis (no plunging fold);
//! that is the usual assumption and the one stated in the sources above.

use crate::model::{BeddingAttitude, Indicator, Paleocurrent, Traverse};
use serde::Serialize;

/// Why an orientation could not be worked out.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum AttitudeError {
    /// A value outside its valid range.
    #[error("{field}: {value} is not valid; {valid}")]
    OutOfRange { field: &'static str, value: f64, valid: &'static str },
    /// The traverse lies in the bedding plane, so a distance along it crosses no thickness.
    #[error(
        "the traverse (bearing {bearing_deg}°, slope {slope_deg}°) runs along the bedding (dip {dip_deg}° toward \
         {dip_direction_deg}°), so a distance along it crosses no thickness; check the bearing, slope and bedding"
    )]
    TraverseInBedding { bearing_deg: f64, slope_deg: f64, dip_deg: f64, dip_direction_deg: f64 },
}

/// A 3-vector (east, north, up).
pub type Vec3 = [f64; 3];

fn check(
    field: &'static str,
    value: f64,
    lo: f64,
    hi: f64,
    valid: &'static str,
) -> Result<(), AttitudeError> {
    if value.is_finite() && (lo..=hi).contains(&value) {
        Ok(())
    } else {
        Err(AttitudeError::OutOfRange { field, value, valid })
    }
}

/// Check a bedding attitude: dip 0–90°, dip direction 0–360°.
pub fn check_bedding(bedding: &BeddingAttitude) -> Result<(), AttitudeError> {
    check("bedding dip", bedding.dip_deg, 0.0, 90.0, "a dip lies between 0 and 90 degrees")?;
    check(
        "bedding dip direction",
        bedding.dip_direction_deg,
        0.0,
        360.0,
        "a dip direction lies between 0 and 360 degrees",
    )
}

/// An azimuth in 0 ≤ a < 360.
fn wrap(a: f64) -> f64 {
    let w = a.rem_euclid(360.0);
    if w >= 360.0 {
        0.0
    } else {
        w
    }
}

/// The unit vector of a line of trend `trend_deg` and plunge `plunge_deg` (positive downward).
pub fn line_vector(trend_deg: f64, plunge_deg: f64) -> Vec3 {
    let (t, p) = (trend_deg.to_radians(), plunge_deg.to_radians());
    [t.sin() * p.cos(), t.cos() * p.cos(), -p.sin()]
}

/// Trend and plunge (degrees, plunge positive downward, negative when the vector points up) of a
/// vector; the trend is `None` for a vertical vector, which has none.
pub fn trend_plunge(v: Vec3) -> (Option<f64>, f64) {
    let h = v[0].hypot(v[1]);
    let plunge = (-v[2]).atan2(h).to_degrees();
    let trend = (h > 1e-9 * (h + v[2].abs())).then(|| wrap(v[0].atan2(v[1]).to_degrees()));
    (trend, plunge)
}

/// The upward unit pole of a plane dipping `dip_deg` toward `dip_direction_deg`.
pub fn upward_pole(dip_direction_deg: f64, dip_deg: f64) -> Vec3 {
    let (b, d) = (dip_direction_deg.to_radians(), dip_deg.to_radians());
    [d.sin() * b.sin(), d.sin() * b.cos(), d.cos()]
}

/// Plunge of the line of the bedding plane whose trend is `trend_deg` (the apparent dip in that
/// direction): `atan(tan δ · cos(trend − dip direction))`, degrees, positive when the line goes
/// down toward `trend_deg`, negative when it rises (Ragan, apparent dip).
pub fn plunge_in_bedding_deg(trend_deg: f64, bedding: &BeddingAttitude) -> f64 {
    let d = bedding.dip_deg.to_radians();
    let c = (trend_deg - bedding.dip_direction_deg).to_radians().cos();
    if bedding.dip_deg >= 90.0 {
        // tan 90° is infinite: every line but the strike line is vertical.
        return if c.abs() < 1e-12 { 0.0 } else { 90.0f64.copysign(c) };
    }
    (d.tan() * c).atan().to_degrees()
}

/// Rotate a vector about the strike of bedding by the bedding dip, in the sense that makes the
/// bedding horizontal (its upward pole goes to vertical). The axis is the horizontal line
/// `pole × up`, the rotation angle the dip (Rodrigues' formula,
/// `v cos θ + (k × v) sin θ + k (k·v)(1 − cos θ)`). Horizontal bedding leaves `v` unchanged.
pub fn restore_vector(v: Vec3, bedding: &BeddingAttitude) -> Vec3 {
    let b = bedding.dip_direction_deg.to_radians();
    // pole × up = sin δ·(cos β, −sin β, 0): the horizontal strike line pointing to azimuth β + 90°.
    // A right-handed turn by δ about it takes the pole to vertical.
    let k = [b.cos(), -b.sin(), 0.0];
    let theta = bedding.dip_deg.to_radians();
    let (c, s) = (theta.cos(), theta.sin());
    let kxv = [k[1] * v[2] - k[2] * v[1], k[2] * v[0] - k[0] * v[2], k[0] * v[1] - k[1] * v[0]];
    let kv = k[0] * v[0] + k[1] * v[1] + k[2] * v[2];
    [0, 1, 2].map(|i| v[i] * c + kxv[i] * s + k[i] * kv * (1.0 - c))
}

/// A line restored to horizontal bedding.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RestoredLine {
    /// Trend in the sense of the measured line, degrees; `None` when the line restores to vertical.
    pub trend_deg: Option<f64>,
    /// Plunge after restoring, degrees (positive downward, negative when it points up).
    pub plunge_deg: f64,
}

/// Restore a line measured as trend `trend_deg` and plunge `plunge_deg` (positive downward).
pub fn restore_line(trend_deg: f64, plunge_deg: f64, bedding: &BeddingAttitude) -> RestoredLine {
    let (trend_deg, plunge_deg) = trend_plunge(restore_vector(line_vector(trend_deg, plunge_deg), bedding));
    RestoredLine { trend_deg, plunge_deg }
}

/// Restore a line lying in the bedding plane, known by its trend only (a trough axis, parting
/// lineation or sole mark read with a compass on the bed): its plunge is the apparent dip of
/// bedding in that direction ([`plunge_in_bedding_deg`]); after restoring it is horizontal and
/// its azimuth is returned. The result is the angle in the bedding plane from strike, the
/// relation `tan(trend − strike) = tan(rake)·cos δ` run backwards (Ragan, rake and pitch).
///
/// In vertical bedding a trend alone does not fix a line of the bed (every line but the strike
/// line is vertical): a trend within 90° of the dip direction then restores to the dip direction,
/// any other to its opposite. Record the plunge for such beds.
pub fn restore_line_in_bedding(trend_deg: f64, bedding: &BeddingAttitude) -> f64 {
    // The vector (sin t, cos t, −tan δ·cos(t − β)) lies in the plane and keeps the sense of t.
    let plunge = plunge_in_bedding_deg(trend_deg, bedding);
    match restore_line(trend_deg, plunge, bedding).trend_deg {
        Some(t) => t,
        // Only for vertical bedding and a line down its dip: use the dip direction's sense.
        None => wrap(trend_deg),
    }
}

/// A plane restored to horizontal bedding.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RestoredPlane {
    /// Dip direction after restoring, degrees; `None` when the plane restores to horizontal.
    pub dip_direction_deg: Option<f64>,
    /// Dip after restoring, 0–90°.
    pub dip_deg: f64,
}

/// Restore a plane dipping `dip_deg` toward `dip_direction_deg` by rotating its pole. A pole
/// that rotates below the horizontal (a plane overturned by the rotation) is taken by its upward
/// end, so the result is always a dip of 0–90°.
pub fn restore_plane(dip_direction_deg: f64, dip_deg: f64, bedding: &BeddingAttitude) -> RestoredPlane {
    let mut p = restore_vector(upward_pole(dip_direction_deg, dip_deg), bedding);
    if p[2] < 0.0 {
        p = p.map(|x| -x);
    }
    let h = p[0].hypot(p[1]);
    RestoredPlane {
        dip_direction_deg: (h > 1e-9).then(|| wrap(p[0].atan2(p[1]).to_degrees())),
        dip_deg: h.atan2(p[2]).to_degrees(),
    }
}

/// What a reading's azimuth and dip are, geometrically.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Geometry {
    /// A plane: the azimuth is its dip direction and `dip_deg` its dip.
    Plane,
    /// A line with a measured plunge in `dip_deg`.
    Line,
    /// A line in the bedding plane known by its azimuth only (also a plane reading without dip).
    LineInBedding,
}

/// How a reading is treated geometrically: foresets, ripple lee faces, imbricated clasts,
/// accretion surfaces and unspecified readings with a dip are planes; trough axes, lineations
/// and sole marks with a plunge are lines; anything without a dip or plunge is a line in bedding.
pub fn geometry(reading: &Paleocurrent) -> Geometry {
    match (reading.indicator, reading.dip_deg) {
        (_, None) => Geometry::LineInBedding,
        (
            Indicator::TroughAxis
            | Indicator::PartingLineation
            | Indicator::FluteCast
            | Indicator::GrooveCast,
            Some(_),
        ) => Geometry::Line,
        (
            Indicator::Unspecified
            | Indicator::PlanarForeset
            | Indicator::Ripple
            | Indicator::Imbrication
            | Indicator::AccretionSurface,
            Some(_),
        ) => Geometry::Plane,
    }
}

/// A reading after restoring to horizontal.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct RestoredReading {
    /// The azimuth in the sense it was stored (dip direction, plunge direction or trend),
    /// restored, 0 ≤ a < 360.
    pub azimuth_deg: f64,
    /// The restored dip (plane) or plunge (line); `None` for a line in bedding (horizontal after
    /// restoring).
    pub dip_deg: Option<f64>,
    pub geometry: Geometry,
}

/// Restore one reading to horizontal for the section's bedding attitude.
///
/// - A line in bedding (no dip or plunge given): [`restore_line_in_bedding`].
/// - A line with a plunge: [`restore_line`].
/// - A plane with a dip: [`restore_plane`]. Should the plane come out horizontal (a "foreset"
///   parallel to bedding, which has no dip direction left), its azimuth is restored as a line in
///   bedding instead, and the dip is 0.
///
/// Errors name the field for azimuths outside 0–360°, dips outside 0–90° and bad bedding.
pub fn restore_reading(
    reading: &Paleocurrent,
    bedding: &BeddingAttitude,
) -> Result<RestoredReading, AttitudeError> {
    check_bedding(bedding)?;
    check_reading(reading)?;
    let geometry = geometry(reading);
    let a = reading.azimuth_deg;
    Ok(match (geometry, reading.dip_deg) {
        (Geometry::Plane, Some(dip)) => {
            let p = restore_plane(a, dip, bedding);
            RestoredReading {
                azimuth_deg: p.dip_direction_deg.unwrap_or_else(|| restore_line_in_bedding(a, bedding)),
                dip_deg: Some(p.dip_deg),
                geometry,
            }
        }
        (Geometry::Line, Some(plunge)) => {
            let l = restore_line(a, plunge, bedding);
            RestoredReading {
                azimuth_deg: l.trend_deg.unwrap_or_else(|| restore_line_in_bedding(a, bedding)),
                dip_deg: Some(l.plunge_deg),
                geometry,
            }
        }
        _ => RestoredReading { azimuth_deg: restore_line_in_bedding(a, bedding), dip_deg: None, geometry },
    })
}

/// Check a reading's azimuth (0–360°) and dip or plunge (0–90°).
pub fn check_reading(reading: &Paleocurrent) -> Result<(), AttitudeError> {
    check(
        "paleocurrent azimuth",
        reading.azimuth_deg,
        0.0,
        360.0,
        "an azimuth lies between 0 and 360 degrees",
    )?;
    if let Some(d) = reading.dip_deg {
        check("paleocurrent dip", d, 0.0, 90.0, "a dip or plunge lies between 0 and 90 degrees")?;
    }
    Ok(())
}

/// Whether a flow reading tells the direction of flow or only its line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Sense {
    /// The flow direction itself (a foreset dip direction, a trough axis plunge, a flute).
    OneWay,
    /// Only the line of flow, either way along it: parting lineation and groove casts (axial
    /// data, summarised with doubled angles).
    TwoWay,
}

/// The sense of an indicator's flow reading; `None` for accretion surfaces, which are not flow
/// indicators (they dip roughly across the flow; Miall 1974).
pub fn indicator_sense(indicator: Indicator) -> Option<Sense> {
    match indicator {
        Indicator::AccretionSurface => None,
        Indicator::PartingLineation | Indicator::GrooveCast => Some(Sense::TwoWay),
        Indicator::Unspecified
        | Indicator::TroughAxis
        | Indicator::PlanarForeset
        | Indicator::Ripple
        | Indicator::Imbrication
        | Indicator::FluteCast => Some(Sense::OneWay),
    }
}

/// A flow direction from one reading.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Flow {
    /// Azimuth of flow, 0 ≤ a < 360; for two-way readings one end of the line (the trend as
    /// measured, restored), with `azimuth + 180°` meaning the same.
    pub azimuth_deg: f64,
    pub sense: Sense,
    /// True when the reading was restored to horizontal.
    pub restored: bool,
}

/// The flow direction a reading gives, restored to horizontal when `bedding` is given.
///
/// - Imbricated clasts dip upstream, so flow = restored dip direction + 180° (common practice;
///   Potter & Pettijohn 1977).
/// - Parting lineation and groove casts are two-way: [`Sense::TwoWay`].
/// - Accretion surfaces give `Ok(None)`: they are not flow indicators.
/// - Everything else: the restored azimuth is the flow direction.
pub fn flow_of(
    reading: &Paleocurrent,
    bedding: Option<&BeddingAttitude>,
) -> Result<Option<Flow>, AttitudeError> {
    check_reading(reading)?;
    let Some(sense) = indicator_sense(reading.indicator) else {
        return Ok(None);
    };
    let azimuth = match bedding {
        Some(b) => restore_reading(reading, b)?.azimuth_deg,
        None => wrap(reading.azimuth_deg),
    };
    let azimuth_deg =
        if reading.indicator == Indicator::Imbrication { wrap(azimuth + 180.0) } else { azimuth };
    Ok(Some(Flow { azimuth_deg, sense, restored: bedding.is_some() }))
}

/// The signed share of a distance along the ground that crosses the bedding at right angles:
/// `sin δ·cos σ·sin α + cos δ·sin σ`, positive when walking up-section in upright beds.
///
/// With the frame above, a step along the traverse is `u = (sin b·cos σ, cos b·cos σ, sin σ)`
/// (bearing `b`, slope `σ` positive uphill in the direction walked) and the bedding's upward pole
/// is `n = (sin δ·sin β, sin δ·cos β, cos δ)`. The thickness crossed is `u·n`
/// `= sin δ·cos σ·cos(b − β) + cos δ·sin σ`, and with `α = b − strike` (the angle from the
/// right-hand-rule strike, `β − 90°`, clockwise to the bearing) `cos(b − β) = sin α`.
pub fn thickness_factor(traverse: &Traverse, bedding: &BeddingAttitude) -> Result<f64, AttitudeError> {
    check_bedding(bedding)?;
    check("traverse bearing", traverse.bearing_deg, 0.0, 360.0, "a bearing lies between 0 and 360 degrees")?;
    check(
        "traverse slope",
        traverse.slope_deg,
        -90.0,
        90.0,
        "a ground slope lies between -90 and 90 degrees (positive uphill in the direction walked)",
    )?;
    let (d, s) = (bedding.dip_deg.to_radians(), traverse.slope_deg.to_radians());
    let alpha = (traverse.bearing_deg - bedding.strike_rhr_deg()).to_radians();
    Ok(d.sin() * s.cos() * alpha.sin() + d.cos() * s.sin())
}

/// True (stratigraphic) thickness from a slope distance measured along the ground.
///
/// `t = s·|sin δ·cos σ·sin α + cos δ·sin σ|` (Compton 1985, Geology in the Field, and its
/// predecessor Manual of Field Geology, 1962, on thickness from a traverse; Ragan, Structural
/// Geology, the same relation; page numbers not checked), where
/// - `s` = `slope_distance_m`, the distance along the ground (not its horizontal projection);
/// - `δ` = bedding dip, `0–90°`;
/// - `σ` = ground slope along the traverse, **signed**: positive uphill in the direction walked;
/// - `α` = angle from the right-hand-rule strike (dip direction − 90°) clockwise to the traverse
///   bearing, so `α = 90°` walks straight down the dip direction and `α = 270°` up-dip.
///
/// Textbooks write the formula with a `±` and unsigned angles: `+` when the hillside and the
/// beds dip in opposite directions, `−` when they dip the same way. The signed slope and signed
/// `sin α` here make that choice by themselves; derivation in [`thickness_factor`]. Special
/// cases: straight across strike, walking uphill toward the dip direction (hillside facing
/// against the dip) `s·sin(δ + σ)`; walking uphill up-dip (hillside facing the same way as the
/// dip) `s·|sin(δ − σ)|`; flat ground `s·sin δ·|sin α|`; horizontal beds `s·|sin σ|`.
///
/// Errors: a negative or non-finite distance, angles out of range, or a traverse that runs in
/// the bedding plane (nothing crossed; usually a wrong sign of the slope or a bearing along
/// strike on flat ground).
pub fn true_thickness_m(
    slope_distance_m: f64,
    traverse: &Traverse,
    bedding: &BeddingAttitude,
) -> Result<f64, AttitudeError> {
    check(
        "slope distance",
        slope_distance_m,
        0.0,
        f64::MAX,
        "a distance along the ground is a finite length of 0 or more",
    )?;
    let f = thickness_factor(traverse, bedding)?;
    if slope_distance_m > 0.0 && f.abs() < 1e-9 {
        return Err(AttitudeError::TraverseInBedding {
            bearing_deg: traverse.bearing_deg,
            slope_deg: traverse.slope_deg,
            dip_deg: bedding.dip_deg,
            dip_direction_deg: bedding.dip_direction_deg,
        });
    }
    Ok(slope_distance_m * f.abs())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn bed(dip: f64, dip_dir: f64) -> BeddingAttitude {
        BeddingAttitude { dip_deg: dip, dip_direction_deg: dip_dir }
    }

    fn close(a: f64, b: f64, tol: f64) -> bool {
        let d = (a - b).rem_euclid(360.0);
        d.min(360.0 - d) < tol
    }

    #[test]
    fn flat_bedding_changes_nothing() {
        let flat = bed(0.0, 123.0);
        for a in [0.0, 37.0, 180.0, 359.0] {
            assert!(close(restore_line_in_bedding(a, &flat), a, 1e-9));
            let p = restore_plane(a, 25.0, &flat);
            assert!(close(p.dip_direction_deg.expect("dips"), a, 1e-9));
            assert!((p.dip_deg - 25.0).abs() < 1e-9);
        }
    }

    #[test]
    fn bedding_restores_to_horizontal() {
        // The bedding plane itself rotates to horizontal (the definition of the restoration).
        let b = bed(35.0, 250.0);
        assert!(restore_plane(250.0, 35.0, &b).dip_deg.abs() < 1e-9);
        // The dip line becomes horizontal pointing the same way; the strike line does not move.
        assert!(close(restore_line(250.0, 35.0, &b).trend_deg.expect("trend"), 250.0, 1e-9));
        assert!(restore_line(250.0, 35.0, &b).plunge_deg.abs() < 1e-9);
        assert!(close(restore_line_in_bedding(160.0, &b), 160.0, 1e-9));
        assert!(close(restore_line_in_bedding(340.0, &b), 340.0, 1e-9));
    }

    #[test]
    fn line_in_bedding_follows_the_rake_relation() {
        // Hand-worked with the rake relation tan(trend − strike) = tan(rake)·cos δ (Ragan, rake
        // and pitch): bedding 30° toward 090 (strike 000); a line trending 045 has rake
        // atan(tan 45° / cos 30°) = 49.107° from the strike, so it restores to 049.107.
        let b = bed(30.0, 90.0);
        let r = restore_line_in_bedding(45.0, &b);
        let rake = (45f64.to_radians().tan() / 30f64.to_radians().cos()).atan().to_degrees();
        assert!((rake - 49.1066).abs() < 1e-3);
        assert!((r - rake).abs() < 1e-9, "{r}");
        // Its plunge is the apparent dip atan(tan 30°·cos 45°) = 22.208° (Ragan, apparent dip).
        assert!((plunge_in_bedding_deg(45.0, &b) - 22.2077).abs() < 1e-3);
    }

    #[test]
    fn vertical_bedding_restores_trends_to_the_dip_line() {
        let b = bed(90.0, 90.0);
        assert!(close(restore_line_in_bedding(60.0, &b), 90.0, 1e-9));
        assert!(close(restore_line_in_bedding(250.0, &b), 270.0, 1e-9));
        // The strike line stays where it is.
        assert!(close(restore_line_in_bedding(0.0, &b), 0.0, 1e-9));
        // A line with its plunge recorded keeps its rake: 30° down toward 000 in a vertical bed
        // striking 000 (plunge = rake here) restores to 30° from the strike toward the dip.
        let l = restore_line(0.0, 30.0, &b);
        assert!(close(l.trend_deg.expect("trend"), 30.0, 1e-9), "{l:?}");
        assert!(l.plunge_deg.abs() < 1e-9);
    }

    #[test]
    fn imbrication_points_downstream_and_accretion_is_not_flow() {
        let imb = Paleocurrent { azimuth_deg: 20.0, indicator: Indicator::Imbrication, dip_deg: Some(15.0) };
        let f = flow_of(&imb, None).expect("valid").expect("flow");
        assert!(close(f.azimuth_deg, 200.0, 1e-9));
        let acc =
            Paleocurrent { azimuth_deg: 90.0, indicator: Indicator::AccretionSurface, dip_deg: Some(12.0) };
        assert_eq!(flow_of(&acc, Some(&bed(10.0, 0.0))).expect("valid"), None);
        let pl = Paleocurrent { azimuth_deg: 300.0, indicator: Indicator::PartingLineation, dip_deg: None };
        assert_eq!(flow_of(&pl, None).expect("valid").expect("flow").sense, Sense::TwoWay);
    }

    #[test]
    fn a_foreset_parallel_to_bedding_falls_back_to_a_line_in_bedding() {
        let b = bed(10.0, 90.0);
        let r = Paleocurrent { azimuth_deg: 90.0, indicator: Indicator::PlanarForeset, dip_deg: Some(10.0) };
        let x = restore_reading(&r, &b).expect("valid");
        assert!(close(x.azimuth_deg, 90.0, 1e-9));
        assert!(x.dip_deg.expect("dip").abs() < 1e-9);
    }

    #[test]
    fn true_thickness_special_cases() {
        // Flat ground, traverse straight down the dip direction: t = s·sin δ (Compton 1985).
        let b = bed(30.0, 90.0);
        let t = true_thickness_m(10.0, &Traverse { bearing_deg: 90.0, slope_deg: 0.0 }, &b).expect("valid");
        assert!((t - 5.0).abs() < 1e-12, "{t}");
        // Uphill toward the dip direction: the hillside faces against the dip, s·sin(δ + σ).
        let t = true_thickness_m(10.0, &Traverse { bearing_deg: 90.0, slope_deg: 20.0 }, &b).expect("valid");
        assert!((t - 10.0 * 50f64.to_radians().sin()).abs() < 1e-12, "{t}");
        // Downhill toward the dip direction: hillside and beds dip the same way, |s·sin(δ − σ)|.
        let t = true_thickness_m(10.0, &Traverse { bearing_deg: 90.0, slope_deg: -20.0 }, &b).expect("valid");
        assert!((t - 10.0 * 10f64.to_radians().sin()).abs() < 1e-12, "{t}");
        // Horizontal beds: only the rise counts.
        let t = true_thickness_m(10.0, &Traverse { bearing_deg: 17.0, slope_deg: 30.0 }, &bed(0.0, 0.0))
            .expect("valid");
        assert!((t - 5.0).abs() < 1e-12, "{t}");
        // Along strike on flat ground nothing is crossed: an error, not a zero thickness.
        assert!(matches!(
            true_thickness_m(10.0, &Traverse { bearing_deg: 0.0, slope_deg: 0.0 }, &b),
            Err(AttitudeError::TraverseInBedding { .. })
        ));
        assert!(true_thickness_m(-1.0, &Traverse { bearing_deg: 0.0, slope_deg: 0.0 }, &b).is_err());
        assert!(
            true_thickness_m(1.0, &Traverse { bearing_deg: 0.0, slope_deg: 0.0 }, &bed(95.0, 0.0)).is_err()
        );
    }

    #[test]
    fn bad_readings_are_named() {
        let r = Paleocurrent { azimuth_deg: 400.0, indicator: Indicator::Ripple, dip_deg: None };
        let e = restore_reading(&r, &bed(10.0, 0.0)).expect_err("out of range");
        assert!(e.to_string().contains("paleocurrent azimuth"), "{e}");
        let r = Paleocurrent { azimuth_deg: 40.0, indicator: Indicator::Ripple, dip_deg: Some(-3.0) };
        assert!(flow_of(&r, None).expect_err("bad dip").to_string().contains("paleocurrent dip"));
    }
}
