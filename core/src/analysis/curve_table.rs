//! Curves from plain tables, as hand-held gamma-ray spectrometers and other field instruments
//! export them (CSV or TXT: a height or depth column, then K, U, Th, total counts …). The table
//! is read with the importer's text sniffing (delimiter, decimal mark, encoding) and turned into
//! the same [`LasFile`] a LAS reader gives, so placing a curve on section heights is one path.

use super::las::{HeaderItem, LasError, LasFile};
use crate::io::import::text::{read_text_table, TextOptions};
use crate::io::import::values::number;
use crate::io::import::Cell;
use crate::model::METRES_PER_FOOT;

/// Index headers (folded: lower case, unit in brackets removed) that name a height or depth.
const INDEX_HEADERS: [&str; 14] = [
    "height",
    "depth",
    "dept",
    "h",
    "z",
    "md",
    "position",
    "pos",
    "elevation",
    "level",
    "distance",
    "metre",
    "meter",
    "m",
];

/// Split `Height (m)` into its name and unit.
fn name_and_unit(header: &str) -> (String, String) {
    let h = header.trim().trim_start_matches('\u{feff}');
    for (open, close) in [('(', ')'), ('[', ']')] {
        if let (Some(a), Some(b)) = (h.find(open), h.rfind(close)) {
            if a < b {
                return (format!("{}{}", h[..a].trim(), h[b + 1..].trim()), h[a + 1..b].trim().to_string());
            }
        }
    }
    // `depth_ft`, `height m`.
    for sep in ['_', ' '] {
        if let Some((name, unit)) = h.rsplit_once(sep) {
            if ["m", "cm", "ft"].contains(&unit.to_ascii_lowercase().as_str()) && !name.trim().is_empty() {
                return (name.trim().to_string(), unit.to_string());
            }
        }
    }
    (h.to_string(), String::new())
}

/// Metres per unit of an index column's unit (metres when none is given).
fn metres_per(unit: &str) -> Option<f64> {
    match unit.to_ascii_lowercase().as_str() {
        "" | "m" | "metres" | "meters" => Some(1.0),
        "cm" => Some(0.01),
        "ft" | "feet" | "f" => Some(METRES_PER_FOOT),
        _ => None,
    }
}

