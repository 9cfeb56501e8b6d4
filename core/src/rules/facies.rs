//! Suggested lithofacies codes: which code of Miall's scheme (Miall 1978, 1996) a bed's
//! lithology, grain size, structures, paleocurrent indicators and soil features point to.
//!
//! The rule is a table, [`FACIES_TABLE`]: rows are tried top to bottom and the first row whose
//! rock and cues the bed shows gives the suggestion. `docs/facies.md` prints the same table
//! ([`table_markdown`]; a test keeps the two equal). A suggestion is a candidate: the geologist
//! confirms it or writes another code in `Bed::facies`, and [`facies_of`] gives the geologist's
//! code whenever there is one.

use crate::model::{
    Bed, Contact, FaciesCode, Indicator, Lithology, LithologyFamily, PaleosolFeature, Structure,
    WentworthClass,
};

/// The rock a row applies to, read from the lithology the geologist logged (the rock name
/// decides; grain size only splits the fines).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Rock {
    /// Conglomerate or breccia.
    Gravel,
    /// Sandstone.
    Sand,
    /// Claystone, mudstone, shale or siltstone.
    Fines,
    /// Fines of silt grade: siltstone, or other fines whose recorded grain size (base or top)
    /// is silt or coarser.
    SiltyFines,
    /// Fines of clay grade: claystone, mudstone or shale with no grain size of silt or coarser.
    MuddyFines,
    /// Fines, or a carbonate rock (limestone, dolostone, marl) such as a calcrete.
    FinesOrCarbonate,
    /// Coal.
    Coal,
}

impl Rock {
    /// True when the bed is this rock.
    pub fn holds(self, bed: &Bed) -> bool {
        let family = bed.lithology.family();
        match self {
            Rock::Gravel => family == LithologyFamily::Gravel,
            Rock::Sand => family == LithologyFamily::Sand,
            Rock::Fines => family == LithologyFamily::Fines,
            Rock::SiltyFines => family == LithologyFamily::Fines && is_silty(bed),
            Rock::MuddyFines => family == LithologyFamily::Fines && !is_silty(bed),
            Rock::FinesOrCarbonate => {
                family == LithologyFamily::Fines
                    || matches!(bed.lithology, Lithology::Limestone | Lithology::Dolostone | Lithology::Marl)
            }
            Rock::Coal => bed.lithology == Lithology::Coal,
        }
    }

    /// The rock in words, as the documentation prints it.
    pub fn describe(self) -> &'static str {
        match self {
            Rock::Gravel => "gravel (conglomerate, breccia)",
            Rock::Sand => "sand (sandstone)",
            Rock::Fines => "fines (claystone, mudstone, shale, siltstone)",
            Rock::SiltyFines => "silty fines (siltstone, or fines with a silt grain size)",
            Rock::MuddyFines => "muddy fines (claystone, mudstone, shale without a silt grain size)",
            Rock::FinesOrCarbonate => "fines, limestone, dolostone or marl",
            Rock::Coal => "coal",
        }
    }
}

/// Siltstone, or fines whose base or top grain size is silt or coarser.
fn is_silty(bed: &Bed) -> bool {
    bed.lithology == Lithology::Siltstone
        || bed.coarsest_grain().is_some_and(|g| g.class() >= WentworthClass::Silt)
}

/// One thing seen in a bed that points to a code.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Cue {
    /// The structure is logged.
    Structure(Structure),
    /// A paleocurrent reading was measured on this indicator (a trough axis is seen only where
    /// there are troughs).
    Indicator(Indicator),
    /// The paleosol feature is logged.
    Feature(PaleosolFeature),
    /// Carbonate morphological stage at least this (1–6 for I–VI; Machette 1985).
    CarbonateStageAtLeast(u8),
    /// The soil-horizon designation carries this suffix ("k": carbonate accumulation).
    HorizonSuffix(&'static str),
    /// Bioturbation index at least this (0–6; Taylor & Goldring 1993).
    BioturbationAtLeast(u8),
    /// The base is erosional.
    ErosionalBase,
    /// The top grain size is coarser than the base (inverse grading).
    InverseGrading,
}

