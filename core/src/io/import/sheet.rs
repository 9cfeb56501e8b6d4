//! Workbooks (`.xlsx`, `.ods`) read through the `calamine` crate, with the bounds a hostile file
//! needs first: the archive's members are unpacked once with a cap on the bytes they may give
//! (a zip bomb stops there), an `.ods` sheet's repeated rows and columns are counted before
//! they are expanded, and an `.xlsx` sheet is read cell by cell, never as a rectangle spanning
//! its farthest cell.

use super::{Cell, Row, Table};
use crate::io::limits::{MAX_BEDS_PER_SECTION, MAX_STRING_CHARS};
use calamine::{Data, Reader};
use std::io::{Cursor, Read};

/// Most bytes a workbook's members may unpack to, all together (256 MiB: a 100,000-row sheet
/// of 20 columns is about 60 MB of XML).
pub const MAX_UNPACKED_BYTES: u64 = 256 * 1024 * 1024;

/// Most members in a workbook archive.
pub const MAX_ARCHIVE_MEMBERS: usize = 10_000;

/// Most non-empty cells a sheet may expand to (rows × columns after repeats).
pub const MAX_SHEET_CELLS: u64 = 4_000_000;

/// Most columns read from a sheet.
pub const MAX_SHEET_COLUMNS: u32 = 1_000;

/// Workbook formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum WorkbookKind {
    Xlsx,
    Ods,
}

/// Spreadsheet column letters of a 0-based column (0 → A, 26 → AA).
pub fn column_letters(col: u32) -> String {
    let mut n = col as u64 + 1;
    let mut out = Vec::new();
    while n > 0 {
        let r = ((n - 1) % 26) as u8;
        out.push(b'A' + r);
        n = (n - 1) / 26;
    }
    out.reverse();
    String::from_utf8(out).unwrap_or_default()
}

/// Unpack every member once, counting bytes, so that a zip bomb is refused before a reader
/// inflates it for real. Returns the number of bytes unpacked.
fn check_archive(bytes: &[u8]) -> Result<u64, String> {
    let mut zip = zip::ZipArchive::new(Cursor::new(bytes))
        .map_err(|e| format!("not a workbook: the file is not a readable zip archive ({e})"))?;
    if zip.len() > MAX_ARCHIVE_MEMBERS {
        return Err(format!(
            "the archive holds {} members; at most {MAX_ARCHIVE_MEMBERS} are read",
            zip.len()
        ));
    }
    let mut total = 0u64;
    let mut buf = vec![0u8; 64 * 1024];
    for i in 0..zip.len() {
        let mut member = zip.by_index(i).map_err(|e| format!("damaged archive member {i}: {e}"))?;
        loop {
            let n = member.read(&mut buf).map_err(|e| format!("damaged archive member {i}: {e}"))?;
            if n == 0 {
                break;
            }
            total += n as u64;
            if total > MAX_UNPACKED_BYTES {
                return Err(format!(
                    "the workbook unpacks to more than {} MiB (a zip bomb?); refused",
                    MAX_UNPACKED_BYTES / (1024 * 1024)
                ));
            }
        }
    }
    Ok(total)
}

/// Count the non-empty cells an `.ods` sheet expands to (repeats multiplied out), refusing more
/// than [`MAX_SHEET_CELLS`] before calamine builds them.
fn check_ods_repeats(bytes: &[u8]) -> Result<(), String> {
    use quick_xml::events::Event;
    let mut zip =
        zip::ZipArchive::new(Cursor::new(bytes)).map_err(|e| format!("not a readable zip archive ({e})"))?;
    let mut content = Vec::new();
    zip.by_name("content.xml")
        .map_err(|_| "not an OpenDocument spreadsheet: no content.xml".to_string())?
        .take(MAX_UNPACKED_BYTES)
        .read_to_end(&mut content)
        .map_err(|e| format!("damaged content.xml: {e}"))?;
    let mut reader = quick_xml::Reader::from_reader(content.as_slice());
    let mut buf = Vec::new();
    let repeat = |e: &quick_xml::events::BytesStart, name: &str| -> u64 {
        e.attributes()
            .flatten()
            .find(|a| a.key.0 == name)
            .and_then(|a| a.value.trim().parse::<u64>().ok())
            .unwrap_or(1)
    };
    let mut total = 0u64;
    let mut row_repeat = 1u64;
    let mut row_cells = 0u64;
    loop {
        match reader.read_event_into(&mut buf) {
            Ok(Event::Start(e)) if e.name().0 == "table:table-row" => {
                row_repeat = repeat(&e, "table:number-rows-repeated");
                row_cells = 0;
            }
            Ok(Event::Empty(e)) if e.name().0 == "table:table-row" => {}
            Ok(Event::End(e)) if e.name().0 == "table:table-row" => {
                total = total.saturating_add(row_repeat.saturating_mul(row_cells));
                if total > MAX_SHEET_CELLS {
                    return Err(format!(
                        "the sheet expands to more than {MAX_SHEET_CELLS} filled cells (repeated rows or columns); refused"
                    ));
                }
            }
            // A cell with content (an element with children) or a value counts, repeats and all.
            Ok(Event::Start(e)) if e.name().0 == "table:table-cell" => {
                row_cells = row_cells.saturating_add(repeat(&e, "table:number-columns-repeated"));
            }
            Ok(Event::Empty(e)) if e.name().0 == "table:table-cell" => {
                if e.attributes().flatten().any(|a| a.key.0 == "office:value-type") {
                    row_cells = row_cells.saturating_add(repeat(&e, "table:number-columns-repeated"));
                }
            }
            Ok(Event::Eof) => break,
            Err(e) => return Err(format!("damaged content.xml at byte {}: {e}", reader.buffer_position())),
            Ok(_) => {}
        }
        buf.clear();
    }
    Ok(())
}