/// Read a curve table. `index_column` names the height/depth column (by header, case-
/// insensitive); without it the first column whose header reads as a height or depth is taken,
/// else the first column. Empty cells and `NaN`, `-`, `n/a` are missing readings; any other
/// text is refused naming line and column.
pub fn read_curve_table(
    bytes: &[u8],
    path: &str,
    options: &TextOptions,
    index_column: Option<&str>,
) -> Result<LasFile, LasError> {
    let syntax = |line: usize, message: String| LasError::Syntax { path: path.to_string(), line, message };
    let missing = |message: String| LasError::Missing { path: path.to_string(), message };
    let (table, sniffed) =
        read_text_table(bytes, options).map_err(|p| syntax(p.line.unwrap_or(1), p.to_string()))?;
    let Some(header_row) = table.rows.first() else {
        return Err(missing("the table is empty; expected a header row (e.g. Height (m), K, U, Th)".into()));
    };
    let headers: Vec<String> = header_row.cells.iter().map(Cell::text).collect();
    if headers.len() < 2 {
        return Err(syntax(
            header_row.line,
            format!(
                "found {} column(s) in the header; expected a height or depth column and at least one curve",
                headers.len()
            ),
        ));
    }
    if headers.iter().all(|h| number(h, sniffed.decimal).is_ok()) {
        return Err(syntax(
            header_row.line,
            "the first row holds numbers; expected a header row naming the columns".into(),
        ));
    }
    let folded: Vec<(String, String)> = headers.iter().map(|h| name_and_unit(h)).collect();
    let index = match index_column {
        Some(want) => headers
            .iter()
            .zip(&folded)
            .position(|(h, (n, _))| {
                h.eq_ignore_ascii_case(want.trim()) || n.eq_ignore_ascii_case(want.trim())
            })
            .ok_or_else(|| missing(format!("no column {want:?}; the header has {}", headers.join(", "))))?,
        None => {
            folded.iter().position(|(n, _)| INDEX_HEADERS.contains(&n.to_lowercase().as_str())).unwrap_or(0)
        }
    };
    let (index_name, index_unit) = folded[index].clone();
    let factor = metres_per(&index_unit).ok_or_else(|| {
        syntax(
            header_row.line,
            format!("index column {:?} has unit {index_unit:?}; expected m, cm or ft", headers[index]),
        )
    })?;
    let item = |k: usize| HeaderItem {
        mnemonic: folded[k].0.clone(),
        unit: folded[k].1.clone(),
        value: String::new(),
        description: headers[k].clone(),
        line: header_row.line,
    };
    let mut curve_items = vec![item(index)];
    let others: Vec<usize> = (0..headers.len()).filter(|&k| k != index).collect();
    curve_items.extend(others.iter().map(|&k| item(k)));
    let mut index_m = Vec::new();
    let mut values: Vec<Vec<Option<f64>>> = vec![Vec::new(); others.len()];
    for row in &table.rows[1..] {
        let cell = |k: usize| row.cells.get(k).map(Cell::text).unwrap_or_default();
        let read = |k: usize| -> Result<Option<f64>, LasError> {
            let text = cell(k);
            let t = text.to_ascii_lowercase();
            if t.is_empty() || ["nan", "-", "n/a", "na", "null", "--"].contains(&t.as_str()) {
                return Ok(None);
            }
            number(&text, sniffed.decimal)
                .map(Some)
                .map_err(|e| syntax(row.line, format!("column {:?}: {e}", headers[k])))
        };
        let Some(h) = read(index)? else {
            return Err(syntax(
                row.line,
                format!("column {:?}: a height or depth is required", headers[index]),
            ));
        };
        index_m.push(h * factor);
        for (slot, &k) in values.iter_mut().zip(&others) {
            slot.push(read(k)?);
        }
        if index_m.len() > crate::io::MAX_CURVE_SAMPLES {
            return Err(syntax(
                row.line,
                format!(
                    "more than {} rows; at most that many samples per curve",
                    crate::io::MAX_CURVE_SAMPLES
                ),
            ));
        }
    }
    if index_m.is_empty() {
        return Err(missing("the table has a header but no rows of readings".into()));
    }
    let mut warnings = Vec::new();
    if index_name.eq_ignore_ascii_case("depth") || index_name.eq_ignore_ascii_case("dept") {
        warnings.push(format!(
            "{path}: the index column is {:?}; if it increases downward, place the curve with depth down",
            headers[index]
        ));
    }
    Ok(LasFile {
        version: format!("table ({})", sniffed.describe()),
        wrapped: false,
        well: Vec::new(),
        curve_items,
        parameters: Vec::new(),
        other: String::new(),
        null_value: None,
        index_unit: if index_unit.is_empty() { "m".into() } else { index_unit },
        index_m,
        values,
        warnings,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_spectrometer_export_with_decimal_commas() {
        let text = "Height (m);K (%);U (ppm);Th (ppm)\n0,0;1,2;2,5;9,8\n0,5;1,4;;10,1\n1,0;NaN;2,7;11,0\n";
        let f = read_curve_table(text.as_bytes(), "gr.csv", &TextOptions::default(), None).expect("reads");
        assert_eq!(f.curve_mnemonics(), vec!["K", "U", "Th"]);
        assert_eq!(f.index_m, vec![0.0, 0.5, 1.0]);
        assert_eq!(f.values[0], vec![Some(1.2), Some(1.4), None]);
        assert_eq!(f.values[1], vec![Some(2.5), None, Some(2.7)]);
        assert_eq!(f.curve_items[1].unit, "%");
    }

    #[test]
    fn bad_cells_name_line_and_column() {
        let text = "depth_ft,K\n1,2\n2,lots\n";
        let e = read_curve_table(text.as_bytes(), "k.csv", &TextOptions::default(), None).expect_err("bad");
        assert!(e.to_string().contains("k.csv, line 3: column \"K\""), "{e}");
        let e = read_curve_table(b"Time (s),K\n1,2\n", "t.csv", &TextOptions::default(), Some("Time"))
            .expect_err("unit");
        assert!(e.to_string().contains("expected m, cm or ft"), "{e}");
    }
}
