//! Rows and a mapping into a section: each cell is read by its field into the bed table's own
//! spelling, heights become thicknesses, a log written from the top is turned over, and the
//! whole is checked by the bed-table reader, whose problems are mapped back to the file's own
//! lines (or cells) and column headers.

use super::mapping::{ColumnMapping, Field};
use super::values::{self, DecimalMark, GrainUnit};
use super::{Cell, Table};
use crate::io::bed_table::{escape_formula, read_bed_table, KNOWN_COLUMNS};
use crate::io::Problem;
use crate::model::{BaseRank, LengthUnit, PaleosolFeature, Section, Structure, SurfaceKind};
use std::collections::HashMap;

/// One cell of the preview: the value as it will be read, or why it would be refused.
#[derive(Debug, Clone, PartialEq)]
pub struct PreviewCell {
    pub shown: String,
    pub refused: Option<String>,
}

/// Columns of the bed table written for the bed-table reader, after the thickness column: its
/// known columns with base/top grain rather than the single `grain`.
fn out_columns() -> Vec<&'static str> {
    KNOWN_COLUMNS.iter().copied().filter(|c| !c.starts_with("thickness_") && *c != "grain").collect()
}

/// Split a list cell on `;` (and `,` where a comma cannot be a decimal mark).
fn list_items(text: &str, commas: bool) -> Vec<&str> {
    text.split(|c| c == ';' || (commas && c == ',')).map(str::trim).filter(|s| !s.is_empty()).collect()
}

fn vocab_list(text: &str, parse: impl Fn(&str) -> bool, valid: &str) -> Result<String, String> {
    let items = list_items(text, true);
    match items.iter().find(|i| !parse(i)) {
        Some(bad) => Err(format!("{bad:?} is not known; valid values are {valid}")),
        None => Ok(items.join(";")),
    }
}

/// A number cell (stored number, or text with the table's decimal mark), with its text as written.
fn number_cell(cell: &Cell, decimal: DecimalMark) -> Result<(f64, String), String> {
    match cell {
        Cell::Number(v) => Ok((*v, format!("{v}"))),
        Cell::Text(t) => values::number(t, decimal).map(|v| (v, t.trim().to_string())),
        Cell::Empty => Err("required: a number".to_string()),
        Cell::Bad(why) => Err(why.clone()),
    }
}

