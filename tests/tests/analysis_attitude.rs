//! Tilt correction of paleocurrents and apparent-to-true thickness, checked against an
//! independent computation in numpy (rotation matrices built from the bedding's strike, dip and
//! pole as a change of basis, not from the axis-angle formula the library uses) and against
//! hand-worked textbook cases.

use crate::support::oracle::{python_json, SplitMix};
use aggrade_core::analysis::attitude::{
    flow_of, plunge_in_bedding_deg, restore_line, restore_line_in_bedding, restore_plane, restore_reading,
    true_thickness_m, Sense,
};
use aggrade_core::model::{BeddingAttitude, Indicator, Paleocurrent, Traverse};
use serde_json::json;

/// The oracle. Frame (east, north, up). The bedding's strike line S (right-hand rule, azimuth
/// β − 90°, horizontal), its dip line D (azimuth β, plunging δ) and its upward pole N = D × S
/// form an orthonormal basis; restoring maps it onto (S, horizontal D, up), so
/// R = [S, Dh, Z] · [S, D, N]ᵀ. Lines in bedding are the intersection of the bedding with the
/// vertical plane of the trend. Thickness is the distance of the traverse's far end from the
/// bedding plane through its start.
const ORACLE: &str = r#"
import json, sys
import numpy as np
def unit(v): return v / np.linalg.norm(v)
def az(v): return float(np.degrees(np.arctan2(v[0], v[1])) % 360.0)
def line(t, p):
    t, p = np.radians(t), np.radians(p)
    return np.array([np.sin(t)*np.cos(p), np.cos(t)*np.cos(p), -np.sin(p)])
out = []
for c in json.loads(sys.argv[1]):
    dip, dd = c["dip"], c["dip_dir"]
    S = line(dd - 90.0, 0.0)
    D = line(dd, dip)
    N = np.cross(D, S)
    assert N[2] >= -1e-12
    Dh = line(dd, 0.0)
    R = np.column_stack([S, Dh, [0.0, 0.0, 1.0]]) @ np.column_stack([S, D, N]).T
    assert np.allclose(R @ R.T, np.eye(3)) and abs(np.linalg.det(R) - 1.0) < 1e-12
    # A line in bedding: bedding ∩ vertical plane of trend t, taken in the sense of t.
    t = np.radians(c["trend"])
    m = np.array([np.cos(t), -np.sin(t), 0.0])
    L = unit(np.cross(N, m))
    if L[0]*np.sin(t) + L[1]*np.cos(t) < 0: L = -L
    Lr = R @ L
    # A plane: rotate its upward pole, take the upward end.
    P = R @ line(c["plane_dir"] + 180.0, 90.0 - c["plane_dip"])
    if P[2] < 0: P = -P
    # A measured line.
    M = R @ line(c["line_trend"], c["line_plunge"])
    # Thickness: far end of the traverse, distance from the bedding plane.
    b, s = np.radians(c["bearing"]), np.radians(c["slope"])
    end = c["dist"] * np.array([np.sin(b)*np.cos(s), np.cos(b)*np.cos(s), np.sin(s)])
    out.append({
        "line_in_bedding": az(Lr),
        "line_in_bedding_plunge": float(np.degrees(np.arcsin(-L[2]))),
        "restored_line_vertical": float(Lr[2]),
        "plane_dir": az(P),
        "plane_dip": float(np.degrees(np.arccos(np.clip(P[2], -1, 1)))),
        "line_trend": az(M),
        "line_plunge": float(np.degrees(np.arcsin(-M[2]))),
        "thickness": float(abs(end @ N)),
    })
print(json.dumps(out))
"#;

fn angle_diff(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(360.0);
    d.min(360.0 - d)
}

