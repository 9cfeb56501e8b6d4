//! The forgiving import end to end in the library: a spreadsheet export from a European machine,
//! workbooks (.xlsx, .ods) written by the test, heights instead of thicknesses, a log written
//! from the top, and the bed table's own output read back through the importer. Values are
//! checked against published conversions (named beside each check).

use crate::support::sheets;

use aggrade_core::io::import::{import_bytes, ImportOptions};
use aggrade_core::io::write_bed_table;
use aggrade_core::model::{GrainSize, LengthUnit, Lithology, WentworthClass};
use sheets::V;

fn import(
    bytes: &[u8],
    name: &str,
    options: &ImportOptions,
) -> Result<aggrade_core::io::import::Imported, String> {
    import_bytes(bytes, name, options).map_err(|e| e.to_string())
}

#[test]
fn a_european_spreadsheet_export_is_read() {
    // Semicolons, decimal commas, a byte-order mark and CR LF, as a spreadsheet on a machine with
    // a German or French locale saves "CSV"; headers and abbreviations as a field notebook has them.
    let text = "\u{feff}Bed;Thickness (cm);Rock type;Grain size base;Grain size top;Contact;Notes\r\n\
1;120;Sst;cs;fs;erosive;Rinne, 2 Sets\r\n\
2;45,5;mdst;si;cl;;Wurzeln\r\n\
3;80;cgl;pbl;gran;eros;\r\n";
    let got = import(text.as_bytes(), "Ostwand 2026.csv", &ImportOptions::default()).expect("imports");
    assert!(
        got.format.describe().contains("UTF-8 with byte-order mark, delimiter ';', decimal comma"),
        "{}",
        got.format.describe()
    );
    let s = &got.section;
    assert_eq!(s.name, "Ostwand 2026");
    assert_eq!(s.display_unit, LengthUnit::Centimetre);
    assert_eq!(s.beds.len(), 3);
    assert!((s.beds[1].thickness_m - 0.455).abs() < 1e-12, "45,5 cm");
    assert_eq!(s.beds[0].lithology, Lithology::Sandstone);
    assert_eq!(s.beds[0].grain_base, Some(GrainSize::Class(WentworthClass::CoarseSand)));
    assert_eq!(s.beds[0].grain_top, Some(GrainSize::Class(WentworthClass::FineSand)));
    assert_eq!(s.beds[2].grain_base, Some(GrainSize::Class(WentworthClass::Pebble)));
    assert_eq!(s.beds[0].notes, "Rinne, 2 Sets");
    let described = got.mapping.describe();
    assert!(
        described.contains("\"Thickness (cm)\" → thickness (in cm)")
            && described.contains("not read: \"Bed\""),
        "{described}"
    );
}

#[test]
fn grain_sizes_in_mm_become_krumbein_phi() {
    // Krumbein (1934): φ = −log2(d / 1 mm); 0.3 mm → 1.7370, 0.18 mm → 2.4739 (computed values).
    let text = "thickness_m,lithology,Grain size (mm)\n1,sandstone,\"0.3\"\n2,sandstone,0.18\n";
    let s = import(text.as_bytes(), "mm.csv", &ImportOptions::default()).expect("imports").section;
    let phi = |i: usize| s.beds[i].grain_base.map(GrainSize::phi).unwrap_or(f64::NAN);
    assert!((phi(0) - 1.7370).abs() < 5e-5, "{}", phi(0));
    assert!((phi(1) - 2.4739).abs() < 5e-5, "{}", phi(1));
}

#[test]
fn the_bed_tables_own_output_reads_back_through_the_importer() {
    let project = aggrade_core::io::load(
        &std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("data/analysis/kestrel_bluff.aggrade"),
    )
    .expect("fixture")
    .project;
    let section = &project.sections[0];
    let csv = write_bed_table(section);
    let got = import(csv.as_bytes(), "kestrel.csv", &ImportOptions::default()).expect("imports");
    assert_eq!(got.section.beds.len(), section.beds.len());
    for (a, b) in section.beds.iter().zip(&got.section.beds) {
        assert!((a.thickness_m - b.thickness_m).abs() < 1e-12);
        assert_eq!(
            (a.lithology, a.grain_base, a.grain_top, a.base_contact),
            (b.lithology, b.grain_base, b.grain_top, b.base_contact)
        );
        assert_eq!((&a.structures, &a.notes, &a.samples), (&b.structures, &b.notes, &b.samples));
    }
}

fn log_rows() -> Vec<Vec<V>> {
    vec![
        vec![V::S("From (m)"), V::S("To (m)"), V::S("Lithology"), V::S("Grain size")],
        vec![V::N(0.0), V::N(1.2), V::S("mudstone"), V::S("si")],
        vec![V::N(1.2), V::N(3.0), V::S("sst"), V::S("vc → m")],
        vec![V::N(3.0), V::N(3.45), V::S("slst"), V::S("silt")],
    ]
}

#[test]
fn xlsx_and_ods_workbooks_with_heights() {
    for (name, bytes) in
        [("log.xlsx", sheets::xlsx("Log", &log_rows())), ("log.ods", sheets::ods("Log", &log_rows()))]
    {
        let got = import(&bytes, name, &ImportOptions::default()).unwrap_or_else(|e| panic!("{name}: {e}"));
        let s = &got.section;
        assert_eq!(s.beds.len(), 3, "{name}");
        assert_eq!(s.beds[1].thickness_m, 1.8, "{name}: 3.0 − 1.2, rounded to the written decimals");
        assert_eq!(s.beds[2].thickness_m, 0.45, "{name}");
        assert_eq!(s.beds[1].grain_base, Some(GrainSize::Class(WentworthClass::VeryCoarseSand)));
        assert_eq!(s.beds[1].grain_top, Some(GrainSize::Class(WentworthClass::MediumSand)));
        // A log written from the top: the same rows as depths, the deepest bed first.
        let top =
            import(&bytes, name, &ImportOptions { top_first: true, ..Default::default() }).expect("imports");
        assert_eq!(top.section.beds[0].lithology, Lithology::Siltstone, "{name}");
    }
}

#[test]
fn workbook_problems_name_sheet_cell_and_column() {
    let mut rows = log_rows();
    rows[2][2] = V::S("granite");
    rows[3][1] = V::S("3,45");
    let e = import(&sheets::xlsx("Log", &rows), "bad.xlsx", &ImportOptions::default()).expect_err("refused");
    assert!(e.starts_with("bad.xlsx: 2 problems"), "{e}");
    assert!(
        e.contains("sheet \"Log\", cell C3 (column \"Lithology\"): \"granite\" is not a known lithology"),
        "{e}"
    );
    assert!(e.contains("sheet \"Log\", cell B4 (column \"To (m)\")"), "{e}");
    let e = import(
        &sheets::xlsx("Log", &log_rows()),
        "x.xlsx",
        &ImportOptions { sheet: Some("Beds".into()), ..Default::default() },
    )
    .expect_err("no such sheet");
    assert!(e.contains("no sheet named \"Beds\"; the workbook has \"Log\""), "{e}");
}

#[test]
fn an_impossible_mapping_lists_the_headers_found() {
    let e = import(b"Dicke;Gestein;Korngroesse\n1;sst;fs\n", "de.csv", &ImportOptions::default())
        .expect_err("refused");
    assert!(e.contains("no thickness column") && e.contains("no lithology column"), "{e}");
    assert!(e.contains("Headers found: \"Dicke\", \"Gestein\", \"Korngroesse\""), "{e}");
}