impl Cue {
    /// True when the bed shows the cue.
    pub fn holds(self, bed: &Bed) -> bool {
        match self {
            Cue::Structure(s) => bed.structures.contains(&s),
            Cue::Indicator(i) => bed.paleocurrents.iter().any(|p| p.indicator == i),
            Cue::Feature(f) => bed.paleosol_features.contains(&f),
            Cue::CarbonateStageAtLeast(n) => bed.carbonate_stage.is_some_and(|s| s >= n),
            Cue::HorizonSuffix(x) => bed.soil_horizon.as_ref().is_some_and(|h| h.has(x)),
            Cue::BioturbationAtLeast(n) => bed.bioturbation_index.is_some_and(|b| b >= n),
            Cue::ErosionalBase => bed.base_contact == Contact::Erosional,
            // A change of class, not a fraction of one: a measured top a little coarser than a
            // class-named base is no grading.
            Cue::InverseGrading => match (bed.grain_base, bed.grain_top) {
                (Some(b), Some(t)) => t.class() > b.class(),
                _ => false,
            },
        }
    }

    /// The cue in words, as the documentation prints it.
    pub fn describe(self) -> String {
        match self {
            Cue::Structure(s) => s.name().to_string(),
            Cue::Indicator(i) => format!("a paleocurrent reading ({})", i.name()),
            Cue::Feature(f) => format!("{} (paleosol feature)", f.name()),
            Cue::CarbonateStageAtLeast(n) => format!("carbonate stage {} or higher", roman(n)),
            Cue::HorizonSuffix(x) => format!("a soil horizon with suffix {x} (B{x})"),
            Cue::BioturbationAtLeast(n) => format!("bioturbation index {n} or higher"),
            Cue::ErosionalBase => "an erosional base".to_string(),
            Cue::InverseGrading => "top grain size coarser than the base (inverse grading)".to_string(),
        }
    }
}

/// A carbonate stage 1–6 as I–VI.
fn roman(stage: u8) -> &'static str {
    ["0", "I", "II", "III", "IV", "V", "VI"].get(usize::from(stage)).copied().unwrap_or("?")
}

/// One row of the suggestion table: the code given to a bed of `rock` that shows every cue of
/// `all_of` and, when `any_of` is not empty, at least one cue of `any_of`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct FaciesRow {
    pub code: FaciesCode,
    pub rock: Rock,
    pub all_of: &'static [Cue],
    pub any_of: &'static [Cue],
    /// Why the row reads the cues this way, for the documentation.
    pub why: &'static str,
}

impl FaciesRow {
    /// True when the bed is the row's rock and shows its cues.
    pub fn matches(&self, bed: &Bed) -> bool {
        self.rock.holds(bed)
            && self.all_of.iter().all(|c| c.holds(bed))
            && (self.any_of.is_empty() || self.any_of.iter().any(|c| c.holds(bed)))
    }

    /// The row's cues in words: "an erosional base and one of: mud clasts".
    pub fn cues_text(&self) -> String {
        let all: Vec<String> = self.all_of.iter().map(|c| c.describe()).collect();
        let any: Vec<String> = self.any_of.iter().map(|c| c.describe()).collect();
        let any_text = match any.len() {
            0 => String::new(),
            1 => any[0].clone(),
            _ => format!("one of: {}", any.join("; ")),
        };
        match (all.is_empty(), any_text.is_empty()) {
            (true, true) => "nothing more".to_string(),
            (true, false) => any_text,
            (false, true) => all.join(" and "),
            (false, false) => format!("{} and {any_text}", all.join(" and ")),
        }
    }
}

use Cue::{Feature as F, Indicator as I, Structure as S};

