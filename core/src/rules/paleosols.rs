//! Paleosol profiles: consecutive beds with soil development read as one fossil soil, with a
//! maturity from the development logged, the carbonate stage and the features seen.
//!
//! A soil is a profile of horizons (Retallack 2001); geologists often log the horizons as beds
//! of their own (an A over a Bt over a Bk), and compound or cumulative profiles stack several
//! (Kraus 1999). Each bed with a development grade, paleosol features or a carbonate stage is a
//! horizon; unbroken runs of horizons (a covered interval breaks them) are profiles, and a profile
//! counts when its maturity reaches `paleosol_min_development`.

use super::column::{is_sand_or_gravel, Column};
use super::params::RuleParams;
use super::types::{MaturitySign, PaleosolProfile};
use crate::model::{Bed, PaleosolDevelopment, PaleosolFeature, Section, Structure};

/// True when a bed was logged as a soil horizon.
fn is_horizon(bed: &Bed) -> bool {
    !bed.is_covered()
        && (bed.paleosol != PaleosolDevelopment::None
            || !bed.paleosol_features.is_empty()
            || bed.carbonate_stage.is_some())
}

/// One grade up the development scale (very strong stays very strong).
fn raised(dev: PaleosolDevelopment) -> PaleosolDevelopment {
    use PaleosolDevelopment::*;
    match dev {
        None => Weak,
        Weak => Moderate,
        Moderate => Strong,
        Strong | VeryStrong => VeryStrong,
    }
}

/// Maturity of a profile of beds `first..=last`, with what raised it above the logged grade.
fn maturity(
    beds: &[Bed],
    params: &RuleParams,
) -> (PaleosolDevelopment, PaleosolDevelopment, Option<u8>, Vec<MaturitySign>) {
    let logged = beds.iter().map(|b| b.paleosol).max().unwrap_or_default();
    let stage = beds.iter().filter_map(|b| b.carbonate_stage).max();
    let mut m = logged;
    let mut signs = Vec::new();
    if let Some(st) = stage {
        let floor = if st >= params.very_strong_carbonate_stage {
            PaleosolDevelopment::VeryStrong
        } else if st >= params.strong_carbonate_stage {
            PaleosolDevelopment::Strong
        } else {
            PaleosolDevelopment::Weak
        };
        if floor > m {
            m = floor;
            if floor >= PaleosolDevelopment::Strong {
                signs.push(MaturitySign::CarbonateStage);
            }
        }
    }
    let has = |f: PaleosolFeature, s: Structure| {
        beds.iter().any(|b| b.paleosol_features.contains(&f) || b.structures.contains(&s))
    };
    if params.vertic_calcic_raises
        && has(PaleosolFeature::Slickensides, Structure::Slickensides)
        && has(PaleosolFeature::CarbonateNodules, Structure::CarbonateNodules)
        && raised(m) > m
    {
        m = raised(m);
        signs.push(MaturitySign::VerticCalcic);
    }
    (m, logged, stage, signs)
}

/// The paleosol profiles of a section, lowest first. Linear in the number of beds.
pub fn profiles(section: &Section, column: &Column, params: &RuleParams) -> Vec<PaleosolProfile> {
    let beds = &section.beds;
    let mut out = Vec::new();
    let mut i = 0;
    while i < beds.len() {
        if !is_horizon(&beds[i]) {
            i += 1;
            continue;
        }
        let first = i;
        while i + 1 < beds.len() && is_horizon(&beds[i + 1]) {
            i += 1;
        }
        let last = i;
        i += 1;
        let (maturity, logged_development, carbonate_stage, raised_by) =
            maturity(&beds[first..=last], params);
        if maturity == PaleosolDevelopment::None || maturity < params.paleosol_min_development {
            continue;
        }
        let on_sandstone = beds[first..=last].iter().any(is_sand_or_gravel);
        // Drainage is read from the horizons that carry the profile's maturity (its most
        // developed beds and those of its highest carbonate stage): a mottled weak horizon
        // under a stage IV calcic horizon does not make a mature, well-drained soil wet
        // (Kraus 1999; Machette 1985).
        let profile = &beds[first..=last];
        let key = |b: &&Bed| {
            b.paleosol == logged_development
                || (carbonate_stage.is_some() && b.carbonate_stage == carbonate_stage)
        };
        let wet = |b: &&Bed| {
            b.paleosol_features
                .iter()
                .any(|f| matches!(f, PaleosolFeature::Gleying | PaleosolFeature::Mottling))
                || b.structures.contains(&Structure::Mottling)
        };
        let poorly_drained = profile.iter().filter(key).any(|b| wet(&b));
        out.push(PaleosolProfile {
            base_m: column.bounds_m[first],
            top_m: column.bounds_m[last + 1],
            maturity,
            beds: beds[first..=last].iter().map(|b| b.id).collect(),
            first_bed: first,
            last_bed: last,
            logged_development,
            carbonate_stage,
            raised_by,
            on_sandstone,
            poorly_drained,
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
    fn carbonate_stage_and_vertic_calcic_features_raise_maturity() {
        // Machette 1985 stage III → at least strong; slickensides with nodules → one grade more.
        use PaleosolDevelopment::*;
        let mut b = mud(Weak);
        b.carbonate_stage = Some(3);
        let p = run(vec![b.clone()], &RuleParams::default());
        assert_eq!((p[0].maturity, p[0].raised_by.as_slice()), (Strong, &[MaturitySign::CarbonateStage][..]));
        b.paleosol_features = vec![PaleosolFeature::Slickensides, PaleosolFeature::CarbonateNodules];
        let p = run(vec![b.clone()], &RuleParams::default());
        assert_eq!(p[0].maturity, VeryStrong);
        let off = RuleParams { vertic_calcic_raises: false, ..RuleParams::default() };
        assert_eq!(run(vec![b], &off)[0].maturity, Strong);
    }

    #[test]
    fn a_covered_interval_splits_profiles_and_weak_ones_drop_below_the_minimum() {
        use PaleosolDevelopment::*;
        let covered = Bed::new(BedId(0), 1.0, Lithology::Covered, Option::None);
        let p = run(vec![mud(Strong), covered, mud(Weak)], &RuleParams::default());
        assert_eq!(p.len(), 2);
        let strict = RuleParams { paleosol_min_development: Moderate, ..RuleParams::default() };
        let mut s = Section::new("t");
        s.beds = vec![mud(Strong), Bed::new(BedId(9), 1.0, Lithology::Covered, Option::None), mud(Weak)];
        assert_eq!(profiles(&s, &Column::new(&s), &strict).len(), 1);
    }
}
