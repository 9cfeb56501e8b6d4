//! The carbonate-stage reading of the paleosol rules checked against the published
//! morphological stages of pedogenic carbonate: Machette, M.N., 1985, Calcic soils of the
//! southwestern United States, GSA Special Paper 203 (his table of stages I–VI, after Gile,
//! Peterson & Grossman 1966, Soil Science 101), and the development scale of Retallack, G.J.,
//! 2001, Soils of the Past (2nd ed.), which calls a profile with a calcic horizon of stage II
//! moderately developed, of stage III strongly and of stage IV–VI very strongly (from memory).

use aggrade_core::model::{
    Bed, BedId, GrainSize, Lithology, PaleosolDevelopment, Section, SoilHorizon, WentworthClass,
};
use aggrade_core::rules::{interpret, RuleParams};

/// A section of mudstone with one 0.5 m bed designated `horizon` carrying carbonate `stage` (thin
/// enough that the thickness of the B horizon plays no part).
fn calcic_section(horizon: Option<&str>, stage: u8) -> Section {
    let mut s = Section::new("Calcic");
    for k in 0..3 {
        let mut b =
            Bed::new(BedId(k + 1), 1.0, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Silt)));
        if k == 1 {
            b.thickness_m = 0.5;
            b.carbonate_stage = Some(stage);
            b.soil_horizon = horizon.map(|h| SoilHorizon::parse(h).expect("a designation"));
        }
        s.beds.push(b);
    }
    s
}

/// Machette (1985), non-gravelly morphology, stage by stage: the words that define the stage,
/// the Roman numeral, and the development a Bk horizon of that stage reads as on Retallack's
/// (2001) scale.
const STAGES: &[(u8, &str, &[&str], PaleosolDevelopment)] = &[
    (1, "I", &["filaments", "coatings"], PaleosolDevelopment::Weak),
    (2, "II", &["nodules"], PaleosolDevelopment::Moderate),
    (3, "III", &["coalescing", "plugged"], PaleosolDevelopment::Strong),
    (4, "IV", &["laminar", "plugged"], PaleosolDevelopment::VeryStrong),
    (5, "V", &["laminar", "1 cm", "pisoliths", "brecciation"], PaleosolDevelopment::VeryStrong),
    (6, "VI", &["laminae", "brecciation", "recemented"], PaleosolDevelopment::VeryStrong),
];

#[test]
fn each_machette_stage_on_a_bk_reads_as_the_published_morphology_and_development() {
    for &(stage, numeral, words, development) in STAGES {
        let r = interpret(&calcic_section(Some("Bk"), stage), &RuleParams::default());
        assert_eq!(r.paleosols.len(), 1, "stage {numeral}");
        let p = &r.paleosols[0];
        assert_eq!(p.maturity, development, "stage {numeral}: {:?}", p.evidence);
        assert_eq!(p.carbonate_stage, Some(stage));
        let said: Vec<String> = p.evidence.iter().map(|e| e.to_string()).collect();
        let sentence = said
            .iter()
            .find(|s| s.starts_with(&format!("carbonate stage {numeral} (Machette 1985: ")))
            .unwrap_or_else(|| panic!("stage {numeral}: no carbonate-stage sentence in {said:?}"));
        for w in words {
            assert!(sentence.contains(w), "stage {numeral}: {sentence:?} should say {w:?} (Machette 1985)");
        }
        assert!(sentence.ends_with(&format!("in Bk: at least {}", stage_floor(stage))), "{sentence}");
    }
}

/// The floor the carbonate stage alone sets (the parameters' defaults: III strong, IV very
/// strong; below III no more than weak unless the horizon is a designated Bk).
fn stage_floor(stage: u8) -> &'static str {
    match stage {
        0..=2 => "weak",
        3 => "strong",
        _ => "very strong",
    }
}

#[test]
fn stage_ii_needs_the_bk_designation_to_count_as_a_calcic_horizon() {
    // Retallack 2001: a horizon qualifies as calcic (moderate development) from stage II; the
    // rules take the geologist's Bk designation as the evidence that it does. Without it, stage
    // II alone reads weak, and stage III (a plugged horizon, Machette 1985) is strong either way.
    let plain = interpret(&calcic_section(None, 2), &RuleParams::default());
    assert_eq!(plain.paleosols[0].maturity, PaleosolDevelopment::Weak);
    let bk = interpret(&calcic_section(Some("Bk2"), 2), &RuleParams::default());
    assert_eq!(bk.paleosols[0].maturity, PaleosolDevelopment::Moderate);
    let plugged = interpret(&calcic_section(None, 3), &RuleParams::default());
    assert_eq!(plugged.paleosols[0].maturity, PaleosolDevelopment::Strong);
}

#[test]
fn the_default_stage_thresholds_are_the_plugged_horizon_and_the_laminar_cap() {
    // Machette 1985: stage III is where carbonate plugs the horizon, stage IV where a laminar
    // layer forms on the plugged horizon. The defaults put strong and very strong there.
    let p = RuleParams::default();
    assert_eq!((p.strong_carbonate_stage, p.very_strong_carbonate_stage), (3, 4));
}
