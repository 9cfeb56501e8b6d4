//! Paleosol profiles: consecutive beds with soil development read as one fossil soil, with a
//! maturity from the development logged, the horizons designated, the carbonate stage and the
//! features seen, and a drainage reading.
//!
//! A soil is a profile of horizons (Retallack 2001); geologists often log the horizons as beds
//! of their own (an A over a Bt over a Bk), and compound or cumulative profiles stack several
//! (Kraus 1999). Each bed with a development grade, paleosol features, a carbonate stage, a
//! horizon designation or a drainage class is a horizon. Unbroken runs of horizons (a covered
//! interval breaks them) are profiles, split where the horizon sequence starts again — reading
//! upward, a bed whose master horizon belongs lower in a profile than the designated bed below it
//! (a C or B over an A: the soil below is buried) — or where a bed inside the run has an
//! erosional base (the soil below was truncated). A profile counts when its maturity reaches
//! `paleosol_min_development`. See `docs/interpretation-rules.md`.

use super::column::{is_sand_or_gravel, Column};
use super::params::RuleParams;
use super::types::{
    DrainageBasis, DrainageReading, MaturitySign, PaleosolProfile, ProfileBreak, ProfileEvidence, WetSign,
};
use crate::model::{
    Bed, Contact, Drainage, Munsell, PaleosolDevelopment, PaleosolFeature, Section, SoilHorizon, Structure,
};

/// Highest chroma of a gleyed (depleted) matrix: "a depleted matrix requires a value of 4 or
/// more and chroma of 2 or less" (USDA-NRCS, Field Indicators of Hydric Soils in the United
/// States, indicator F3 Depleted Matrix, user notes).
const GLEY_MAX_CHROMA: f64 = 2.0;

/// Lowest value of a gleyed matrix (same source): a dark matrix of low chroma (value 3 or less)
/// is coloured by organic matter, as in a dark A horizon, and is not read as gleyed.
const GLEY_MIN_VALUE: f64 = 4.0;

/// Place of a master horizon in a profile, counted from the bottom up: R, C, B, E, A, O (Soil
/// Survey Staff designations; Retallack 2001). Transitional horizons (BC, AB) go by their first
/// letter, as [`SoilHorizon::master`] reads them.
fn master_rank(h: &SoilHorizon) -> Option<u8> {
    match h.master() {
        'R' => Some(0),
        'C' => Some(1),
        'B' => Some(2),
        'E' => Some(3),
        'A' => Some(4),
        'O' => Some(5),
        _ => None,
    }
}

/// The designation of a bed as written, for sentences.
fn designation(bed: &Bed) -> Option<String> {
    bed.soil_horizon.as_ref().map(|h| h.as_str().to_string())
}

/// A bed's designation when it is a B horizon (transitional BC, BA or B/C included: they go by
/// their first letter).
fn b_horizon(bed: &Bed) -> Option<&SoilHorizon> {
    bed.soil_horizon.as_ref().filter(|h| h.master() == 'B')
}

/// True when a designation names two master horizons (BC, CB, AB, B/C): a transitional horizon.
fn is_transitional(h: &SoilHorizon) -> bool {
    h.as_str().chars().filter(|c| "OAEBCR".contains(*c)).count() > 1
}

/// True for a red hue, 7.5YR or redder (R, and YR of step 7.5 or less): red parent material
/// resists the colour change of wetness, and the hydric-soil indicators read it apart (USDA-NRCS,
/// Field Indicators of Hydric Soils, indicator F21 Red Parent Material: hue 7.5YR or redder).
fn is_red_hue(m: &Munsell) -> bool {
    m.hue == "R" || (m.hue == "YR" && m.hue_step <= 7.5)
}

/// True for a gleyed (depleted) matrix colour on `bed`: chroma 2 or less at value 4 or more, hue
/// not red. As in indicator F3 (user notes), the borderline colours 4/1, 4/2 and 5/2 need redox
/// concentrations (mottles) too, and so do A, E and calcic (k) horizons, which can be pale and of
/// low chroma without being wet.
fn is_gleyed_matrix(m: &Munsell, bed: &Bed, mottled: bool) -> bool {
    let low = m.chroma <= GLEY_MAX_CHROMA && m.value >= GLEY_MIN_VALUE && !is_red_hue(m);
    let borderline = (m.value < 5.0 && m.chroma >= 1.0) || (m.value < 6.0 && m.chroma >= 2.0);
    let pale_horizon =
        bed.soil_horizon.as_ref().is_some_and(|h| matches!(h.master(), 'A' | 'E') || h.has("k"));
    low && (mottled || !(borderline || pale_horizon))
}

/// What a profile's beds say of its maturity.
struct Maturity {
    maturity: PaleosolDevelopment,
    logged: PaleosolDevelopment,
    stage: Option<u8>,
    signs: Vec<MaturitySign>,
    evidence: Vec<ProfileEvidence>,
    /// Beds (indices into the profile) whose diagnostic horizon set a floor.
    diagnostic: Vec<usize>,
    b_thickness_m: f64,
}