/// A calamine value as an import cell.
fn cell_of(value: &Data) -> Cell {
    let text = |s: &str| {
        if s.trim().is_empty() {
            Cell::Empty
        } else if s.chars().count() > MAX_STRING_CHARS {
            Cell::Bad(format!("text of more than {MAX_STRING_CHARS} characters"))
        } else {
            Cell::Text(s.to_string())
        }
    };
    match value {
        Data::Empty => Cell::Empty,
        Data::Int(i) => Cell::Number(*i as f64),
        Data::Float(f) if f.is_finite() => Cell::Number(*f),
        Data::Float(_) => Cell::Bad("not a finite number".into()),
        Data::String(s) => text(s),
        Data::Bool(b) => Cell::Text(if *b { "TRUE".into() } else { "FALSE".into() }),
        Data::DateTime(_) | Data::DateTimeIso(_) | Data::DurationIso(_) => {
            Cell::Bad("a date or time, not a number or word (format the column as a number or text)".into())
        }
        Data::Error(e) => Cell::Bad(format!("the spreadsheet shows an error ({e})")),
    }
}

/// Put one cell into the rows being gathered (rows keyed by 0-based sheet row).
fn place(
    rows: &mut std::collections::BTreeMap<u32, Vec<Cell>>,
    (r, c): (u32, u32),
    cell: Cell,
) -> Result<(), String> {
    if matches!(cell, Cell::Empty) {
        return Ok(());
    }
    if c >= MAX_SHEET_COLUMNS {
        return Err(format!(
            "cell {}{}: more than {MAX_SHEET_COLUMNS} columns are not read",
            column_letters(c),
            r + 1
        ));
    }
    if !rows.contains_key(&r) && rows.len() >= MAX_BEDS_PER_SECTION + 20 {
        return Err(format!(
            "row {}: more than {MAX_BEDS_PER_SECTION} filled rows; at most {MAX_BEDS_PER_SECTION} beds per section",
            r + 1
        ));
    }
    let row = rows.entry(r).or_default();
    if row.len() <= c as usize {
        row.resize(c as usize + 1, Cell::Empty);
    }
    row[c as usize] = cell;
    Ok(())
}

/// Read one sheet (by name, or the first) of a workbook given as bytes. Errors name the sheet
/// and, where known, the cell.
pub fn read_workbook(bytes: &[u8], kind: WorkbookKind, sheet: Option<&str>) -> Result<Table, String> {
    check_archive(bytes)?;
    let mut rows = std::collections::BTreeMap::new();
    let name = match kind {
        WorkbookKind::Xlsx => {
            let mut book = calamine::Xlsx::new(Cursor::new(bytes))
                .map_err(|e| format!("not a readable .xlsx workbook: {e}"))?;
            let name = pick_sheet(&book.sheet_names(), sheet)?;
            let mut cells = book.worksheet_cells_reader(&name).map_err(|e| format!("sheet {name:?}: {e}"))?;
            loop {
                match cells.next_cell() {
                    Ok(Some(cell)) => {
                        place(&mut rows, cell.get_position(), cell_of(&Data::from(cell.get_value().clone())))
                            .map_err(|e| format!("sheet {name:?}, {e}"))?;
                    }
                    Ok(None) => break,
                    Err(e) => return Err(format!("sheet {name:?}: unreadable ({e})")),
                }
            }
            name
        }
        WorkbookKind::Ods => {
            check_ods_repeats(bytes)?;
            let mut book = calamine::Ods::new(Cursor::new(bytes))
                .map_err(|e| format!("not a readable .ods workbook: {e}"))?;
            let name = pick_sheet(&book.sheet_names(), sheet)?;
            let range = book.worksheet_range(&name).map_err(|e| format!("sheet {name:?}: {e}"))?;
            let (r0, c0) = range.start().unwrap_or((0, 0));
            for (r, c, value) in range.used_cells() {
                place(&mut rows, (r0 + r as u32, c0 + c as u32), cell_of(value))
                    .map_err(|e| format!("sheet {name:?}, {e}"))?;
            }
            name
        }
    };
    Ok(Table {
        sheet: Some(name),
        rows: rows.into_iter().map(|(r, cells)| Row { line: r as usize + 1, cells }).collect(),
    })
}

/// The sheet asked for, or the first; an unknown name lists the sheets.
fn pick_sheet(names: &[String], wanted: Option<&str>) -> Result<String, String> {
    match wanted {
        Some(w) => names.iter().find(|n| n.eq_ignore_ascii_case(w)).cloned().ok_or_else(|| {
            format!("no sheet named {w:?}; the workbook has {}", super::mapping::quoted(names))
        }),
        None => names.first().cloned().ok_or_else(|| "the workbook has no sheets".to_string()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn column_letters_run_like_a_spreadsheet() {
        assert_eq!(column_letters(0), "A");
        assert_eq!(column_letters(25), "Z");
        assert_eq!(column_letters(26), "AA");
        assert_eq!(column_letters(701), "ZZ");
        assert_eq!(column_letters(702), "AAA");
    }

    #[test]
    fn not_a_zip_is_refused() {
        let e = read_workbook(b"thickness,lithology\n", WorkbookKind::Xlsx, None).expect_err("not a zip");
        assert!(e.contains("not a workbook"), "{e}");
    }
}