#[test]
fn restoration_and_thickness_match_numpy() {
    let mut rng = SplitMix(16_061_974);
    let mut cases = Vec::new();
    for k in 0..200 {
        // Include the flat and near-flat beds that field practice often leaves uncorrected.
        let dip = match k {
            0..=9 => 0.0,
            10..=29 => rng.range(0.5, 10.0),
            _ => rng.range(0.0, 85.0),
        };
        cases.push(json!({
            "dip": dip,
            "dip_dir": rng.range(0.0, 360.0),
            "trend": rng.range(0.0, 360.0),
            "plane_dir": rng.range(0.0, 360.0),
            "plane_dip": rng.range(5.0, 35.0),
            "line_trend": rng.range(0.0, 360.0),
            "line_plunge": rng.range(0.0, 60.0),
            "bearing": rng.range(0.0, 360.0),
            "slope": rng.range(-40.0, 40.0),
            "dist": rng.range(0.1, 50.0),
        }));
    }
    let oracle = python_json(ORACLE, &[&serde_json::to_string(&cases).expect("json")], "numpy");
    let oracle = oracle.as_array().expect("a list");
    assert_eq!(oracle.len(), cases.len());
    let f = |v: &serde_json::Value, k: &str| v[k].as_f64().unwrap_or_else(|| panic!("{k} in {v}"));
    let mut compared_thickness = 0;
    for (c, o) in cases.iter().zip(oracle) {
        let b = BeddingAttitude { dip_deg: f(c, "dip"), dip_direction_deg: f(c, "dip_dir") };
        let why = format!("case {c}, oracle {o}");
        assert!(
            f(o, "restored_line_vertical").abs() < 1e-9,
            "oracle: a line in bedding restores level; {why}"
        );
        assert!(
            angle_diff(restore_line_in_bedding(f(c, "trend"), &b), f(o, "line_in_bedding")) < 1e-7,
            "{why}"
        );
        assert!(
            (plunge_in_bedding_deg(f(c, "trend"), &b) - f(o, "line_in_bedding_plunge")).abs() < 1e-7,
            "{why}"
        );
        let p = restore_plane(f(c, "plane_dir"), f(c, "plane_dip"), &b);
        assert!((p.dip_deg - f(o, "plane_dip")).abs() < 1e-7, "{why}");
        if p.dip_deg > 1e-3 {
            assert!(angle_diff(p.dip_direction_deg.expect("dips"), f(o, "plane_dir")) < 1e-5, "{why}");
        }
        let l = restore_line(f(c, "line_trend"), f(c, "line_plunge"), &b);
        assert!((l.plunge_deg - f(o, "line_plunge")).abs() < 1e-7, "{why}");
        if l.plunge_deg.abs() < 89.9 {
            assert!(angle_diff(l.trend_deg.expect("trend"), f(o, "line_trend")) < 1e-5, "{why}");
        }
        // The same through the reading API: a foreset with a dip, a trough axis without.
        let foreset = Paleocurrent {
            azimuth_deg: f(c, "plane_dir"),
            indicator: Indicator::PlanarForeset,
            dip_deg: Some(f(c, "plane_dip")),
        };
        let r = restore_reading(&foreset, &b).expect("valid");
        if p.dip_deg > 1e-3 {
            assert!(angle_diff(r.azimuth_deg, f(o, "plane_dir")) < 1e-5, "{why}");
        }
        let trough =
            Paleocurrent { azimuth_deg: f(c, "trend"), indicator: Indicator::TroughAxis, dip_deg: None };
        let fl = flow_of(&trough, Some(&b)).expect("valid").expect("a flow indicator");
        assert!(angle_diff(fl.azimuth_deg, f(o, "line_in_bedding")) < 1e-7, "{why}");
        assert_eq!(fl.sense, Sense::OneWay);
        let tr = Traverse { bearing_deg: f(c, "bearing"), slope_deg: f(c, "slope") };
        if f(o, "thickness") > 1e-6 {
            let t = true_thickness_m(f(c, "dist"), &tr, &b).expect("valid");
            assert!((t - f(o, "thickness")).abs() < 1e-9 * f(c, "dist").max(1.0), "{why}: {t}");
            compared_thickness += 1;
        }
    }
    assert!(compared_thickness > 190, "{compared_thickness}");
}

#[test]
fn restoring_a_cross_bed_set_textbook_case() {
    // The textbook situation (Potter & Pettijohn 1977, Paleocurrents and Basin Analysis;
    // described from memory): a foreset measured on tilted beds gives a wrong current direction
    // until the beds are rotated back. Hand-worked here on the stereonet's geometry: beds dip 40° toward 000; a
    // foreset dipping 40° + 20° = 60° toward 000 lies in the vertical plane of the dip, so the
    // rotation about strike only subtracts the bedding dip: it restores to 20° toward 000.
    let b = BeddingAttitude { dip_deg: 40.0, dip_direction_deg: 0.0 };
    let r = restore_plane(0.0, 60.0, &b);
    assert!((r.dip_deg - 20.0).abs() < 1e-9, "{r:?}");
    assert!(angle_diff(r.dip_direction_deg.expect("dips"), 0.0) < 1e-9);
    // A foreset dipping 25° toward 180 (against the bedding dip) restores to 65° toward 180.
    let r = restore_plane(180.0, 25.0, &b);
    assert!((r.dip_deg - 65.0).abs() < 1e-9, "{r:?}");
    assert!(angle_diff(r.dip_direction_deg.expect("dips"), 180.0) < 1e-9);
    // A foreset dipping 30° toward 090 (along strike) keeps its 30° dip in the restored frame
    // only if the bedding were flat; tilted 40° about the E–W strike, its pole (sin 30°, 0,
    // cos 30°) turns about the east axis: restored pole (0.5, −0.866·sin 40°, 0.866·cos 40°), so
    // the dip direction swings to atan2(0.5, −0.5567) = 138.07° and the dip is
    // acos(0.866·cos 40°) = 48.44°.
    let r = restore_plane(90.0, 30.0, &b);
    assert!((r.dip_deg - 48.44).abs() < 0.01, "{r:?}");
    assert!(angle_diff(r.dip_direction_deg.expect("dips"), 138.07) < 0.01, "{r:?}");
}

