//! Grain-size classes, phi and length units checked against the published scales and worked
//! conversions (sources named beside each check), and against independent Python libraries.

use aggrade_core::io::read_bed_table;
use aggrade_core::model::{mm_to_phi, phi_to_mm, GrainSize, LengthUnit, WentworthClass, METRES_PER_FOOT};
use std::process::Command;

/// Run a Python snippet and return its stdout; fails the test with a clear message when Python or
/// the named library is missing (never a silent skip).
fn python(code: &str, library: &str) -> String {
    let out = Command::new("python3").arg("-c").arg(code).output().unwrap_or_else(|e| {
        panic!("python3 is needed for this reference check ({library}); install it: {e}")
    });
    assert!(
        out.status.success(),
        "the Python reference check failed; is `{library}` installed (pip install {library})?\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8_lossy(&out.stdout).into_owned()
}

#[test]
fn wentworth_1922_class_limits_in_mm() {
    // Wentworth (1922), J. Geology 30, 377–392: the class limits of the grade scale.
    use WentworthClass::*;
    let expected = [
        (Clay, 0.0, 1.0 / 256.0),
        (Silt, 1.0 / 256.0, 1.0 / 16.0),
        (VeryFineSand, 1.0 / 16.0, 1.0 / 8.0),
        (FineSand, 1.0 / 8.0, 1.0 / 4.0),
        (MediumSand, 1.0 / 4.0, 1.0 / 2.0),
        (CoarseSand, 0.5, 1.0),
        (VeryCoarseSand, 1.0, 2.0),
        (Granule, 2.0, 4.0),
        (Pebble, 4.0, 64.0),
        (Cobble, 64.0, 256.0),
    ];
    for (class, lo, hi) in expected {
        assert_eq!(class.limits_mm(), (lo, hi), "{class}");
    }
    // Boulder: > 256 mm, open-ended (Wentworth 1922).
    assert_eq!(WentworthClass::Boulder.limits_mm().0, 256.0);
    assert!(WentworthClass::Boulder.limits_mm().1.is_infinite());
}

#[test]
// −3.3219 is the published worked value for 10 mm (= −log2 10), written as printed.
#[allow(clippy::approx_constant)]
fn krumbein_1934_phi_worked_conversions() {
    // Krumbein (1934): φ = −log2(d / 1 mm). Worked values computed from that formula
    // (0.0625 → 4, 0.25 → 2, 2 → −1, 64 → −6, 256 → −8, 1/256 → 8; others to 4 decimals).
    let cases = [
        (0.0625, 4.0),
        (0.25, 2.0),
        (2.0, -1.0),
        (64.0, -6.0),
        (256.0, -8.0),
        (1.0 / 256.0, 8.0),
        (0.18, 2.4739),
        (0.3, 1.7370),
        (10.0, -3.3219),
        (100.0, -6.6439),
    ];
    for (d_mm, phi) in cases {
        assert!((mm_to_phi(d_mm) - phi).abs() < 5e-5, "{d_mm} mm → {} (expected {phi})", mm_to_phi(d_mm));
        // And back: d = 2^−φ.
        assert!((phi_to_mm(mm_to_phi(d_mm)) - d_mm).abs() < 1e-12 * d_mm.max(1.0));
    }
    // Powers of two are exact (Krumbein 1934 chose log base 2 so that class limits are integers).
    assert_eq!(mm_to_phi(1.0 / 256.0), 8.0);
    assert_eq!(mm_to_phi(64.0), -6.0);
}

#[test]
fn phi_agrees_with_python_math_log2() {
    // Independent oracle: Python's math.log2 (standard library) on the same diameters.
    let diameters = [0.0039, 0.01, 0.0625, 0.09, 0.18, 0.3, 0.7, 1.5, 3.0, 10.0, 100.0, 300.0];
    let list = diameters.map(|d| d.to_string()).join(",");
    let out = python(&format!("import math\nfor d in [{list}]: print(repr(-math.log2(d)))"), "python3 math");
    let phis: Vec<f64> = out.lines().map(|l| l.trim().parse().expect("python prints floats")).collect();
    assert_eq!(phis.len(), diameters.len());
    for (d, p) in diameters.iter().zip(phis) {
        assert!((mm_to_phi(*d) - p).abs() < 1e-12, "{d} mm: ours {} python {p}", mm_to_phi(*d));
    }
}

#[test]
fn class_boundaries_belong_to_the_coarser_class() {
    // Boundary convention documented on WentworthClass::from_mm ("silt < 1/16 mm ≤ sand", as the
    // limits are usually written, e.g. in the class table of Wentworth 1922): a value on a limit
    // belongs to the coarser class. Checked in mm and in phi.
    use WentworthClass::*;
    let boundaries = [
        (1.0 / 256.0, Silt),
        (1.0 / 16.0, VeryFineSand),
        (0.125, FineSand),
        (0.25, MediumSand),
        (0.5, CoarseSand),
        (1.0, VeryCoarseSand),
        (2.0, Granule),
        (4.0, Pebble),
        (64.0, Cobble),
        (256.0, Boulder),
    ];
    for (d, class) in boundaries {
        assert_eq!(WentworthClass::from_mm(d), Some(class), "{d} mm");
        assert_eq!(WentworthClass::from_phi(mm_to_phi(d)), Some(class), "phi {}", mm_to_phi(d));
        // Just below the limit: the finer class.
        assert_eq!(
            WentworthClass::from_mm(d * 0.999),
            Some(WentworthClass::from_rank(class.rank() - 1)),
            "{d} mm − 0.1%"
        );
    }
    // Worked: 0.18 mm (φ 2.4739) is fine sand (1/8–1/4 mm); 0.3 mm (φ 1.737) medium sand;
    // 10 mm pebble; 100 mm cobble (Wentworth 1922 limits).
    for (text, class) in [
        ("0.18mm", FineSand),
        ("0.3 mm", MediumSand),
        ("10mm", Pebble),
        ("100mm", Cobble),
        ("2.4739phi", FineSand),
    ] {
        assert_eq!(GrainSize::parse(text).map(|g| g.class()), Ok(class), "{text}");
    }
}

#[test]
fn international_foot_is_exactly_0_3048_m() {
    // 1 yard = 0.9144 m exactly, so 1 ft = 0.3048 m (international yard and pound agreement of
    // 1959; US Federal Register 24 FR 5348).
    assert_eq!(METRES_PER_FOOT, 0.3048);
    assert_eq!(LengthUnit::Foot.to_metres(1.0), 0.3048);
    assert!((LengthUnit::Foot.to_metres(3.0) - 0.9144).abs() < 1e-15);
    assert!((LengthUnit::Foot.from_metres(30.48) - 100.0).abs() < 1e-12);
    // The retired US survey foot (1200/3937 m) must not be what we use.
    assert!((LengthUnit::Foot.to_metres(1.0) - 1200.0 / 3937.0).abs() > 5e-7);
    assert_eq!(LengthUnit::Centimetre.to_metres(250.0), 2.5);
}

#[test]
fn foot_agrees_with_astropy_units() {
    // Independent oracle: astropy.units (imperial foot) converted to metres.
    let out = python(
        "from astropy import units as u\nprint(repr(float((1 * u.imperial.ft).to(u.m).value)))\nprint(repr(float((328.0 * u.imperial.ft).to(u.m).value)))",
        "astropy",
    );
    let vals: Vec<f64> = out.lines().map(|l| l.trim().parse().expect("astropy prints floats")).collect();
    assert_eq!(vals.len(), 2);
    assert!((LengthUnit::Foot.to_metres(1.0) - vals[0]).abs() < 1e-15, "astropy 1 ft = {} m", vals[0]);
    assert!((LengthUnit::Foot.to_metres(328.0) - vals[1]).abs() < 1e-12, "astropy 328 ft = {} m", vals[1]);
}

#[test]
fn bed_table_thickness_units_convert_to_metres() {
    // 1 ft = 0.3048 m (1959 agreement); 1 cm = 0.01 m (SI).
    let ft = read_bed_table("thickness_ft,lithology,grain\n100,sandstone,fine sand\n", "a").expect("valid");
    assert!((ft.section.beds[0].thickness_m - 30.48).abs() < 1e-12);
    assert_eq!(ft.section.display_unit, LengthUnit::Foot);
    let cm = read_bed_table("thickness_cm,lithology,grain\n45,mudstone,silt\n", "a").expect("valid");
    assert!((cm.section.beds[0].thickness_m - 0.45).abs() < 1e-15);
}