/// A cell read for its field, in the bed table's spelling (grain base and top joined by ` → `).
fn canonical(
    field: Field,
    cell: &Cell,
    decimal: DecimalMark,
    grain_unit: Option<GrainUnit>,
    unit: LengthUnit,
) -> Result<String, String> {
    if let Cell::Bad(why) = cell {
        return Err(why.clone());
    }
    let text = cell.text();
    let blank = text.is_empty()
        || (matches!(field, Field::Grain | Field::GrainBase | Field::GrainTop)
            && (text == "—" || text == "-"));
    match field {
        Field::Thickness => {
            if blank {
                return Err(format!("required: a thickness in {} > 0", unit.name()));
            }
            let (v, _) = number_cell(cell, decimal)?;
            if v > 0.0 {
                Ok(format!("{v}"))
            } else {
                Err(format!("must be > 0, got {text}"))
            }
        }
        Field::From | Field::To => {
            if blank {
                return Err(format!("required: a height in {}", unit.name()));
            }
            number_cell(cell, decimal).map(|(v, _)| format!("{v}"))
        }
        Field::Lithology if blank => Err("required: a lithology".to_string()),
        _ if blank => Ok(String::new()),
        Field::Lithology => values::lithology(&text).map(|l| l.name().to_string()).ok_or_else(|| {
            format!(
                "{text:?} is not a known lithology or abbreviation (see docs/import.md); valid names are {}",
                crate::model::Lithology::ALL.map(|l| l.name()).join(", ")
            )
        }),
        Field::Grain => values::grain_pair(&text, decimal, grain_unit).map(|(a, b)| {
            if a == b {
                String::from(a)
            } else {
                format!("{} → {}", String::from(a), String::from(b))
            }
        }),
        Field::GrainBase | Field::GrainTop => values::grain(&text, decimal, grain_unit).map(String::from),
        Field::BaseContact => values::contact(&text).map(|c| c.name().to_string()).ok_or_else(|| {
            format!("{text:?} is not known; valid values are {}", crate::model::Contact::valid_list())
        }),
        Field::BaseRelief => {
            let (v, _) = number_cell(cell, decimal)?;
            if v >= 0.0 {
                Ok(format!("{v}"))
            } else {
                Err(format!("must be ≥ 0, got {text}"))
            }
        }
        Field::Structures => vocab_list(&text, |i| Structure::parse(i).is_some(), &Structure::valid_list()),
        Field::PaleosolFeatures => {
            vocab_list(&text, |i| PaleosolFeature::parse(i).is_some(), &PaleosolFeature::valid_list())
        }
        Field::Paleosol => values::paleosol(&text).map(|p| p.name().to_string()).ok_or_else(|| {
            format!(
                "{text:?} is not known; valid values are {}",
                crate::model::PaleosolDevelopment::valid_list()
            )
        }),
        Field::CarbonateStage => {
            let roman = ["I", "II", "III", "IV", "V", "VI"];
            let ok = roman.iter().any(|r| r.eq_ignore_ascii_case(&text))
                || text.parse::<u8>().is_ok_and(|s| (1..=6).contains(&s));
            if ok {
                Ok(text)
            } else {
                Err(format!("{text:?} is not a carbonate stage; use 1–6 or I–VI"))
            }
        }
        Field::Paleocurrents => {
            let mut out = Vec::new();
            let commas = decimal == DecimalMark::Point;
            for item in list_items(&text, commas).into_iter().flat_map(str::split_whitespace) {
                let v = values::number(item, decimal)?;
                if !(0.0..=360.0).contains(&v) {
                    return Err(format!("azimuth {item} is outside 0–360 degrees"));
                }
                out.push(format!("{v}"));
            }
            Ok(out.join(";"))
        }
        Field::BaseRank => BaseRank::parse(&text)
            .map(|k| k.name().to_string())
            .ok_or_else(|| format!("{text:?} is not known; valid values are {}", BaseRank::valid_list())),
        Field::SurfaceKind => SurfaceKind::parse(&text)
            .map(|k| k.name().to_string())
            .ok_or_else(|| format!("{text:?} is not known; valid values are {}", SurfaceKind::valid_list())),
        Field::Samples => Ok(list_items(&text, false).join(";")),
        Field::Surface | Field::Colour | Field::Fossils | Field::Notes => Ok(text),
    }
}

/// A cell read for its field, as the preview shows it (thickness with its unit).
pub fn read_cell(
    field: Field,
    cell: &Cell,
    decimal: DecimalMark,
    mapping: &ColumnMapping,
) -> Result<String, String> {
    let unit = mapping.length_unit;
    canonical(field, cell, decimal, mapping.grain_unit, unit).map(|s| match field {
        Field::Thickness | Field::From | Field::To => format!("{s} {}", unit.name()),
        _ => s,
    })
}

/// The first `n` data rows under the header as they will be read, column by column.
pub fn preview(
    table: &Table,
    header_row: usize,
    mapping: &ColumnMapping,
    decimal: DecimalMark,
    n: usize,
) -> Vec<(usize, Vec<PreviewCell>)> {
    table
        .rows
        .iter()
        .skip(header_row + 1)
        .take(n)
        .map(|row| {
            let cells = mapping
                .columns
                .iter()
                .enumerate()
                .map(|(i, col)| {
                    let cell = row.cells.get(i).cloned().unwrap_or(Cell::Empty);
                    match col.field {
                        None => PreviewCell { shown: cell.text(), refused: None },
                        Some(f) => match read_cell(f, &cell, decimal, mapping) {
                            Ok(shown) => PreviewCell { shown, refused: None },
                            Err(why) => PreviewCell { shown: cell.text(), refused: Some(why) },
                        },
                    }
                })
                .collect();
            (row.line, cells)
        })
        .collect()
}

