//! Fuzz target: LAS 2.0 text → reader, then every curve placed on section heights and averaged
//! over a small section. Never panics.
#![no_main]

use aggrade_core::analysis::las::{bed_means, parse_las, IndexDirection, IndexToSection};
use aggrade_core::model::{Bed, BedId, Lithology, Section};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let Ok(las) = parse_las(text, "fuzz.las") else { return };
    let _ = las.well_item("WELL");
    let mut section = Section::new("fuzz");
    section.beds = (1..=3).map(|i| Bed::new(BedId(i), 1.0, Lithology::Mudstone, None)).collect();
    for direction in [IndexDirection::DepthBelowDatum, IndexDirection::HeightAboveDatum] {
        let zero_m = las.index_m.first().copied().unwrap_or(0.0);
        for curve in las.curves(&IndexToSection { direction, zero_m }) {
            let _ = bed_means(&curve, &section);
        }
    }
});
