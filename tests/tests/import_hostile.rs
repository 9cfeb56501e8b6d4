//! Hostile files at the import door, generated at run time (nothing huge is committed): a zip
//! bomb posing as .xlsx, a sheet of a million empty rows (.xlsx and .ods), an .ods whose
//! repeated cells would expand to billions, a cell at the far corner of a sheet, a 1 GB CSV, a
//! CSV of too many rows and arbitrary bytes. Each is refused with a message naming the file (or
//! read) within the documented limits, never a panic or an exhausted machine.

use crate::support::sheets;

use aggrade_core::io::import::{import_bytes, import_file, ImportOptions};
use aggrade_core::io::MAX_BEDS_PER_SECTION;
use proptest::prelude::*;
use sheets::V;
use std::io::Write;

fn refused(bytes: &[u8], name: &str) -> String {
    match import_bytes(bytes, name, &ImportOptions::default()) {
        Ok(i) => panic!("{name} must be refused, read {} beds", i.section.beds.len()),
        Err(e) => {
            let e = e.to_string();
            assert!(e.starts_with(name), "the message names the file: {e}");
            e
        }
    }
}

fn table_head() -> Vec<Vec<V>> {
    vec![
        vec![V::S("Thickness (m)"), V::S("Lithology"), V::S("Grain")],
        vec![V::N(1.5), V::S("sandstone"), V::S("fs")],
    ]
}

#[test]
fn a_zip_bomb_posing_as_xlsx_is_refused_while_unpacking() {
    // 300 MiB of zeros deflate (fast setting) to about 3 MB.
    let size: u32 = 300 * 1024 * 1024;
    let mut enc = flate2::write::DeflateEncoder::new(Vec::new(), flate2::Compression::fast());
    let chunk = vec![0u8; 1 << 20];
    let mut crc = flate2::Crc::new();
    for _ in 0..(size >> 20) {
        enc.write_all(&chunk).expect("deflate");
        crc.update(&chunk);
    }
    let packed = enc.finish().expect("deflate");
    assert!(packed.len() < 8_000_000, "the bomb is small on disk: {}", packed.len());
    let mut members: Vec<(String, Vec<u8>, u16, u32, u32)> = sheets::xlsx_parts("Log", &table_head(), 0, &[])
        .into_iter()
        .map(|(n, d)| (n.to_string(), d.clone(), 0, sheets::crc32(&d), d.len() as u32))
        .collect();
    members.push(("xl/worksheets/padding.xml".into(), packed, 8, crc.sum(), size));
    let e = refused(&sheets::zip_raw(members), "bomb.xlsx");
    assert!(e.contains("unpacks to more than 256 MiB (a zip bomb?)"), "{e}");
}

#[test]
fn a_million_empty_rows_are_skipped_in_xlsx() {
    // A table, a million rows with no cells, and one more bed below them.
    let tail = vec![vec![V::N(2.0), V::S("mdst"), V::S("si")]];
    let book = sheets::zip(&sheets::xlsx_parts("Log", &table_head(), 1_000_000, &tail));
    let got = import_bytes(&book, "empty.xlsx", &ImportOptions::default()).expect("reads");
    assert_eq!(got.section.beds.len(), 2);
    // The bed below the empty rows keeps its own row number in messages.
    let bad_tail = vec![vec![V::N(-2.0), V::S("mdst"), V::S("si")]];
    let book = sheets::zip(&sheets::xlsx_parts("Log", &table_head(), 1_000_000, &bad_tail));
    let e = refused(&book, "empty_bad.xlsx");
    assert!(e.contains("cell A1000003 (column \"Thickness (m)\"): must be > 0"), "{e}");
}

#[test]
fn a_million_repeated_empty_rows_are_skipped_in_ods() {
    let tail = vec![vec![V::N(2.0), V::S("mdst"), V::S("si")]];
    let book = sheets::ods_from_content(sheets::ods_content("Log", &table_head(), 1_048_000, &tail));
    let got = import_bytes(&book, "empty.ods", &ImportOptions::default()).expect("reads");
    assert_eq!(got.section.beds.len(), 2);
}

#[test]
fn repeated_cells_that_would_expand_to_billions_are_refused() {
    let content = sheets::ods_content("Log", &table_head(), 0, &[]).replace(
        "</table:table>",
        "<table:table-row table:number-rows-repeated=\"1000000\"><table:table-cell table:number-columns-repeated=\"16384\" \
         office:value-type=\"float\" office:value=\"1\"><text:p>1</text:p></table:table-cell></table:table-row></table:table>",
    );
    let e = refused(&sheets::ods_from_content(content), "repeats.ods");
    assert!(e.contains("expands to more than 4000000 filled cells"), "{e}");
}

#[test]
fn a_cell_at_the_far_corner_of_a_sheet_is_refused() {
    let mut parts = sheets::xlsx_parts("Log", &table_head(), 0, &[]);
    let sheet = parts.iter_mut().find(|(n, _)| *n == "xl/worksheets/sheet1.xml").expect("sheet part");
    let xml = String::from_utf8(sheet.1.clone())
        .expect("utf-8")
        .replace("</sheetData>", "<row r=\"1048576\"><c r=\"XFD1048576\"><v>1</v></c></row></sheetData>");
    sheet.1 = xml.into_bytes();
    let e = refused(&sheets::zip(&parts), "corner.xlsx");
    assert!(e.contains("cell XFD1048576: more than 1000 columns are not read"), "{e}");
}

#[test]
fn a_1_gb_csv_is_refused_before_reading() {
    let dir = tempfile::tempdir().expect("temp dir");
    let path = dir.path().join("huge.csv");
    let file = std::fs::File::create(&path).expect("create");
    // A sparse file: 1 GiB long, no disk used.
    file.set_len(1 << 30).expect("set length");
    let e = import_file(&path, &ImportOptions::default()).expect_err("refused").to_string();
    assert!(
        e.contains("huge.csv") && e.contains("the file is 1073741824 bytes; at most 33554432 bytes are read"),
        "{e}"
    );
}

#[test]
fn a_csv_of_too_many_rows_is_refused() {
    let mut text = String::from("thickness,lithology,grain\n");
    for _ in 0..MAX_BEDS_PER_SECTION + 25 {
        text.push_str("1,sst,fs\n");
    }
    let e = refused(text.as_bytes(), "rows.csv");
    assert!(e.contains(&format!("more than {MAX_BEDS_PER_SECTION} rows")), "{e}");
}

proptest! {
    /// Any bytes as a text table or a workbook: a result or an error, never a panic.
    #[test]
    fn arbitrary_bytes_never_panic(bytes in prop::collection::vec(any::<u8>(), 0..400), ext in prop::sample::select(vec!["csv", "txt", "xlsx", "ods"])) {
        let _ = import_bytes(&bytes, &format!("fuzz.{ext}"), &ImportOptions::default());
    }

    /// Text that looks like a table, with random cells: never a panic.
    #[test]
    fn table_like_text_never_panics(cells in prop::collection::vec("[ -~]{0,8}", 0..40), delim in prop::sample::select(vec![",", ";", "\t", " "])) {
        let mut text = String::from("Thickness (m);Lithology;Grain size;From;To\n").replace(';', delim);
        for row in cells.chunks(5) {
            text.push_str(&row.join(delim));
            text.push('\n');
        }
        let _ = import_bytes(text.as_bytes(), "fuzz.csv", &ImportOptions::default());
    }
}