/// Round a difference of two written numbers to the decimals they were written with, so that
/// 3.0 − 1.2 gives 1.8 and not 1.7999999999999998.
fn difference(to: (f64, String), from: (f64, String)) -> f64 {
    let d = values::decimals(&to.1).max(values::decimals(&from.1)).min(12) as i32;
    let scale = 10f64.powi(d);
    ((to.0 - from.0) * scale).round() / scale
}

/// Build a section from the rows under the header. Returns the section and warnings, or every
/// problem found, each naming its line (or sheet cell) and the column's header.
pub fn build_section(
    table: &Table,
    header_row: usize,
    mapping: &ColumnMapping,
    decimal: DecimalMark,
    name: &str,
) -> Result<(Section, Vec<Problem>), Vec<Problem>> {
    let header =
        |i: usize| mapping.columns.get(i).map_or_else(|| format!("column {}", i + 1), |c| c.header.clone());
    let col = |f: Field| mapping.column_of(f);
    let unit = mapping.length_unit;
    let mut problems: Vec<Problem> = Vec::new();
    let mut warnings: Vec<Problem> = Vec::new();
    let use_heights = col(Field::Thickness).is_none();
    if !use_heights && (col(Field::From).is_some() || col(Field::To).is_some()) {
        warnings.push(Problem::new(
            "header",
            "both a thickness and from/to heights are given: the thickness is used",
        ));
    }
    // (original line, thickness text, the other cells in `out_columns` order)
    let out_columns = out_columns();
    let mut rows_out: Vec<(usize, String, Vec<String>)> = Vec::new();
    let mut previous_to: Option<(f64, usize)> = None;
    for row in table.rows.iter().skip(header_row + 1) {
        let cell = |i: usize| row.cells.get(i).cloned().unwrap_or(Cell::Empty);
        let before = problems.len();
        // A field's cell read, or its problem (`None`: the field is not mapped).
        let read = |f: Field| -> Option<Result<String, Problem>> {
            let i = col(f)?;
            Some(
                canonical(f, &cell(i), decimal, mapping.grain_unit, unit)
                    .map_err(|why| table.problem_at(row.line, i, &header(i), why)),
            )
        };
        let keep = |r: Option<Result<String, Problem>>, problems: &mut Vec<Problem>| match r {
            Some(Ok(s)) => Some(s),
            Some(Err(p)) => {
                problems.push(p);
                None
            }
            None => None,
        };
        let thickness = if use_heights {
            let (Some(fi), Some(ti)) = (col(Field::From), col(Field::To)) else {
                return Err(vec![Problem::new("header", "from and to height columns are both needed")]);
            };
            let from =
                keep(read(Field::From), &mut problems).and_then(|_| number_cell(&cell(fi), decimal).ok());
            let to = keep(read(Field::To), &mut problems).and_then(|_| number_cell(&cell(ti), decimal).ok());
            match (from, to) {
                (Some(from), Some(to)) => {
                    if let Some((prev, line)) = previous_to {
                        if (from.0 - prev).abs() > 1e-9 * f64::max(prev.abs(), 1.0) {
                            problems.push(table.problem_at(
                                row.line,
                                fi,
                                &header(fi),
                                format!(
                                    "from {} does not meet the to {prev} of the row above (line {line}): a gap or an \
                                     overlap; add a covered row for a gap",
                                    from.1
                                ),
                            ));
                        }
                    }
                    previous_to = Some((to.0, row.line));
                    let th = difference(to.clone(), from.clone());
                    if th > 0.0 {
                        Some(format!("{th}"))
                    } else {
                        problems.push(table.problem_at(
                            row.line,
                            ti,
                            &header(ti),
                            format!(
                                "to {} must be greater than from {}{}",
                                to.1,
                                from.1,
                                if mapping.top_first {
                                    ""
                                } else {
                                    " (for depths, import with the log read from the top)"
                                }
                            ),
                        ));
                        None
                    }
                }
                _ => {
                    previous_to = None;
                    None
                }
            }
        } else {
            keep(read(Field::Thickness), &mut problems)
        };
        let mut out = vec![String::new(); out_columns.len()];
        let mut put = |name: &str, value: String| {
            if let Some(k) = out_columns.iter().position(|c| *c == name) {
                out[k] = value;
            }
        };
        if let Some(g) = keep(read(Field::Grain), &mut problems) {
            let (a, b) =
                g.split_once(" → ").map_or((g.clone(), g.clone()), |(a, b)| (a.to_string(), b.to_string()));
            put("grain_base", a);
            put("grain_top", b);
        }
        for (f, name) in [
            (Field::Lithology, "lithology"),
            (Field::GrainBase, "grain_base"),
            (Field::GrainTop, "grain_top"),
            (Field::BaseContact, "base_contact"),
            (Field::BaseRelief, "base_relief_m"),
            (Field::BaseRank, "base_rank"),
            (Field::Structures, "structures"),
            (Field::Paleosol, "paleosol"),
            (Field::PaleosolFeatures, "paleosol_features"),
            (Field::CarbonateStage, "carbonate_stage"),
            (Field::Paleocurrents, "paleocurrents"),
            (Field::Surface, "surface"),
            (Field::SurfaceKind, "surface_kind"),
            (Field::Colour, "colour"),
            (Field::Fossils, "fossils"),
            (Field::Samples, "samples"),
            (Field::Notes, "notes"),
        ] {
            if let Some(v) = keep(read(f), &mut problems) {
                put(name, v);
            }
        }
        if problems.len() > before {
            continue;
        }
        if let Some(t) = thickness {
            rows_out.push((row.line, t, out));
        }
    }
    if mapping.top_first {
        rows_out.reverse();
    }
    // The bed table, written for its own reader; each record's first line is remembered so its
    // problems can be put back on the file's lines.
    let thickness_column = match unit {
        LengthUnit::Metre => "thickness_m",
        LengthUnit::Centimetre => "thickness_cm",
        LengthUnit::Foot => "thickness_ft",
    };
    let mut origin: HashMap<usize, usize> = HashMap::new();
    let mut line = 1usize;
    let csv_text = {
        let mut w = csv::WriterBuilder::new().terminator(csv::Terminator::Any(b'\n')).from_writer(Vec::new());
        let head: Vec<&str> = std::iter::once(thickness_column).chain(out_columns.iter().copied()).collect();
        let mut wrote = w.write_record(&head);
        for (orig, t, cells) in &rows_out {
            let escaped: Vec<String> = cells
                .iter()
                .zip(&out_columns)
                .map(|(c, name)| {
                    // Free text is escaped as the bed table writes it, so the reader's unescaping
                    // gives it back unchanged.
                    if matches!(*name, "surface" | "colour" | "fossils" | "samples" | "notes") {
                        escape_formula(c)
                    } else {
                        c.clone()
                    }
                })
                .collect();
            wrote = wrote.and(w.write_record(std::iter::once(t).chain(escaped.iter())));
            line += 1;
            origin.insert(line, *orig);
            line += cells.iter().map(|c| c.matches('\n').count()).sum::<usize>();
        }
        // Writing to memory fails only on a bug; say so rather than read a partial table.
        match (wrote, w.into_inner()) {
            (Ok(()), Ok(bytes)) => String::from_utf8(bytes).unwrap_or_default(),
            _ => {
                return Err(vec![Problem::new(
                    "",
                    "internal error: the rows could not be passed to the bed-table reader",
                )])
            }
        }
    };
    let fields_of = |column: &str| -> Vec<Field> {
        match column {
            "thickness_m" | "thickness_cm" | "thickness_ft" => vec![Field::Thickness, Field::To],
            "grain_base" => vec![Field::GrainBase, Field::Grain],
            "grain_top" => vec![Field::GrainTop, Field::Grain],
            "grain" => vec![Field::Grain, Field::GrainBase],
            "base_relief_m" => vec![Field::BaseRelief],
            other => Field::parse(other).into_iter().collect(),
        }
    };
    // Rows refused above are left out; the others still get every check of the bed table, so
    // one pass reports every problem.
    match read_bed_table(&csv_text, name) {
        Ok(read) if problems.is_empty() => Ok((read.section, warnings)),
        Ok(_) => Err(problems),
        Err(found) => {
            if !rows_out.is_empty() || problems.is_empty() {
                problems.extend(found.into_iter().map(|p| {
                    let column = p.location.strip_prefix("column ").unwrap_or("");
                    let i = fields_of(column).into_iter().find_map(col);
                    match (p.line.and_then(|l| origin.get(&l)), i) {
                        (Some(&orig), Some(i)) => table.problem_at(orig, i, &header(i), p.message),
                        (Some(&orig), None) => {
                            let mut q = table.problem_at(orig, 0, &header(0), p.message);
                            if table.sheet.is_none() {
                                q.location = String::new();
                            }
                            q
                        }
                        (None, _) => Problem::new(p.location, p.message),
                    }
                }));
            }
            problems.sort_by_key(|p| p.line);
            problems.dedup();
            Err(problems)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::super::{import_bytes, ImportOptions};
    use crate::model::{GrainSize, Lithology, WentworthClass};

    fn import(text: &str, top_first: bool) -> Result<crate::model::Section, String> {
        let options = ImportOptions { top_first, ..Default::default() };
        import_bytes(text.as_bytes(), "field.csv", &options).map(|i| i.section).map_err(|e| e.to_string())
    }

    #[test]
    fn european_export_with_abbreviations() {
        let text = "\u{feff}Thickness (m);Rock type;Grain size;Notes\r\n1,2;sst;vc → m;base\r\n0,45;Mdst;si;\r\n2;cov;;\r\n";
        let s = import(text, false).expect("imports");
        assert_eq!(s.name, "field");
        assert_eq!(s.beds.len(), 3);
        assert_eq!(s.beds[0].thickness_m, 1.2);
        assert_eq!(s.beds[1].thickness_m, 0.45);
        assert_eq!(s.beds[0].lithology, Lithology::Sandstone);
        assert_eq!(s.beds[0].grain_base, Some(GrainSize::Class(WentworthClass::VeryCoarseSand)));
        assert_eq!(s.beds[0].grain_top, Some(GrainSize::Class(WentworthClass::MediumSand)));
        assert_eq!(s.beds[2].lithology, Lithology::Covered);
    }

    #[test]
    fn heights_from_to_and_top_first() {
        // Depths written from the top: the top bed first.
        let text = "From (m),To (m),Lithology,Grain\n0.0,1.2,mudstone,silt\n1.2,3.0,sandstone,fs\n";
        let s = import(text, true).expect("imports");
        assert_eq!(s.beds.len(), 2);
        assert_eq!(s.beds[0].lithology, Lithology::Sandstone, "the deepest bed comes first");
        assert_eq!(s.beds[0].thickness_m, 1.8, "3.0 − 1.2 rounded to the written decimals");
        assert_eq!(s.beds[1].thickness_m, 1.2);
        let gap = "From,To,Lithology,Grain\n0,1,mudstone,silt\n1.5,2,sandstone,fs\n";
        let e = import(gap, false).expect_err("gap");
        assert!(e.contains("line 3: column \"From\": from 1.5 does not meet the to 1"), "{e}");
    }

    #[test]
    fn problems_name_the_files_line_and_header() {
        let text = "Rock type;Thick.;Grain size\nsst;1,5;fs\nsandy stuff;-2;fs\nmudstone;1;\n";
        let e = import(text, false).expect_err("refused");
        assert!(e.contains("line 3: column \"Rock type\": \"sandy stuff\" is not a known lithology"), "{e}");
        assert!(e.contains("line 3: column \"Thick.\": must be > 0"), "{e}");
        // A mudstone without a grain size: the bed table's own rule, put back on line 4.
        assert!(e.contains("line 4: column \"Grain size\""), "{e}");
    }

    #[test]
    fn an_impossible_mapping_lists_the_headers() {
        let e = import("Dicke;Gestein\n1;sst\n", false).expect_err("no mapping");
        assert!(e.contains("Headers found: \"Dicke\", \"Gestein\""), "{e}");
    }

    #[test]
    fn notes_with_line_breaks_keep_later_lines_right() {
        let text = "thickness,lithology,grain,notes\n1,sst,fs,\"two\nlines\"\n2,mdst,,x\n";
        let e = import(text, false).expect_err("mudstone without grain");
        assert!(e.contains("line 4: column \"grain\""), "{e}");
    }
}