/// The suggestion table, first match wins. Larger bedforms come before smaller ones (a bed
/// logged with trough cross-bedding and ripple lamination is St), structures before scour cues,
/// and "massive" last, so that a bed is named after the most telling thing the geologist saw.
pub const FACIES_TABLE: &[FaciesRow] = &[
    FaciesRow {
        code: FaciesCode::C,
        rock: Rock::Coal,
        all_of: &[],
        any_of: &[],
        why: "coal is C whatever else is logged",
    },
    FaciesRow {
        code: FaciesCode::P,
        rock: Rock::FinesOrCarbonate,
        all_of: &[],
        any_of: &[
            S(Structure::CarbonateNodules),
            F(PaleosolFeature::CarbonateNodules),
            Cue::CarbonateStageAtLeast(2),
            Cue::HorizonSuffix("k"),
        ],
        why: "pedogenic carbonate: nodules appear at stage II (Machette 1985); a Bk horizon holds \
              carbonate; a calcrete logged as limestone or marl with these cues is P too",
    },
    FaciesRow {
        code: FaciesCode::Gt,
        rock: Rock::Gravel,
        all_of: &[],
        any_of: &[S(Structure::TroughCrossBedding), I(Indicator::TroughAxis)],
        why: "stratified gravel, trough cross-beds",
    },
    FaciesRow {
        code: FaciesCode::Gp,
        rock: Rock::Gravel,
        all_of: &[],
        any_of: &[S(Structure::PlanarCrossBedding), I(Indicator::PlanarForeset)],
        why: "stratified gravel, planar cross-beds",
    },
    FaciesRow {
        code: FaciesCode::Gh,
        rock: Rock::Gravel,
        all_of: &[],
        any_of: &[S(Structure::Imbrication), S(Structure::HorizontalLamination), I(Indicator::Imbrication)],
        why: "crudely bedded gravel: horizontal bedding (logged as horizontal lamination) or \
              imbrication",
    },
    FaciesRow {
        code: FaciesCode::Gci,
        rock: Rock::Gravel,
        all_of: &[Cue::InverseGrading],
        any_of: &[],
        why: "inverse grading; clast support is assumed, as for Gcm below",
    },
    FaciesRow {
        code: FaciesCode::Gcm,
        rock: Rock::Gravel,
        all_of: &[],
        any_of: &[S(Structure::Massive)],
        why: "massive gravel: the record has no field for clast or matrix support, so the \
              clast-supported code, the common one in channel gravels, is suggested; change it to \
              Gmm where the clasts float in matrix",
    },
    FaciesRow {
        code: FaciesCode::St,
        rock: Rock::Sand,
        all_of: &[],
        any_of: &[S(Structure::TroughCrossBedding), I(Indicator::TroughAxis)],
        why: "trough cross-beds",
    },
    FaciesRow {
        code: FaciesCode::Sp,
        rock: Rock::Sand,
        all_of: &[],
        any_of: &[S(Structure::PlanarCrossBedding), I(Indicator::PlanarForeset)],
        why: "planar cross-beds",
    },
    FaciesRow {
        code: FaciesCode::Sl,
        rock: Rock::Sand,
        all_of: &[],
        any_of: &[S(Structure::LateralAccretion), I(Indicator::AccretionSurface)],
        why: "the vocabulary has no low-angle cross-bedding term; lateral-accretion bedding is \
              inclined at low angles, so it is read as Sl (low-angle cross-beds) when no \
              cross-bedding is logged",
    },
    FaciesRow {
        code: FaciesCode::Sh,
        rock: Rock::Sand,
        all_of: &[],
        any_of: &[S(Structure::HorizontalLamination), I(Indicator::PartingLineation)],
        why: "horizontal lamination, parting lineation",
    },
    FaciesRow {
        code: FaciesCode::Sr,
        rock: Rock::Sand,
        all_of: &[],
        any_of: &[S(Structure::RippleCrossLamination), I(Indicator::Ripple)],
        why: "ripple cross-lamination",
    },
    FaciesRow {
        code: FaciesCode::Se,
        rock: Rock::Sand,
        all_of: &[Cue::ErosionalBase],
        any_of: &[S(Structure::MudClasts)],
        why: "erosional scour with intraclasts (Miall 1978)",
    },
    FaciesRow {
        code: FaciesCode::Ss,
        rock: Rock::Sand,
        all_of: &[Cue::ErosionalBase],
        any_of: &[S(Structure::BasalLag)],
        why: "scour fill over an erosional base, with a lag but no intraclasts",
    },
    FaciesRow {
        code: FaciesCode::Sm,
        rock: Rock::Sand,
        all_of: &[],
        any_of: &[S(Structure::Massive)],
        why: "massive sand",
    },
    FaciesRow {
        code: FaciesCode::Fr,
        rock: Rock::Fines,
        all_of: &[],
        any_of: &[
            S(Structure::RootTraces),
            S(Structure::Bioturbation),
            F(PaleosolFeature::RootTraces),
            F(PaleosolFeature::Rhizoliths),
            Cue::BioturbationAtLeast(4),
        ],
        why: "roots or burrows; from index 4 bedding is mostly destroyed (Taylor & Goldring 1993)",
    },
    FaciesRow {
        code: FaciesCode::Fl,
        rock: Rock::Fines,
        all_of: &[],
        any_of: &[
            S(Structure::HorizontalLamination),
            S(Structure::RippleCrossLamination),
            I(Indicator::Ripple),
        ],
        why: "fine lamination, very small ripples",
    },
    FaciesRow {
        code: FaciesCode::Fm,
        rock: Rock::Fines,
        all_of: &[],
        any_of: &[S(Structure::DesiccationCracks)],
        why: "desiccation cracks",
    },
    FaciesRow {
        code: FaciesCode::Fsm,
        rock: Rock::SiltyFines,
        all_of: &[],
        any_of: &[S(Structure::Massive)],
        why: "massive silt",
    },
    FaciesRow {
        code: FaciesCode::Fm,
        rock: Rock::MuddyFines,
        all_of: &[],
        any_of: &[S(Structure::Massive)],
        why: "massive mud",
    },
];