/// Maturity of a profile of beds, with what raised it above the logged grade.
fn maturity(beds: &[&Bed], first_bed: usize, params: &RuleParams) -> Maturity {
    use PaleosolDevelopment as Dev;
    let logged = beds.iter().map(|b| b.paleosol).max().unwrap_or_default();
    let stage = beds.iter().filter_map(|b| b.carbonate_stage).max();
    let mut m = logged;
    let mut signs = Vec::new();
    let mut evidence = Vec::new();
    let lift = |m: &mut Dev, floor: Dev, sign: MaturitySign, signs: &mut Vec<MaturitySign>| {
        if floor > *m {
            *m = floor;
            if !signs.contains(&sign) {
                signs.push(sign);
            }
        }
    };

    let top_down: Vec<String> = beds.iter().rev().copied().filter_map(designation).collect();
    if top_down.is_empty() {
        evidence.push(ProfileEvidence::NoHorizons);
    } else {
        evidence.push(ProfileEvidence::Horizons { top_down });
    }
    if logged > Dev::None {
        evidence.push(ProfileEvidence::Logged { development: logged });
    }

    // Designated A, E, B or O horizons: a soil was seen (Retallack 2001: a rooted A over a C is
    // already weakly developed).
    let designated_soil = beds
        .iter()
        .filter_map(|b| b.soil_horizon.as_ref())
        .any(|h| matches!(h.master(), 'A' | 'E' | 'B' | 'O'));
    if designated_soil && m < Dev::Weak {
        lift(&mut m, Dev::Weak, MaturitySign::DesignatedHorizon, &mut signs);
        evidence.push(ProfileEvidence::Designated { floor: Dev::Weak });
    }

    // Diagnostic subsurface horizons (Retallack 2001's "moderate": argillic, calcic of stage II,
    // and the vertic Bss).
    let diag = params.diagnostic_horizon_development;
    let mut diagnostic = Vec::new();
    for (k, bed) in beds.iter().enumerate() {
        let Some(h) = b_horizon(bed) else { continue };
        let name = h.as_str().to_string();
        if h.has("t") {
            if bed.paleosol_features.contains(&PaleosolFeature::ClayCoatings) {
                lift(&mut m, diag, MaturitySign::ArgillicHorizon, &mut signs);
                evidence.push(ProfileEvidence::Argillic { horizon: name.clone(), floor: diag });
                diagnostic.push(k);
            } else {
                evidence.push(ProfileEvidence::BtWithoutCoatings { horizon: name.clone() });
            }
        }
        if let Some(st) = bed.carbonate_stage.filter(|st| h.has("k") && *st >= 2) {
            lift(&mut m, diag, MaturitySign::CalcicHorizon, &mut signs);
            evidence.push(ProfileEvidence::Calcic { horizon: name.clone(), stage: st, floor: diag });
            diagnostic.push(k);
        }
        if h.has("ss") {
            lift(&mut m, diag, MaturitySign::VerticHorizon, &mut signs);
            evidence.push(ProfileEvidence::Vertic { horizon: name, floor: diag });
            diagnostic.push(k);
        }
    }

    // The carbonate stage, whatever horizon it was logged on (Machette 1985 stages).
    if let Some(st) = stage {
        let floor = if st >= params.very_strong_carbonate_stage {
            Dev::VeryStrong
        } else if st >= params.strong_carbonate_stage {
            Dev::Strong
        } else {
            Dev::Weak
        };
        let horizon = beds.iter().find(|b| b.carbonate_stage == stage).copied().and_then(designation);
        evidence.push(ProfileEvidence::CarbonateStage { stage: st, horizon, floor });
        if floor >= Dev::Strong {
            lift(&mut m, floor, MaturitySign::CarbonateStage, &mut signs);
        } else if floor > m {
            m = floor;
        }
    }

    // Vertic and calcic together, as features or as `ss` and `k` horizons: shrink–swell under
    // wet–dry seasons with carbonate accumulation in the dry ones, a climate reading named in
    // the evidence, not a maturity grade (Kraus 1999; Retallack 2001's development scale does
    // not use vertic features to grade development).
    let has = |f: PaleosolFeature, s: Structure, suffix: &str| {
        beds.iter().any(|b| {
            b.paleosol_features.contains(&f)
                || b.structures.contains(&s)
                || b.soil_horizon.as_ref().is_some_and(|h| h.has(suffix))
        })
    };
    if has(PaleosolFeature::Slickensides, Structure::Slickensides, "ss")
        && has(PaleosolFeature::CarbonateNodules, Structure::CarbonateNodules, "k")
    {
        evidence.push(ProfileEvidence::VerticCalcic);
    }
    // Thick B horizons make an already moderate profile strong or very strong: a floor. Only
    // horizons whose master is B alone count; transitional BC, CB, AB, B/C are as much C or A as
    // B and are left out (our choice; named in the evidence).
    let mut b_thickness_m = 0.0;
    let mut counted = Vec::new();
    let mut transitional = Vec::new();
    for (k, bed) in beds.iter().enumerate().rev() {
        let Some(h) = bed.soil_horizon.as_ref().filter(|h| h.as_str().contains('B')) else { continue };
        let named = format!("{h} (bed {})", first_bed + k + 1);
        if is_transitional(h) {
            transitional.push(named);
        } else if h.master() == 'B' {
            b_thickness_m += bed.usable_thickness_m();
            counted.push(named);
        }
    }
    if b_thickness_m > 0.0 || !transitional.is_empty() {
        let floor = if m < Dev::Moderate {
            None
        } else if b_thickness_m >= params.very_thick_b_horizon_m {
            Some((Dev::VeryStrong, params.very_thick_b_horizon_m))
        } else if b_thickness_m >= params.thick_b_horizon_m {
            Some((Dev::Strong, params.thick_b_horizon_m))
        } else {
            None
        };
        if let Some((floor, limit)) = floor {
            lift(&mut m, floor, MaturitySign::ThickBHorizon, &mut signs);
            evidence.push(ProfileEvidence::BThickness {
                thickness_m: b_thickness_m,
                counted,
                transitional,
                limit_m: Some(limit),
                floor: Some(floor),
            });
        } else {
            evidence.push(ProfileEvidence::BThickness {
                thickness_m: b_thickness_m,
                counted,
                transitional,
                limit_m: None,
                floor: None,
            });
        }
    }

    // Designated horizons only say "a soil": any other sign that raised it says more.
    if signs.len() > 1 {
        signs.retain(|s| *s != MaturitySign::DesignatedHorizon);
    }
    Maturity { maturity: m, logged, stage, signs, evidence, diagnostic, b_thickness_m }
}