#[test]
fn true_thickness_textbook_cases() {
    // Compton 1985 (Geology in the Field, thickness from a traverse; from memory): on level
    // ground across strike t = s·sin δ; where the hillside and the beds dip in opposite
    // directions t = s·sin(δ + σ), where they dip the same way t = s·sin(δ − σ).
    let b = BeddingAttitude { dip_deg: 25.0, dip_direction_deg: 270.0 };
    let across_level = Traverse { bearing_deg: 270.0, slope_deg: 0.0 };
    let t = true_thickness_m(40.0, &across_level, &b).expect("valid");
    assert!((t - 40.0 * 25f64.to_radians().sin()).abs() < 1e-12);
    assert!((t - 16.905).abs() < 1e-3); // 40 × 0.42262
                                        // Walking west (toward the dip direction) up a 15° slope: the hillside faces east, against
                                        // the west dip, so t = 40·sin 40° = 25.71 m.
    let up_toward_dip = Traverse { bearing_deg: 270.0, slope_deg: 15.0 };
    let t = true_thickness_m(40.0, &up_toward_dip, &b).expect("valid");
    assert!((t - 25.712).abs() < 1e-3, "{t}");
    // Walking east (up-dip) up a 15° slope: the hillside faces west like the beds, so
    // t = 40·sin(25° − 15°) = 6.946 m.
    let up_dip = Traverse { bearing_deg: 90.0, slope_deg: 15.0 };
    let t = true_thickness_m(40.0, &up_dip, &b).expect("valid");
    assert!((t - 6.946).abs() < 1e-3, "{t}");
    // Oblique, level ground: 30° off strike gives s·sin δ·sin 30°.
    let oblique = Traverse { bearing_deg: 210.0, slope_deg: 0.0 };
    let t = true_thickness_m(40.0, &oblique, &b).expect("valid");
    assert!((t - 40.0 * 25f64.to_radians().sin() * 0.5).abs() < 1e-9, "{t}");
}

#[test]
fn column_help_names_the_restored_azimuths() {
    use aggrade_core::layout::sample::{sample_interpretation, sample_section};
    use aggrade_core::layout::{column_help_at, column_tracks, LayoutOptions, Pointed};
    let mut s = sample_section();
    let i = sample_interpretation(&s);
    let opts = LayoutOptions::default();
    let tr = column_tracks(&s, &opts).paleocurrents;
    // The sample's bed 4 carries six plain readings (a rose).
    let bases = s.base_heights_m();
    let h = bases[3] + s.beds[3].thickness_m / 2.0;
    let at = Pointed { x_mm: tr.x_mm + tr.w_mm / 2.0, height_m: h, tolerance_m: 0.05 };
    let measured: Vec<f64> = s.beds[3].azimuths().collect();
    let plain = column_help_at(&s, &i, &opts, at).expect("readings");
    assert!(plain.contains("(flow azimuths, north up"), "{plain}");
    assert!(plain.contains(&format!("{:03.0}\u{b0}", measured[0])), "{plain}");
    // Tilted 20° toward 100: the help lists the restored azimuths and says so.
    let b = BeddingAttitude { dip_deg: 20.0, dip_direction_deg: 100.0 };
    s.bedding = Some(b);
    let tilted = column_help_at(&s, &i, &opts, at).expect("readings");
    assert!(
        tilted.contains("restored to horizontal from bedding dipping 20\u{b0} toward 100\u{b0}"),
        "{tilted}"
    );
    let restored: Vec<String> =
        measured.iter().map(|a| format!("{:03.0}\u{b0}", restore_line_in_bedding(*a, &b))).collect();
    assert!(tilted.contains(&restored.join(", ")), "{tilted} vs {restored:?}");
    assert_ne!(plain, tilted);
}

proptest::proptest! {
    /// Restoring is a rotation: the angle between a foreset and the bedding survives it, so the
    /// restored dip equals the (acute) angle between the foreset's pole and the bedding's pole, and a line
    /// in bedding comes out level (geometry of rigid rotation; Ragan, on rotations).
    #[test]
    fn restoring_keeps_the_angle_to_bedding(
        dip in 0.0f64..89.0,
        dip_dir in 0.0f64..360.0,
        plane_dir in 0.0f64..360.0,
        plane_dip in 0.0f64..89.0,
        trend in 0.0f64..360.0,
    ) {
        use aggrade_core::analysis::attitude::upward_pole;
        let b = BeddingAttitude { dip_deg: dip, dip_direction_deg: dip_dir };
        let (p, n) = (upward_pole(plane_dir, plane_dip), upward_pole(dip_dir, dip));
        let cos = (p[0] * n[0] + p[1] * n[1] + p[2] * n[2]).clamp(-1.0, 1.0);
        // A plane tipped past vertical by the rotation is read by its upward pole.
        let between = cos.acos().to_degrees();
        let between = between.min(180.0 - between);
        let r = restore_plane(plane_dir, plane_dip, &b);
        proptest::prop_assert!((r.dip_deg - between).abs() < 1e-7, "{r:?} vs {between}");
        let plunge = plunge_in_bedding_deg(trend, &b);
        let l = restore_line(trend, plunge, &b);
        proptest::prop_assert!(l.plunge_deg.abs() < 1e-7, "{l:?}");
    }
}
