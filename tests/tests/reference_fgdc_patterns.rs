//! The lithology pattern numbers against the standard they cite: FGDC-STD-013-2006, "FGDC
//! Digital Cartographic Standard for Geologic Map Symbolization" (Federal Geographic Data
//! Committee, prepared by the U.S. Geological Survey, 2006; USGS Techniques and Methods 11-A2),
//! section 37 "Lithologic patterns". The names below are the standard's own pattern names for
//! the numbers used, as its section 37 chart lists them.

use aggrade_core::model::Lithology;

/// Pattern numbers of FGDC-STD-013-2006 section 37 with the standard's names (the ones Aggrade
/// uses and their neighbours that are easy to confuse with them).
const SECTION_37: &[(u16, &str)] = &[
    (601, "Gravel or conglomerate (1st option)"),
    (605, "Breccia (1st option)"),
    (607, "Massive sand or sandstone"),
    (616, "Silt, siltstone, or shaly silt"),
    (620, "Clay or clay shale"),
    (623, "Calcareous shale or marl"),
    (627, "Limestone"),
    (642, "Dolostone or dolomite"),
    (658, "Coal"),
    (667, "Gypsum"),
    (711, "Tuffaceous rock"),
    (712, "Crystal tuff"),
    (713, "Devitrified tuff"),
    (717, "Basaltic flows"),
];

/// Words one of which the standard's name for a lithology's pattern must contain.
fn expected_words(lithology: Lithology) -> &'static [&'static str] {
    match lithology {
        Lithology::Claystone | Lithology::Mudstone | Lithology::Shale => &["clay"],
        Lithology::Siltstone => &["siltstone"],
        Lithology::Sandstone => &["sandstone"],
        Lithology::Conglomerate => &["conglomerate"],
        Lithology::Breccia => &["breccia"],
        Lithology::Limestone => &["limestone"],
        Lithology::Dolostone => &["dolostone"],
        Lithology::Marl => &["marl"],
        Lithology::Coal => &["coal"],
        // Gypsum is the evaporite pattern the standard has (668 is salt).
        Lithology::Evaporite => &["gypsum", "salt"],
        Lithology::Tuff => &["tuff"],
        Lithology::Covered => &[],
    }
}

#[test]
fn every_lithology_pattern_number_names_that_rock_in_the_standard() {
    let mut checked = 0;
    for lithology in Lithology::ALL {
        let Some(number) = lithology.fgdc_pattern() else {
            assert_eq!(lithology, Lithology::Covered, "only covered intervals go without a pattern");
            continue;
        };
        let name = SECTION_37
            .iter()
            .find(|(n, _)| *n == number)
            .map(|(_, name)| name.to_lowercase())
            .unwrap_or_else(|| panic!("{lithology}: pattern {number} is not in the table of section 37"));
        assert!(
            expected_words(lithology).iter().any(|w| name.contains(w)),
            "{lithology}: FGDC pattern {number} is \"{name}\" in the standard"
        );
        checked += 1;
    }
    assert!(checked >= 12, "only {checked} lithologies checked");
}

#[test]
fn tuff_uses_a_tuff_pattern_not_the_basaltic_flows_one() {
    let number = Lithology::Tuff.fgdc_pattern().expect("tuff has a pattern");
    assert!(
        (711..=713).contains(&number),
        "tuff uses FGDC {number}; the standard's tuff patterns are 711–713"
    );
    assert_ne!(number, 717, "717 is basaltic flows in FGDC-STD-013-2006");
}