/// A profile's drainage, as read.
struct DrainageRead {
    reading: DrainageReading,
    class: Option<Drainage>,
    basis: DrainageBasis,
    said: ProfileEvidence,
}

/// The wettest sign on one bed, if any: gleying, a `g` horizon or a gleyed (low-chroma) matrix
/// make it poorly drained; mottles in an oxidised (high-chroma or red) matrix, or mottles with no
/// matrix colour logged, somewhat poorly (imperfectly) drained (Kraus & Aslan 1993; Kraus 1999).
fn wet_sign(bed: &Bed) -> Option<WetSign> {
    let mottled = bed.paleosol_features.contains(&PaleosolFeature::Mottling)
        || bed.structures.contains(&Structure::Mottling);
    if bed.paleosol_features.contains(&PaleosolFeature::Gleying) {
        return Some(WetSign::Gleying);
    }
    if bed.soil_horizon.as_ref().is_some_and(|h| h.has("g")) {
        return Some(WetSign::GleyedHorizon);
    }
    match &bed.munsell {
        Some(m) if is_gleyed_matrix(m, bed, mottled) => {
            Some(WetSign::LowChromaMatrix { munsell: m.to_string(), mottled })
        }
        Some(m) if mottled => Some(WetSign::MottlesInOxidisedMatrix { munsell: m.to_string() }),
        None if mottled => Some(WetSign::MottlesNoColour),
        _ => None,
    }
}

/// Drainage of a profile: the geologist's class where logged (on the horizons that carry the
/// maturity, else on any horizon of the profile; the poorest if several), else the wettest sign
/// on the horizons that carry the maturity ([`wet_sign`]): a mottled weak horizon under a stage
/// IV calcic horizon does not make a mature, well-drained soil wet (Kraus 1999; Machette 1985).
fn drainage(profile: &[&Bed], key: &[bool]) -> DrainageRead {
    let poorest = |only_key: bool| {
        profile
            .iter()
            .zip(key)
            .filter(|(b, k)| b.drainage.is_some() && (**k || !only_key))
            .max_by_key(|(b, _)| b.drainage)
            .map(|(b, _)| b)
    };
    if let Some(bed) = poorest(true).or_else(|| poorest(false)) {
        let d = bed.drainage.unwrap_or(Drainage::WellDrained);
        return DrainageRead {
            reading: DrainageReading::of_class(d),
            class: Some(d),
            basis: DrainageBasis::Logged,
            said: ProfileEvidence::DrainageLogged { drainage: d, horizon: designation(bed) },
        };
    }
    let wettest = profile
        .iter()
        .zip(key)
        .filter(|(_, k)| **k)
        .filter_map(|(bed, _)| wet_sign(bed).map(|s| (s, bed)))
        // The first (lowest) of the wettest signs.
        .fold(None::<(WetSign, &Bed)>, |best, (s, bed)| match best {
            Some((ref b, _)) if b.reading() >= s.reading() => best,
            _ => Some((s, bed)),
        });
    match wettest {
        Some((sign, bed)) => {
            let reading = sign.reading();
            let basis = if reading == DrainageReading::Poorly {
                DrainageBasis::Gleyed
            } else {
                DrainageBasis::Mottled
            };
            DrainageRead {
                reading,
                class: None,
                basis,
                said: ProfileEvidence::WetSign { sign, horizon: designation(bed) },
            }
        }
        None => DrainageRead {
            reading: DrainageReading::NotPoorly,
            class: None,
            basis: DrainageBasis::NoSign,
            said: ProfileEvidence::NoWetSign,
        },
    }
}