/// The row of [`FACIES_TABLE`] that gives a bed its suggested code, with its place in the table
/// (0-based); `None` for covered intervals and for beds no row fits.
pub fn explain(bed: &Bed) -> Option<(usize, &'static FaciesRow)> {
    if bed.is_covered() {
        return None;
    }
    FACIES_TABLE.iter().enumerate().find(|(_, row)| row.matches(bed))
}

/// The suggested lithofacies code of a bed: a candidate for the geologist to confirm or change.
/// `None` for covered intervals and for beds whose record fits no row of [`FACIES_TABLE`] (no
/// structure logged, or a rock outside the scheme such as tuff).
pub fn suggest(bed: &Bed) -> Option<FaciesCode> {
    explain(bed).map(|(_, row)| row.code)
}

/// Every row that fits the bed, in table order: the first gives the suggestion, the others are
/// the codes a geologist may prefer when structures conflict. Empty for covered intervals.
pub fn alternatives(bed: &Bed) -> Vec<&'static FaciesRow> {
    if bed.is_covered() {
        return Vec::new();
    }
    FACIES_TABLE.iter().filter(|row| row.matches(bed)).collect()
}

/// The code in force for a bed and whether it is only suggested: the geologist's code
/// (`suggested` false) when one is set, else the suggestion (`suggested` true), else `None`.
/// A covered interval has no code, even one typed by mistake.
pub fn facies_of(bed: &Bed) -> Option<(FaciesCode, bool)> {
    if bed.is_covered() {
        return None;
    }
    match bed.facies {
        Some(code) => Some((code, false)),
        None => suggest(bed).map(|code| (code, true)),
    }
}

/// Why the geologist's code does not fit the rock logged for the bed, if it does not: each
/// code names its rock by its first letter (Miall 1978, 1996: G gravel, S sand, F fines, C coal,
/// P paleosol carbonate). Leniences, as Miall's descriptions allow: a G code on a sandstone whose
/// coarsest grain is granule or coarser (a pebbly sand logged as sand), `Fl` on a sandstone of
/// very fine sand or finer ("sand, silt, mud"), `P` on fines or a carbonate rock. A bed without a
/// code, or a covered interval, gives `None` (the second is reported apart, as no code applies).
pub fn code_against_rock(bed: &Bed) -> Option<String> {
    let code = bed.facies?;
    if bed.is_covered() {
        return Some(format!(
            "{} is given for a covered interval, which has no facies; it is not used",
            code.code()
        ));
    }
    let family = bed.lithology.family();
    let coarsest = bed.coarsest_grain().map(|g| g.class());
    let fits = match code.code().as_bytes()[0] {
        b'G' => {
            family == LithologyFamily::Gravel
                || (family == LithologyFamily::Sand && coarsest.is_some_and(|c| c >= WentworthClass::Granule))
        }
        b'S' => family == LithologyFamily::Sand,
        b'F' if code == FaciesCode::Fl => {
            family == LithologyFamily::Fines
                || (family == LithologyFamily::Sand
                    && coarsest.is_none_or(|c| c <= WentworthClass::VeryFineSand))
        }
        b'F' => family == LithologyFamily::Fines,
        b'C' => bed.lithology == Lithology::Coal || family == LithologyFamily::Fines,
        _ => Rock::FinesOrCarbonate.holds(bed),
    };
    (!fits).then(|| {
        let grain = coarsest.map(|c| format!(" ({})", c.name())).unwrap_or_default();
        format!(
            "{} ({}) does not fit the rock logged, {}{grain}; check the code or the lithology",
            code.code(),
            code.meaning(),
            bed.lithology.name()
        )
    })
}