/// Why a new profile starts at `bed` inside a run of horizons, given the master-horizon rank of
/// the highest designated bed of the profile so far.
fn break_at(bed: &Bed, rank_below: Option<u8>) -> Option<ProfileBreak> {
    if bed.base_contact == Contact::Erosional {
        return Some(ProfileBreak::Truncation);
    }
    match (rank_below, bed.soil_horizon.as_ref().and_then(master_rank)) {
        (Some(below), Some(here)) if here < below => Some(ProfileBreak::HorizonSequence),
        _ => None,
    }
}

/// The paleosol profiles of a section, lowest first. Linear in the number of beds.
pub fn profiles(section: &Section, column: &Column, params: &RuleParams) -> Vec<PaleosolProfile> {
    let beds = section.beds.refs();
    let mut out = Vec::new();
    let mut i = 0;
    let mut started_by: Option<ProfileBreak> = None;
    let horizon = |i: usize| column.facts[i].horizon;
    while i < beds.len() {
        if !horizon(i) {
            i += 1;
            started_by = None;
            continue;
        }
        let first = i;
        let mut rank = beds[i].soil_horizon.as_ref().and_then(master_rank);
        let mut next_break = None;
        while i + 1 < beds.len() && horizon(i + 1) {
            if let Some(why) = break_at(beds[i + 1], rank) {
                next_break = Some(why);
                break;
            }
            i += 1;
            rank = beds[i].soil_horizon.as_ref().and_then(master_rank).or(rank);
        }
        let last = i;
        i += 1;
        let this_start = std::mem::replace(&mut started_by, next_break);
        let profile = &beds[first..=last];
        let Maturity { maturity, logged, stage, signs, mut evidence, diagnostic, b_thickness_m } =
            maturity(profile, first, params);
        if maturity == PaleosolDevelopment::None || maturity < params.paleosol_min_development {
            continue;
        }
        let on_sandstone = profile.iter().any(|b| is_sand_or_gravel(b));
        // The horizons that carry the profile's maturity: its most developed beds, those of its
        // highest carbonate stage and its diagnostic horizons.
        let key: Vec<bool> = profile
            .iter()
            .enumerate()
            .map(|(k, b)| {
                b.paleosol == logged
                    || (stage.is_some() && b.carbonate_stage == stage)
                    || diagnostic.contains(&k)
            })
            .collect();
        let DrainageRead { reading, class, basis, said } = drainage(profile, &key);
        evidence.push(said);
        if let Some(why) = this_start {
            evidence.push(ProfileEvidence::StartsNewSequence { why });
        }
        out.push(PaleosolProfile {
            base_m: column.bounds_m[first],
            top_m: column.bounds_m[last + 1],
            maturity,
            beds: profile.iter().map(|b| b.id).collect(),
            first_bed: first,
            last_bed: last,
            logged_development: logged,
            carbonate_stage: stage,
            raised_by: signs,
            on_sandstone,
            poorly_drained: reading == DrainageReading::Poorly,
            drainage_reading: reading,
            drainage: class,
            drainage_from: basis,
            b_horizon_thickness_m: b_thickness_m,
            evidence,
        });
    }
    out
}