/// The table as a Markdown table, as `docs/facies.md` prints it.
pub fn table_markdown() -> String {
    let mut s = String::from("| # | Code | Rock | Cues | Why |\n|---|---|---|---|---|\n");
    for (k, row) in FACIES_TABLE.iter().enumerate() {
        s.push_str(&format!(
            "| {} | {} | {} | {} | {} |\n",
            k + 1,
            row.code.code(),
            row.rock.describe(),
            row.cues_text(),
            row.why.split_whitespace().collect::<Vec<_>>().join(" ")
        ));
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_code_that_names_another_rock_is_reported() {
        use crate::model::{BedId, GrainSize};
        let bed = |l: Lithology, g: WentworthClass, code: FaciesCode| {
            let mut b = Bed::new(BedId(1), 1.0, l, Some(GrainSize::Class(g)));
            b.facies = Some(code);
            b
        };
        // First letter of the code names the rock (Miall 1978, 1996).
        let gcm_on_mud = code_against_rock(&bed(Lithology::Mudstone, WentworthClass::Clay, FaciesCode::Gcm));
        assert!(
            gcm_on_mud.as_deref().is_some_and(|m| m.contains("Gcm") && m.contains("mudstone")),
            "{gcm_on_mud:?}"
        );
        assert!(code_against_rock(&bed(Lithology::Sandstone, WentworthClass::MediumSand, FaciesCode::C))
            .is_some());
        assert!(code_against_rock(&bed(Lithology::Mudstone, WentworthClass::Clay, FaciesCode::St)).is_some());
        assert!(code_against_rock(&bed(Lithology::Sandstone, WentworthClass::MediumSand, FaciesCode::Fm))
            .is_some());
        // Fits, and the leniences Miall's descriptions allow.
        assert_eq!(
            code_against_rock(&bed(Lithology::Sandstone, WentworthClass::MediumSand, FaciesCode::St)),
            None
        );
        assert_eq!(
            code_against_rock(&bed(Lithology::Sandstone, WentworthClass::Pebble, FaciesCode::Gt)),
            None
        );
        assert_eq!(
            code_against_rock(&bed(Lithology::Sandstone, WentworthClass::VeryFineSand, FaciesCode::Fl)),
            None
        );
        assert_eq!(code_against_rock(&bed(Lithology::Mudstone, WentworthClass::Clay, FaciesCode::P)), None);
        assert_eq!(code_against_rock(&bed(Lithology::Limestone, WentworthClass::Clay, FaciesCode::P)), None);
        let mut no_code = bed(Lithology::Mudstone, WentworthClass::Clay, FaciesCode::Fm);
        no_code.facies = None;
        assert_eq!(code_against_rock(&no_code), None);
        assert!(code_against_rock(&bed(Lithology::Covered, WentworthClass::Clay, FaciesCode::Fm)).is_some());
    }
    use crate::model::{BedId, GrainSize, Paleocurrent, SoilHorizon};

    fn bed(lith: Lithology, grain: Option<WentworthClass>, structures: &[Structure]) -> Bed {
        let mut b = Bed::new(BedId(1), 1.0, lith, grain.map(GrainSize::Class));
        b.structures = structures.to_vec();
        b
    }

    fn reading(indicator: Indicator) -> Paleocurrent {
        Paleocurrent { azimuth_deg: 200.0, indicator, dip_deg: None }
    }

    /// One bed per row, each reaching the row it names (index into the table).
    fn one_bed_per_row() -> Vec<(usize, Bed)> {
        use Lithology::*;
        use Structure::*;
        use WentworthClass::*;
        let mut p = bed(Mudstone, Some(Clay), &[Massive]);
        p.carbonate_stage = Some(3);
        let mut gci = bed(Conglomerate, Some(Pebble), &[]);
        gci.grain_top = Some(GrainSize::Class(Cobble));
        let mut se = bed(Sandstone, Some(MediumSand), &[MudClasts]);
        se.base_contact = Contact::Erosional;
        let mut ss = bed(Sandstone, Some(CoarseSand), &[BasalLag, Massive]);
        ss.base_contact = Contact::Erosional;
        vec![
            (0, bed(Coal, None, &[])),
            (1, p),
            (2, bed(Conglomerate, Some(Pebble), &[TroughCrossBedding])),
            (3, bed(Conglomerate, Some(Cobble), &[PlanarCrossBedding])),
            (4, bed(Conglomerate, Some(Pebble), &[Imbrication])),
            (5, gci),
            (6, bed(Breccia, Some(Cobble), &[Massive])),
            (7, bed(Sandstone, Some(MediumSand), &[TroughCrossBedding])),
            (8, bed(Sandstone, Some(CoarseSand), &[PlanarCrossBedding])),
            (9, bed(Sandstone, Some(FineSand), &[LateralAccretion])),
            (10, bed(Sandstone, Some(FineSand), &[HorizontalLamination])),
            (11, bed(Sandstone, Some(VeryFineSand), &[RippleCrossLamination])),
            (12, se),
            (13, ss),
            (14, bed(Sandstone, Some(MediumSand), &[Massive])),
            (15, bed(Mudstone, Some(Clay), &[RootTraces])),
            (16, bed(Shale, Some(Clay), &[HorizontalLamination])),
            (17, bed(Claystone, Some(Clay), &[DesiccationCracks])),
            (18, bed(Siltstone, Some(Silt), &[Massive])),
            (19, bed(Mudstone, Some(Clay), &[Massive])),
        ]
    }

    #[test]
    fn every_row_of_the_table_is_reached_by_a_bed() {
        let beds = one_bed_per_row();
        let reached: Vec<usize> = beds
            .iter()
            .map(|(want, b)| {
                let (k, row) = explain(b).unwrap_or_else(|| panic!("row {want}: no suggestion for {b:?}"));
                assert_eq!(
                    k, *want,
                    "expected row {want} ({}), got row {k} ({})",
                    FACIES_TABLE[*want].code, row.code
                );
                assert_eq!(suggest(b), Some(FACIES_TABLE[*want].code));
                k
            })
            .collect();
        let mut all: Vec<usize> = reached.clone();
        all.sort_unstable();
        all.dedup();
        assert_eq!(all, (0..FACIES_TABLE.len()).collect::<Vec<_>>(), "some row is never reached");
    }

    #[test]
    fn the_brief_pairs_of_structure_and_code() {
        // Miall 1996, Table 5.1 (and Miall 1978 for Se): the structure named in each code's
        // description gives that code.
        use Lithology::*;
        use Structure::*;
        use WentworthClass::*;
        let cases = [
            (Conglomerate, Pebble, TroughCrossBedding, FaciesCode::Gt),
            (Conglomerate, Pebble, PlanarCrossBedding, FaciesCode::Gp),
            (Conglomerate, Cobble, HorizontalLamination, FaciesCode::Gh),
            (Conglomerate, Cobble, Massive, FaciesCode::Gcm),
            (Sandstone, MediumSand, TroughCrossBedding, FaciesCode::St),
            (Sandstone, MediumSand, PlanarCrossBedding, FaciesCode::Sp),
            (Sandstone, FineSand, RippleCrossLamination, FaciesCode::Sr),
            (Sandstone, FineSand, HorizontalLamination, FaciesCode::Sh),
            (Sandstone, FineSand, Massive, FaciesCode::Sm),
            (Siltstone, Silt, HorizontalLamination, FaciesCode::Fl),
            (Siltstone, Silt, Bioturbation, FaciesCode::Fr),
            (Mudstone, Silt, Massive, FaciesCode::Fsm),
            (Claystone, Clay, Massive, FaciesCode::Fm),
        ];
        for (lith, grain, structure, code) in cases {
            assert_eq!(
                suggest(&bed(lith, Some(grain), &[structure])),
                Some(code),
                "{lith} {grain} {structure}"
            );
        }
        // Paleocurrent indicators are structures seen: a trough axis in sand is St, a parting
        // lineation Sh (Miall 1978: "horizontal lamination, parting or streaming lineation").
        let mut b = bed(Sandstone, Some(MediumSand), &[]);
        b.paleocurrents = vec![reading(Indicator::PartingLineation)];
        assert_eq!(suggest(&b), Some(FaciesCode::Sh));
        b.paleocurrents.push(reading(Indicator::TroughAxis));
        assert_eq!(suggest(&b), Some(FaciesCode::St));
        let mut g = bed(Conglomerate, Some(Pebble), &[]);
        g.paleocurrents = vec![reading(Indicator::Imbrication)];
        assert_eq!(suggest(&g), Some(FaciesCode::Gh));
    }

    #[test]
    fn covered_intervals_and_beds_without_cues_get_no_code() {
        let covered = bed(Lithology::Covered, None, &[Structure::Massive]);
        assert_eq!(suggest(&covered), None);
        assert!(alternatives(&covered).is_empty());
        let mut typed = covered.clone();
        typed.facies = Some(FaciesCode::Sm);
        assert_eq!(facies_of(&typed), None, "a covered interval has no facies");
        // No structure logged: nothing tells trough from planar from massive.
        assert_eq!(suggest(&bed(Lithology::Sandstone, Some(WentworthClass::MediumSand), &[])), None);
        // Rocks outside the scheme.
        assert_eq!(suggest(&bed(Lithology::Tuff, None, &[Structure::Massive])), None);
        assert_eq!(suggest(&bed(Lithology::Limestone, None, &[Structure::HorizontalLamination])), None);
    }

    #[test]
    fn beds_without_a_grain_size_are_read_from_their_lithology() {
        // Fines with no grain size: siltstone is silty, the other fines muddy.
        assert_eq!(suggest(&bed(Lithology::Siltstone, None, &[Structure::Massive])), Some(FaciesCode::Fsm));
        assert_eq!(suggest(&bed(Lithology::Mudstone, None, &[Structure::Massive])), Some(FaciesCode::Fm));
        assert_eq!(suggest(&bed(Lithology::Sandstone, None, &[Structure::Massive])), Some(FaciesCode::Sm));
        // No grain sizes, so no grading: a massive gravel is Gcm, not Gci.
        assert_eq!(
            suggest(&bed(Lithology::Conglomerate, None, &[Structure::Massive])),
            Some(FaciesCode::Gcm)
        );
        // Base and top in the same class is not inverse grading.
        let mut g = bed(Lithology::Conglomerate, Some(WentworthClass::Pebble), &[Structure::Massive]);
        g.grain_top = Some(GrainSize::Phi(-5.0)); // 32 mm, still pebble
        assert_eq!(suggest(&g), Some(FaciesCode::Gcm));
        // Normal grading neither.
        g.grain_top = Some(GrainSize::Class(WentworthClass::Granule));
        assert_eq!(suggest(&g), Some(FaciesCode::Gcm));
    }

    #[test]
    fn conflicting_structures_follow_the_table_order_and_list_the_alternatives() {
        use Structure::*;
        let b = bed(
            Lithology::Sandstone,
            Some(WentworthClass::MediumSand),
            &[RippleCrossLamination, TroughCrossBedding, Massive],
        );
        assert_eq!(suggest(&b), Some(FaciesCode::St), "the larger bedform names the bed");
        let alt: Vec<FaciesCode> = alternatives(&b).iter().map(|r| r.code).collect();
        assert_eq!(alt, vec![FaciesCode::St, FaciesCode::Sr, FaciesCode::Sm]);
        // Lateral accretion with cross-beds: the cross-beds are the lithofacies, LA the element.
        let la = bed(
            Lithology::Sandstone,
            Some(WentworthClass::FineSand),
            &[LateralAccretion, PlanarCrossBedding],
        );
        assert_eq!(suggest(&la), Some(FaciesCode::Sp));
        // Mud clasts without an erosional base are no scour: massive sand.
        let mc = bed(Lithology::Sandstone, Some(WentworthClass::MediumSand), &[MudClasts, Massive]);
        assert_eq!(suggest(&mc), Some(FaciesCode::Sm));
        // Mud clasts and a lag over a scour: the intraclasts make it Se.
        let mut scour = bed(Lithology::Sandstone, Some(WentworthClass::CoarseSand), &[BasalLag, MudClasts]);
        scour.base_contact = Contact::Erosional;
        assert_eq!(suggest(&scour), Some(FaciesCode::Se));
        // Roots through laminated mud: Fr before Fl. Carbonate nodules before both: P.
        let mut soil =
            bed(Lithology::Mudstone, Some(WentworthClass::Clay), &[HorizontalLamination, RootTraces]);
        assert_eq!(suggest(&soil), Some(FaciesCode::Fr));
        soil.paleosol_features = vec![PaleosolFeature::CarbonateNodules];
        assert_eq!(suggest(&soil), Some(FaciesCode::P));
        // Stage I (filaments) is not yet a nodular horizon (Machette 1985); a Bk horizon is.
        let mut st1 = bed(Lithology::Mudstone, Some(WentworthClass::Clay), &[Massive]);
        st1.carbonate_stage = Some(1);
        assert_eq!(suggest(&st1), Some(FaciesCode::Fm));
        st1.soil_horizon = Some(SoilHorizon::parse("Bk2").expect("valid"));
        assert_eq!(suggest(&st1), Some(FaciesCode::P));
        // A calcrete logged as limestone.
        let mut calcrete = bed(Lithology::Limestone, None, &[]);
        calcrete.carbonate_stage = Some(4);
        assert_eq!(suggest(&calcrete), Some(FaciesCode::P));
        // Carbonate in a sandstone does not make it P: the sand's structures name it.
        let mut sand =
            bed(Lithology::Sandstone, Some(WentworthClass::FineSand), &[CarbonateNodules, Massive]);
        sand.carbonate_stage = Some(3);
        assert_eq!(suggest(&sand), Some(FaciesCode::Sm));
        // Bioturbation index: 3 leaves lamination (Fl), 4 makes Fr.
        let mut burrowed = bed(Lithology::Siltstone, Some(WentworthClass::Silt), &[HorizontalLamination]);
        burrowed.bioturbation_index = Some(3);
        assert_eq!(suggest(&burrowed), Some(FaciesCode::Fl));
        burrowed.bioturbation_index = Some(4);
        assert_eq!(suggest(&burrowed), Some(FaciesCode::Fr));
    }

    #[test]
    fn the_geologists_code_wins_over_the_suggestion() {
        let mut b =
            bed(Lithology::Sandstone, Some(WentworthClass::MediumSand), &[Structure::TroughCrossBedding]);
        assert_eq!(facies_of(&b), Some((FaciesCode::St, true)));
        b.facies = Some(FaciesCode::St);
        assert_eq!(facies_of(&b), Some((FaciesCode::St, false)), "confirmed");
        b.facies = Some(FaciesCode::Sp);
        assert_eq!(facies_of(&b), Some((FaciesCode::Sp, false)), "changed");
        let mut none = bed(Lithology::Tuff, None, &[]);
        assert_eq!(facies_of(&none), None);
        none.facies = Some(FaciesCode::Fm);
        assert_eq!(facies_of(&none), Some((FaciesCode::Fm, false)));
    }

    #[test]
    fn the_documentation_prints_this_table() {
        let doc = include_str!("../../../docs/facies.md");
        let table = table_markdown();
        assert!(
            doc.contains(&table),
            "docs/facies.md must hold the table as table_markdown() prints it:\n{table}"
        );
        // And every code of the scheme is explained there.
        for c in FaciesCode::ALL {
            assert!(doc.contains(&format!("| {} | {} |", c.code(), c.meaning())), "docs/facies.md lacks {c}");
        }
    }
}