/// For each bed, the index of the profile it belongs to.
pub fn profile_of_bed(n: usize, profiles: &[PaleosolProfile]) -> Vec<Option<usize>> {
    let mut of = vec![None; n];
    for (k, p) in profiles.iter().enumerate() {
        for slot in of.iter_mut().take(p.last_bed + 1).skip(p.first_bed) {
            *slot = Some(k);
        }
    }
    of
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{BedId, GrainSize, Lithology, WentworthClass};

    fn mud(dev: PaleosolDevelopment) -> Bed {
        let mut b =
            Bed::new(BedId(0), 0.5, Lithology::Mudstone, Some(GrainSize::Class(WentworthClass::Silt)));
        b.paleosol = dev;
        b
    }

    fn run(beds: Vec<Bed>, params: &RuleParams) -> Vec<PaleosolProfile> {
        let mut s = Section::new("t");
        for (i, mut b) in beds.into_iter().enumerate() {
            b.id = BedId(i as u64 + 1);
            s.beds.push(b);
        }
        profiles(&s, &Column::new(&s), params)
    }

    #[test]
    fn drainage_is_read_from_the_horizons_that_carry_the_maturity() {
        // A mottled weak horizon under a stage IV calcic horizon (Machette 1985: a well-drained,
        // long-lived soil): the profile is mature and well drained. Gleying in the calcic
        // horizon itself makes it poorly drained (Kraus 1999).
        use PaleosolDevelopment::*;
        let mut wet_below = mud(Weak);
        wet_below.paleosol_features.push(PaleosolFeature::Mottling);
        let mut calcic = mud(Strong);
        calcic.carbonate_stage = Some(4);
        calcic.paleosol_features.push(PaleosolFeature::CarbonateNodules);
        let p = run(vec![mud(None), wet_below.clone(), calcic.clone(), mud(None)], &RuleParams::default());
        assert_eq!(p.len(), 1);
        assert_eq!((p[0].maturity, p[0].poorly_drained), (VeryStrong, false));
        let mut gleyed = calcic;
        gleyed.paleosol_features.push(PaleosolFeature::Gleying);
        let p = run(vec![mud(None), wet_below, gleyed, mud(None)], &RuleParams::default());
        assert!(p[0].poorly_drained);
    }

    #[test]
    fn horizons_logged_as_beds_make_one_profile() {
        // A (weak) over Bk (moderate, nodules, stage II) over plain mud: one profile of two beds,
        // maturity moderate (stage II is below the stage III threshold).
        use PaleosolDevelopment::*;
        let mut bk = mud(Moderate);
        bk.carbonate_stage = Some(2);
        bk.paleosol_features = vec![PaleosolFeature::CarbonateNodules];
        let p = run(vec![mud(None), bk, mud(Weak), mud(None)], &RuleParams::default());
        assert_eq!(p.len(), 1);
        assert_eq!((p[0].first_bed, p[0].last_bed, p[0].maturity), (1, 2, Moderate));
        assert_eq!(p[0].beds, vec![BedId(2), BedId(3)]);
        assert!((p[0].base_m - 0.5).abs() < 1e-12 && (p[0].top_m - 1.5).abs() < 1e-12);
    }

    #[test]
    fn carbonate_stage_raises_maturity_and_vertic_calcic_features_do_not() {
        // Machette 1985 stage III → at least strong. Slickensides with nodules record
        // shrink–swell under a seasonal climate (Kraus 1999), not more time: named in the
        // evidence, maturity unchanged (Retallack 2001's development scale grades by horizon
        // thickness, clay and carbonate, not by vertic features).
        use PaleosolDevelopment::*;
        let mut b = mud(Weak);
        b.carbonate_stage = Some(3);
        let p = run(vec![b.clone()], &RuleParams::default());
        assert_eq!((p[0].maturity, p[0].raised_by.as_slice()), (Strong, &[MaturitySign::CarbonateStage][..]));
        assert!(!sentences(&p[0]).iter().any(|s| s.starts_with("slickensides with carbonate nodules")));
        b.paleosol_features = vec![PaleosolFeature::Slickensides, PaleosolFeature::CarbonateNodules];
        let p = run(vec![b], &RuleParams::default());
        assert_eq!((p[0].maturity, p[0].raised_by.as_slice()), (Strong, &[MaturitySign::CarbonateStage][..]));
        assert!(
            sentences(&p[0])
                .iter()
                .any(|s| s.starts_with("slickensides with carbonate nodules (vertic and calcic)")
                    && s.ends_with("not counted as extra maturity")),
            "{:?}",
            sentences(&p[0])
        );
    }

    #[test]
    fn a_covered_interval_splits_profiles_and_weak_ones_drop_below_the_minimum() {
        use PaleosolDevelopment::*;
        let covered = Bed::new(BedId(0), 1.0, Lithology::Covered, Option::None);
        let p = run(vec![mud(Strong), covered, mud(Weak)], &RuleParams::default());
        assert_eq!(p.len(), 2);
        let strict = RuleParams { paleosol_min_development: Moderate, ..RuleParams::default() };
        let mut s = Section::new("t");
        s.beds =
            vec![mud(Strong), Bed::new(BedId(9), 1.0, Lithology::Covered, Option::None), mud(Weak)].into();
        assert_eq!(profiles(&s, &Column::new(&s), &strict).len(), 1);
    }

    fn horizon(dev: PaleosolDevelopment, designation: &str, thickness_m: f64) -> Bed {
        let mut b = mud(dev);
        b.thickness_m = thickness_m;
        b.soil_horizon = Some(SoilHorizon::parse(designation).expect("a designation"));
        b
    }

    fn sentences(p: &PaleosolProfile) -> Vec<String> {
        p.evidence.iter().map(|e| e.to_string()).collect()
    }

    #[test]
    fn a_bt_counts_as_argillic_only_with_clay_coatings() {
        // Retallack 2001: a profile whose clayey subsurface horizon qualifies as argillic (clay
        // skins seen) is moderately developed.
        use PaleosolDevelopment::*;
        let mut bt = horizon(Weak, "Bt", 0.4);
        bt.paleosol_features.push(PaleosolFeature::ClayCoatings);
        let p = run(vec![horizon(None, "C", 0.3), bt, horizon(Weak, "A", 0.2)], &RuleParams::default());
        assert_eq!(p.len(), 1);
        assert_eq!(
            (p[0].maturity, p[0].raised_by.as_slice()),
            (Moderate, &[MaturitySign::ArgillicHorizon][..])
        );
        let said = sentences(&p[0]);
        assert_eq!(said[0], "horizons logged, top down: A / Bt / C");
        assert!(said.iter().any(|s| s.starts_with("Bt with clay coatings, an argillic horizon")), "{said:?}");
        let p = run(vec![horizon(Weak, "Bt", 0.4), horizon(Weak, "A", 0.2)], &RuleParams::default());
        assert_eq!(p[0].maturity, Weak);
        assert!(sentences(&p[0])
            .contains(&"Bt logged without clay coatings: not counted as an argillic horizon".into()));
    }

    #[test]
    fn a_bk_is_calcic_from_stage_ii_and_the_stage_sets_strong_and_very_strong() {
        // Retallack 2001: calcic horizon of stage II → moderate; Machette 1985 stage III → strong,
        // IV → very strong (the existing carbonate-stage parameters).
        use PaleosolDevelopment::*;
        for (stage, want) in [(1, Weak), (2, Moderate), (3, Strong), (4, VeryStrong)] {
            let mut bk = horizon(None, "Bk2", 0.5);
            bk.carbonate_stage = Some(stage);
            let p = run(vec![bk], &RuleParams::default());
            assert_eq!(p[0].maturity, want, "stage {stage}");
        }
        let mut bk = horizon(None, "Bk2", 0.5);
        bk.carbonate_stage = Some(2);
        let p = run(vec![bk], &RuleParams::default());
        assert!(
            sentences(&p[0]).contains(
                &"Bk2 of carbonate stage II (Machette 1985), a calcic horizon: at least moderate".into()
            ),
            "{:?}",
            sentences(&p[0])
        );
        // Stage II on a bed not designated Bk stays weak (the designation is the evidence).
        let mut plain = mud(Weak);
        plain.carbonate_stage = Some(2);
        assert_eq!(run(vec![plain], &RuleParams::default())[0].maturity, Weak);
    }

    #[test]
    fn a_bss_is_vertic_and_with_a_bk_counts_as_vertic_and_calcic() {
        use PaleosolDevelopment::*;
        let p = run(vec![horizon(None, "Bss", 0.4)], &RuleParams::default());
        assert_eq!(
            (p[0].maturity, p[0].raised_by.as_slice()),
            (Moderate, &[MaturitySign::VerticHorizon][..])
        );
        // The suffixes stand for the features: ss slickensides, k carbonate. Together they are
        // named (a seasonal climate, Kraus 1999) but add no grade: calcic and vertic horizons
        // each make it moderate, no more.
        let mut bk = horizon(None, "Bk", 0.4);
        bk.carbonate_stage = Some(2);
        let p = run(vec![bk, horizon(None, "Bss", 0.4)], &RuleParams::default());
        assert_eq!(p[0].maturity, Moderate);
        assert!(sentences(&p[0]).iter().any(|s| s.starts_with("slickensides with carbonate nodules")));
    }

    #[test]
    fn thick_b_horizons_raise_a_profile_that_is_already_moderate() {
        use PaleosolDevelopment::*;
        let coated = |name: &str, t: f64| {
            let mut b = horizon(Weak, name, t);
            b.paleosol_features.push(PaleosolFeature::ClayCoatings);
            b
        };
        let p = run(vec![coated("Bt2", 0.6), coated("Bt1", 0.6)], &RuleParams::default());
        assert_eq!(p[0].maturity, Strong);
        assert!((p[0].b_horizon_thickness_m - 1.2).abs() < 1e-12);
        assert!(
            sentences(&p[0]).contains(
                &"B horizons 1.20 m thick in all (Bt1 (bed 2), Bt2 (bed 1); at least 1.00 m): at least strong".into()
            ),
            "{:?}",
            sentences(&p[0])
        );
        let p = run(vec![coated("Bt2", 1.2), coated("Bt1", 1.0)], &RuleParams::default());
        assert_eq!(p[0].maturity, VeryStrong);
        // With slickensides and nodules too: the thickness alone makes it strong.
        let mut vertic = coated("Bt1", 0.6);
        vertic.paleosol_features.extend([PaleosolFeature::Slickensides, PaleosolFeature::CarbonateNodules]);
        let p = run(vec![coated("Bt2", 0.6), vertic], &RuleParams::default());
        assert_eq!((p[0].maturity, p[0].raised_by.last()), (Strong, Some(&MaturitySign::ThickBHorizon)));
        // A thick but weak B (a Bw) stays weak: thickness raises only a diagnostic profile.
        let p = run(vec![horizon(Weak, "Bw", 2.5)], &RuleParams::default());
        assert_eq!(p[0].maturity, Weak);
    }

    #[test]
    fn transitional_horizons_do_not_count_towards_the_b_thickness() {
        // Bt 0.6 m (argillic, moderate) over a BC 3 m: the BC is as much C as B (Soil Survey
        // Staff: a transitional horizon has properties of both masters), so only the Bt counts
        // and 0.6 m is below the 1 m floor: the profile stays moderate, and the BC is named.
        use PaleosolDevelopment::*;
        let mut bt = horizon(Weak, "Bt", 0.6);
        bt.paleosol_features.push(PaleosolFeature::ClayCoatings);
        let p = run(vec![horizon(Weak, "BC", 3.0), bt, horizon(Weak, "A", 0.2)], &RuleParams::default());
        assert_eq!(p[0].maturity, Moderate);
        assert!((p[0].b_horizon_thickness_m - 0.6).abs() < 1e-12);
        assert!(
            sentences(&p[0]).contains(
                &"B horizons 0.60 m thick in all (Bt (bed 2); transitional BC (bed 1) not counted)".into()
            ),
            "{:?}",
            sentences(&p[0])
        );
        // CB, AB and B/C are transitional too; Bk2, Bss, 2Bt are not.
        for (d, t) in
            [("CB", true), ("AB", true), ("B/C", true), ("Bk2", false), ("Bss", false), ("2Bt", false)]
        {
            assert_eq!(is_transitional(&SoilHorizon::parse(d).expect("designation")), t, "{d}");
        }
    }

    fn coloured(mut b: Bed, munsell: &str, mottled: bool) -> Bed {
        b.munsell = Some(Munsell::parse(munsell).expect("munsell"));
        if mottled {
            b.paleosol_features.push(PaleosolFeature::Mottling);
        }
        b
    }

    #[test]
    fn mottles_in_a_red_matrix_are_imperfect_drainage_and_a_low_chroma_matrix_is_poor() {
        // Kraus & Aslan 1993; Kraus 1999: red, high-chroma paleosols with grey mottles were wet
        // for part of the year (somewhat poorly, "imperfectly", drained); gleyed soils with a
        // low-chroma matrix were waterlogged (poorly drained). Chroma 2 or less (value 4 or more,
        // hue not 5YR or redder) is the hydric-soil depleted-matrix criterion (Soil Survey Staff /
        // USDA-NRCS Field Indicators of Hydric Soils; from memory).
        use PaleosolDevelopment::*;
        let read = |b: Bed| run(vec![b], &RuleParams::default()).remove(0);
        let p = read(coloured(mud(Moderate), "5YR 4/4", true));
        assert_eq!(
            (p.poorly_drained, p.drainage_reading, p.drainage_from),
            (false, DrainageReading::Imperfectly, DrainageBasis::Mottled)
        );
        assert!(
            sentences(&p).contains(
                &"mottles in a 5YR 4/4 matrix (high chroma or red hue: oxidised, not gleyed) in an undesignated \
                  bed: imperfectly (somewhat poorly) drained (seasonal wetting)"
                    .into()
            ),
            "{:?}",
            sentences(&p)
        );
        // Mottles with no matrix colour logged: imperfect, said so.
        let mut m = mud(Moderate);
        m.paleosol_features.push(PaleosolFeature::Mottling);
        let p = read(m);
        assert_eq!(
            (p.drainage_reading, p.drainage_from),
            (DrainageReading::Imperfectly, DrainageBasis::Mottled)
        );
        assert!(sentences(&p).iter().any(|s| s.contains("no Munsell colour of the matrix logged")));
        // A grey, low-chroma matrix, mottled or not: gleyed, poorly drained.
        for mottled in [true, false] {
            let p = read(coloured(horizon(Moderate, "Bw", 0.5), "2.5Y 6/2", mottled));
            assert_eq!(
                (p.poorly_drained, p.drainage_reading, p.drainage_from),
                (true, DrainageReading::Poorly, DrainageBasis::Gleyed),
                "mottled {mottled}"
            );
        }
        assert!(sentences(&read(coloured(mud(Moderate), "N 6/", false)))
            .contains(&"a low-chroma N 6/ matrix (chroma 2 or less, hue not red: gleyed) in an undesignated bed: poorly drained".into()));
        // Low chroma in a red hue (10R 4/2) with mottles: red parent colours, not gleyed.
        assert_eq!(
            read(coloured(mud(Moderate), "10R 4/2", true)).drainage_reading,
            DrainageReading::Imperfectly
        );
        // A dark low-chroma matrix (10YR 2/1, organic) without mottles: no wet sign.
        let p = read(coloured(horizon(Moderate, "A", 0.3), "10YR 2/1", false));
        assert_eq!(
            (p.drainage_reading, p.drainage_from),
            (DrainageReading::NotPoorly, DrainageBasis::NoSign)
        );
        // F3 user notes: 4/1, 4/2 and 5/2 need redox concentrations, and pale A, E and calcic
        // horizons are no depleted matrix without them; 7.5YR is a red hue (F21).
        for (colour, h) in [("2.5Y 5/2", "Bw"), ("10YR 4/1", "Bw"), ("10YR 6/2", "Bk"), ("10YR 7/1", "E")] {
            let p = read(coloured(horizon(Moderate, h, 0.3), colour, false));
            assert_eq!(p.drainage_from, DrainageBasis::NoSign, "{colour} {h}");
            let p = read(coloured(horizon(Moderate, h, 0.3), colour, true));
            assert_eq!(p.drainage_from, DrainageBasis::Gleyed, "mottled {colour} {h}");
        }
        assert_eq!(read(coloured(mud(Moderate), "10YR 6/2", false)).drainage_from, DrainageBasis::Gleyed);
        assert_eq!(read(coloured(mud(Moderate), "7.5YR 5/2", true)).drainage_from, DrainageBasis::Mottled);
        // A red unmottled matrix: no wet sign.
        assert_eq!(read(coloured(mud(Moderate), "5YR 4/4", false)).drainage_from, DrainageBasis::NoSign);
        // The wettest sign where the maturity is wins: a mottled red bed and a gleyed one.
        let p = run(
            vec![coloured(mud(Moderate), "5YR 4/4", true), coloured(mud(Moderate), "5Y 5/1", false)],
            &RuleParams::default(),
        );
        assert_eq!(p[0].drainage_reading, DrainageReading::Poorly);
    }

    #[test]
    fn the_logged_drainage_class_wins_over_wet_signs_and_a_g_horizon_is_a_wet_sign() {
        use PaleosolDevelopment::*;
        let mut gleyed = horizon(Moderate, "Bt", 0.5);
        gleyed.paleosol_features.push(PaleosolFeature::Gleying);
        gleyed.drainage = Some(Drainage::WellDrained);
        let p = run(vec![gleyed.clone()], &RuleParams::default());
        assert_eq!((p[0].poorly_drained, p[0].drainage_from), (false, DrainageBasis::Logged));
        assert!(sentences(&p[0]).contains(&"drainage logged as well drained on Bt".into()));
        // Somewhat poorly drained (Soil Survey Manual) is the imperfect class, not a gleyed soil.
        gleyed.drainage = Some(Drainage::SomewhatPoorlyDrained);
        let p = run(vec![gleyed.clone()], &RuleParams::default());
        assert_eq!((p[0].poorly_drained, p[0].drainage_reading), (false, DrainageReading::Imperfectly));
        assert!(sentences(&p[0]).contains(
            &"drainage logged as somewhat poorly drained on Bt: imperfectly drained, not counted as poorly drained"
                .into()
        ));
        gleyed.drainage = Some(Drainage::PoorlyDrained);
        assert!(run(vec![gleyed], &RuleParams::default())[0].poorly_drained);
        let p = run(vec![horizon(Moderate, "Bg", 0.5)], &RuleParams::default());
        assert_eq!((p[0].poorly_drained, p[0].drainage_from), (true, DrainageBasis::Gleyed));
        assert!(sentences(&p[0]).contains(&"a gleyed (g) horizon in Bg: poorly drained".into()));
        let p = run(vec![horizon(Moderate, "Bw", 0.5)], &RuleParams::default());
        assert_eq!((p[0].poorly_drained, p[0].drainage_from), (false, DrainageBasis::NoSign));
    }

    #[test]
    fn a_new_horizon_sequence_or_a_truncation_starts_another_profile() {
        // Upward: C, Bt, A of one soil, then C, Bk, A of the soil buried on it.
        use PaleosolDevelopment::*;
        let beds = vec![
            horizon(Weak, "C", 0.3),
            horizon(Moderate, "Bt", 0.5),
            horizon(Weak, "A", 0.2),
            horizon(Weak, "2C", 0.3),
            horizon(Weak, "Bk", 0.5),
            mud(Weak),
            horizon(Weak, "A", 0.2),
        ];
        let p = run(beds.clone(), &RuleParams::default());
        assert_eq!(p.len(), 2);
        assert_eq!((p[0].first_bed, p[0].last_bed, p[1].first_bed, p[1].last_bed), (0, 2, 3, 6));
        assert!(sentences(&p[1])
            .iter()
            .any(|s| s.starts_with("starts where the horizon sequence starts again")));
        assert!(!sentences(&p[0]).iter().any(|s| s.starts_with("starts")));
        // The same beds with no designations are one run, one profile (as before horizons).
        let bare: Vec<Bed> = beds
            .iter()
            .cloned()
            .map(|mut b| {
                b.soil_horizon = Option::None;
                b
            })
            .collect();
        assert_eq!(run(bare.clone(), &RuleParams::default()).len(), 1);
        // An erosional base inside the run truncates the soil below.
        let mut cut = bare;
        cut[4].base_contact = Contact::Erosional;
        let p = run(cut, &RuleParams::default());
        assert_eq!((p.len(), p[1].first_bed), (2, 4));
        assert!(sentences(&p[1]).iter().any(|s| s.contains("the soil below truncated")));
    }
}
