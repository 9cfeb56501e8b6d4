//! Reader for LAS 2.0 log files (Canadian Well Logging Society, "LAS Version 2.0: A Digital
//! Standard for Logs"), e.g. outcrop gamma-ray logs, turned into curves on section heights.
//!
//! Sections start with `~` and are known by their first letter: ~V (version: VERS, WRAP), ~W
//! (well: STRT, STOP, STEP, NULL, …), ~C (curves, the first being the index DEPT/DEPTH), ~P
//! (parameters), ~O (other, free text), ~A (data, last). Header lines read
//! `MNEM.UNIT  DATA : DESCRIPTION`; lines starting with `#` are comments. Unwrapped data have
//! one line per depth; wrapped data (WRAP YES) put the index alone on a line and the other
//! values on following lines. Values equal to NULL become `None`. Depths in feet are converted
//! to metres (1 ft = 0.3048 m exactly).
//!
//! Place curves on section heights with [`IndexToSection`]; [`LasFile::measured_curve`] gives
//! one curve ready to attach to a section (it is then saved with the project and drawn beside
//! the column), and [`bed_means`] summarises a curve bed by bed.

pub use crate::model::IndexDirection;
use crate::model::{MeasuredCurve, METRES_PER_FOOT};
use serde::Serialize;
use std::path::Path;

/// Why a LAS file could not be read; always names the line and what was expected.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum LasError {
    #[error("{path}: cannot read: {message}")]
    Io { path: String, message: String },
    #[error("{path}, line {line}: {message}")]
    Syntax { path: String, line: usize, message: String },
    #[error("{path}: {message}")]
    Missing { path: String, message: String },
}

/// One header line `MNEM.UNIT DATA : DESCRIPTION`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HeaderItem {
    pub mnemonic: String,
    pub unit: String,
    pub value: String,
    pub description: String,
    /// 1-based line number in the file.
    pub line: usize,
}

/// A log curve on section heights.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Curve {
    pub mnemonic: String,
    pub unit: String,
    pub description: String,
    /// (height above the section base in metres, value), in file order; `None` where the file
    /// holds the NULL value.
    pub samples: Vec<(f64, Option<f64>)>,
}

/// Everything read from a LAS file, index still as depths in the file's order.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LasFile {
    pub version: String,
    pub wrapped: bool,
    pub well: Vec<HeaderItem>,
    /// The ~C items, index first.
    pub curve_items: Vec<HeaderItem>,
    pub parameters: Vec<HeaderItem>,
    pub other: String,
    /// NULL value from ~W, if given.
    pub null_value: Option<f64>,
    /// Unit of the index as written (M, FT, F, …).
    pub index_unit: String,
    /// Index values converted to metres.
    pub index_m: Vec<f64>,
    /// Values of each non-index curve, in ~C order after the index; NULLs as `None`.
    pub values: Vec<Vec<Option<f64>>>,
    /// Things that do not stop reading but deserve a look (e.g. STRT not matching the first
    /// index value), each naming the line.
    pub warnings: Vec<String>,
}

/// Where the section's zero (its base) lies on the file's index.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct IndexToSection {
    pub direction: IndexDirection,
    /// Index value (in metres) of the section base.
    pub zero_m: f64,
}

impl LasFile {
    /// The non-index curves on section heights.
    pub fn curves(&self, placement: &IndexToSection) -> Vec<Curve> {
        let heights: Vec<f64> =
            self.index_m.iter().map(|d| placement.direction.height_m(*d, placement.zero_m)).collect();
        self.curve_items
            .iter()
            .skip(1)
            .zip(&self.values)
            .map(|(item, vals)| Curve {
                mnemonic: item.mnemonic.clone(),
                unit: item.unit.clone(),
                description: item.description.clone(),
                samples: heights.iter().copied().zip(vals.iter().copied()).collect(),
            })
            .collect()
    }

    /// Mnemonics of the non-index curves, in ~C order.
    pub fn curve_mnemonics(&self) -> Vec<&str> {
        self.curve_items.iter().skip(1).map(|i| i.mnemonic.as_str()).collect()
    }

    /// One curve (by mnemonic, case-insensitive) placed on section heights and sorted lowest
    /// first, ready to attach to a section. `path` names the file in messages and is kept (its
    /// file name only) as the curve's source.
    pub fn measured_curve(
        &self,
        mnemonic: &str,
        placement: &IndexToSection,
        path: &str,
    ) -> Result<MeasuredCurve, LasError> {
        let k = self.curve_items.iter().skip(1).position(|i| i.mnemonic.eq_ignore_ascii_case(mnemonic));
        let Some(k) = k else {
            let found = self.curve_mnemonics().join(", ");
            return Err(LasError::Missing {
                path: path.to_string(),
                message: format!(
                    "no curve {mnemonic:?} in ~C; the file has {}",
                    if found.is_empty() { "no curves besides the index".to_string() } else { found }
                ),
            });
        };
        if !placement.zero_m.is_finite() {
            return Err(LasError::Missing {
                path: path.to_string(),
                message: format!("the offset must be a finite number of metres, got {}", placement.zero_m),
            });
        }
        let item = &self.curve_items[k + 1];
        let mut samples: Vec<(f64, Option<f64>)> = self
            .index_m
            .iter()
            .zip(&self.values[k])
            .map(|(d, v)| (placement.direction.height_m(*d, placement.zero_m), *v))
            .collect();
        // Stable: samples at the same height keep their file order.
        samples.sort_by(|a, b| a.0.total_cmp(&b.0));
        let source_file = std::path::Path::new(path)
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_else(|| path.to_string());
        Ok(MeasuredCurve {
            mnemonic: item.mnemonic.clone(),
            unit: item.unit.clone(),
            description: item.description.clone(),
            source_file,
            offset_m: placement.zero_m,
            direction: placement.direction,
            samples,
        })
    }

    /// A ~W item by mnemonic (case-insensitive).
    pub fn well_item(&self, mnemonic: &str) -> Option<&HeaderItem> {
        self.well.iter().find(|i| i.mnemonic.eq_ignore_ascii_case(mnemonic))
    }
}

/// Mean of a curve's non-NULL samples within each bed of a section (same order as the beds);
/// `None` where a bed holds no sample. Samples on a bed boundary count in the bed above,
/// except at the section top.
pub fn bed_means(curve: &Curve, section: &crate::model::Section) -> Vec<Option<f64>> {
    let bases = section.base_heights_m();
    let top = section.total_thickness_m();
    section
        .beds
        .iter()
        .zip(&bases)
        .map(|(bed, &base)| {
            let bed_top = base + bed.thickness_m;
            let inside = |h: f64| h >= base && (h < bed_top || (h <= bed_top && bed_top >= top));
            let vals: Vec<f64> =
                curve.samples.iter().filter(|(h, _)| inside(*h)).filter_map(|(_, v)| *v).collect();
            (!vals.is_empty()).then(|| vals.iter().sum::<f64>() / vals.len() as f64)
        })
        .collect()
}

/// Compare STRT, STOP and STEP (and their unit) with the data actually present. The tolerance
/// is half a thousandth of a step or 1e-6, whichever is larger, since headers are often written
/// with fewer decimals than the data.
fn header_warnings(path: &str, well: &[HeaderItem], index_unit: &str, rows: &[Vec<f64>]) -> Vec<String> {
    let mut out = Vec::new();
    let (Some(first), Some(last)) = (rows.first().map(|r| r[0]), rows.last().map(|r| r[0])) else {
        return out;
    };
    let find = |m: &str| well.iter().find(|i| i.mnemonic.eq_ignore_ascii_case(m));
    let step_data = if rows.len() > 1 { (last - first) / (rows.len() - 1) as f64 } else { 0.0 };
    let tol = (step_data.abs() * 5e-4).max(1e-6);
    for (m, want, what) in [("STRT", first, "the first index value"), ("STOP", last, "the last index value")]
    {
        if let Some(item) = find(m) {
            if !item.unit.is_empty() && !item.unit.eq_ignore_ascii_case(index_unit) {
                out.push(format!(
                    "{path}, line {}: {m} is in {:?} but the index curve is in {index_unit:?}",
                    item.line, item.unit
                ));
            } else if let Ok(v) = item.value.parse::<f64>() {
                if (v - want).abs() > tol {
                    out.push(format!("{path}, line {}: {m} is {v} but {what} is {want}", item.line));
                }
            }
        }
    }
    if let Some(item) = find("STEP") {
        if let Ok(v) = item.value.parse::<f64>() {
            // STEP 0 means an irregular spacing (LAS 2.0).
            let regular = rows.windows(2).all(|w| ((w[1][0] - w[0][0]) - v).abs() <= tol);
            if v != 0.0 && !regular {
                out.push(format!(
                    "{path}, line {}: STEP is {v} but the index values are not spaced by it (use STEP 0 for irregular spacing)",
                    item.line
                ));
            }
        }
    }
    out
}

/// Metres per unit of the index, from its unit as written.
fn index_unit_factor(unit: &str) -> Option<f64> {
    match unit.trim().to_ascii_uppercase().as_str() {
        "M" | "METER" | "METERS" | "METRE" | "METRES" => Some(1.0),
        "FT" | "F" | "FEET" | "FOOT" => Some(METRES_PER_FOOT),
        "CM" => Some(0.01),
        _ => None,
    }
}

/// Split a header line into its four parts. The unit runs from the first period to the first
/// space after it; the description follows the last colon.
fn parse_header_line(text: &str, line: usize, path: &str) -> Result<HeaderItem, LasError> {
    let syntax = |message: String| LasError::Syntax { path: path.to_string(), line, message };
    let dot = text.find('.').ok_or_else(|| {
        syntax(format!("expected `MNEMONIC.UNIT  VALUE : DESCRIPTION`, found no period in {:?}", text.trim()))
    })?;
    let mnemonic = text[..dot].trim().to_string();
    if mnemonic.is_empty() {
        return Err(syntax("expected a mnemonic before the period".into()));
    }
    let rest = &text[dot + 1..];
    let unit_end = rest.find(char::is_whitespace).unwrap_or(rest.len());
    let (unit, rest) = rest.split_at(unit_end);
    let colon = rest.rfind(':').ok_or_else(|| {
        syntax(format!("expected a colon between the value and the description in {:?}", text.trim()))
    })?;
    // A unit glued to the colon (`STRT.M:`) leaves the colon inside the unit token.
    let (unit, value, description) = match unit.find(':') {
        Some(c) => (&unit[..c], "", &unit[c + 1..]),
        None => (unit, rest[..colon].trim(), rest[colon + 1..].trim()),
    };
    Ok(HeaderItem {
        mnemonic,
        unit: unit.trim().to_string(),
        value: value.to_string(),
        description: description.trim().to_string(),
        line,
    })
}

fn parse_number(token: &str, line: usize, path: &str, what: &str) -> Result<f64, LasError> {
    token.parse::<f64>().ok().filter(|v| v.is_finite()).ok_or_else(|| LasError::Syntax {
        path: path.to_string(),
        line,
        message: format!("{what}: {token:?} is not a number"),
    })
}

/// Read a LAS 2.0 file from disk.
pub fn read_las(path: &Path) -> Result<LasFile, LasError> {
    let shown = path.display().to_string();
    let bytes =
        std::fs::read(path).map_err(|e| LasError::Io { path: shown.clone(), message: e.to_string() })?;
    // LAS files are ASCII by the standard; tolerate stray Latin-1 bytes in descriptions.
    let text = String::from_utf8_lossy(&bytes);
    parse_las(&text, &shown)
}

/// Parse LAS 2.0 text; `path` is used in messages only.
///
/// ```
/// use aggrade_core::analysis::las::parse_las;
/// let text = "~V\n VERS. 2.0 : v\n WRAP. NO : w\n~W\n NULL. -999.25 : n\n~C\n DEPT.FT : d\n GR.API : g\n~A\n 10 55.5\n 11 -999.25\n";
/// let f = parse_las(text, "demo.las").unwrap();
/// assert_eq!(f.index_m, vec![3.048, 11.0 * 0.3048]);
/// assert_eq!(f.values[0], vec![Some(55.5), None]);
/// ```
pub fn parse_las(text: &str, path: &str) -> Result<LasFile, LasError> {
    let syntax = |line: usize, message: String| LasError::Syntax { path: path.to_string(), line, message };
    let missing = |message: String| LasError::Missing { path: path.to_string(), message };
    #[derive(PartialEq, Clone, Copy)]
    enum Part {
        None,
        V,
        W,
        C,
        P,
        O,
        A,
        Unknown,
    }
    let mut part = Part::None;
    let mut version: Vec<HeaderItem> = Vec::new();
    let mut well = Vec::new();
    let mut curve_items = Vec::new();
    let mut parameters = Vec::new();
    let mut other = String::new();
    let mut data_lines: Vec<(usize, &str)> = Vec::new();
    let mut seen_v = false;
    let mut seen_a = false;
    for (i, raw) in text.lines().enumerate() {
        let line = i + 1;
        let trimmed = raw.trim();
        if trimmed.starts_with('#') || (trimmed.is_empty() && part != Part::O) {
            continue;
        }
        if let Some(tag) = trimmed.strip_prefix('~') {
            if seen_a {
                return Err(syntax(
                    line,
                    "the ~A (data) section must be the last section of the file".into(),
                ));
            }
            part = match tag.chars().next().map(|c| c.to_ascii_uppercase()) {
                Some('V') => Part::V,
                Some('W') => Part::W,
                Some('C') => Part::C,
                Some('P') => Part::P,
                Some('O') => Part::O,
                Some('A') => Part::A,
                _ => Part::Unknown,
            };
            if part == Part::V {
                seen_v = true;
            } else if !seen_v {
                return Err(syntax(line, "expected the ~V (version) section first".into()));
            }
            if part == Part::A {
                seen_a = true;
            }
            continue;
        }
        match part {
            Part::None => {
                return Err(syntax(line, "expected the ~V (version) section before any other line".into()));
            }
            Part::V => version.push(parse_header_line(raw, line, path)?),
            Part::W => well.push(parse_header_line(raw, line, path)?),
            Part::C => curve_items.push(parse_header_line(raw, line, path)?),
            Part::P => parameters.push(parse_header_line(raw, line, path)?),
            Part::O => {
                other.push_str(raw);
                other.push('\n');
            }
            Part::A => data_lines.push((line, raw)),
            Part::Unknown => {}
        }
    }
    if !seen_v {
        return Err(missing("no ~V (version) section: a LAS file must start with ~V".into()));
    }
    let find =
        |items: &[HeaderItem], m: &str| items.iter().find(|i| i.mnemonic.eq_ignore_ascii_case(m)).cloned();
    let vers = find(&version, "VERS")
        .ok_or_else(|| missing("~V has no VERS line (expected `VERS. 2.0 : …`)".into()))?;
    if !matches!(vers.value.as_str(), "2.0" | "2" | "2.00") {
        return Err(syntax(
            vers.line,
            format!("VERS is {:?}; this reader reads LAS version 2.0", vers.value),
        ));
    }
    let wrap =
        find(&version, "WRAP").ok_or_else(|| missing("~V has no WRAP line (expected YES or NO)".into()))?;
    let wrapped = match wrap.value.to_ascii_uppercase().as_str() {
        "YES" => true,
        "NO" => false,
        other => return Err(syntax(wrap.line, format!("WRAP is {other:?}; expected YES or NO"))),
    };
    if !seen_a {
        return Err(missing("no ~A (data) section: expected ~A as the last section".into()));
    }
    if curve_items.is_empty() {
        return Err(missing("no ~C (curve) section or it lists no curves".into()));
    }
    let index = &curve_items[0];
    if !matches!(index.mnemonic.to_ascii_uppercase().as_str(), "DEPT" | "DEPTH") {
        return Err(syntax(
            index.line,
            format!("the first curve in ~C must be the index DEPT or DEPTH, found {:?}", index.mnemonic),
        ));
    }
    // Index unit: from the index curve, else from STRT.
    let strt = find(&well, "STRT");
    let index_unit = if !index.unit.is_empty() {
        index.unit.clone()
    } else {
        strt.as_ref().map(|s| s.unit.clone()).unwrap_or_default()
    };
    let factor = index_unit_factor(&index_unit).ok_or_else(|| {
        syntax(
            index.line,
            format!("index unit {index_unit:?} is not a length unit; expected M or FT (also F, CM)"),
        )
    })?;
    let null_value = match find(&well, "NULL") {
        Some(n) if !n.value.is_empty() => Some(parse_number(&n.value, n.line, path, "NULL value")?),
        _ => None,
    };
    let ncurves = curve_items.len();
    let mut rows: Vec<Vec<f64>> = Vec::new();
    if wrapped {
        let mut current: Vec<f64> = Vec::new();
        let mut record_line = 0;
        for &(line, raw) in &data_lines {
            let tokens: Vec<&str> = raw.split_whitespace().collect();
            if current.is_empty() {
                if tokens.len() != 1 {
                    return Err(syntax(
                        line,
                        format!(
                            "wrapped data: expected the index value alone on this line, found {} values",
                            tokens.len()
                        ),
                    ));
                }
                record_line = line;
            }
            for t in tokens {
                current.push(parse_number(t, line, path, "data value")?);
            }
            if current.len() > ncurves {
                return Err(syntax(
                    line,
                    format!("wrapped data: the record starting on line {record_line} has more than {ncurves} values (one per ~C curve)"),
                ));
            }
            if current.len() == ncurves {
                rows.push(std::mem::take(&mut current));
            }
        }
        if !current.is_empty() {
            return Err(syntax(
                record_line,
                format!(
                    "wrapped data: the last record has {} values, expected {ncurves} (one per ~C curve)",
                    current.len()
                ),
            ));
        }
    } else {
        for &(line, raw) in &data_lines {
            let tokens: Vec<&str> = raw.split_whitespace().collect();
            if tokens.len() != ncurves {
                return Err(syntax(
                    line,
                    format!("expected {ncurves} values (one per ~C curve), found {}", tokens.len()),
                ));
            }
            let row = tokens
                .iter()
                .map(|t| parse_number(t, line, path, "data value"))
                .collect::<Result<Vec<f64>, _>>()?;
            rows.push(row);
        }
    }
    if rows.is_empty() {
        return Err(missing("the ~A section holds no data".into()));
    }
    let is_null = |v: f64| null_value.is_some_and(|n| (v - n).abs() <= 1e-9 * n.abs().max(1.0));
    let index_m = rows.iter().map(|r| r[0] * factor).collect();
    let values =
        (1..ncurves).map(|k| rows.iter().map(|r| (!is_null(r[k])).then_some(r[k])).collect()).collect();
    let warnings = header_warnings(path, &well, &index_unit, &rows);
    Ok(LasFile {
        warnings,
        version: vers.value,
        wrapped,
        well,
        curve_items,
        parameters,
        other,
        null_value,
        index_unit,
        index_m,
        values,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    const SMALL: &str = "~VERSION INFORMATION
 VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.   NO  : ONE LINE PER DEPTH STEP
~WELL INFORMATION
 STRT.M   1.0 : START
 STOP.M   2.0 : STOP
 STEP.M   0.5 : STEP
 NULL.    -999.25 : NULL VALUE
~CURVE INFORMATION
 DEPT.M        : DEPTH
 GR  .API      : GAMMA RAY
~A
 1.0  45.0
 1.5  -999.25
 2.0  80.5
";

    #[test]
    fn reads_a_small_unwrapped_file() {
        let f = parse_las(SMALL, "small.las").expect("valid");
        assert!(!f.wrapped);
        assert_eq!(f.index_m, vec![1.0, 1.5, 2.0]);
        assert_eq!(f.values, vec![vec![Some(45.0), None, Some(80.5)]]);
        let c = f.curves(&IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 2.0 });
        assert_eq!(c[0].mnemonic, "GR");
        assert_eq!(c[0].unit, "API");
        assert_eq!(c[0].samples, vec![(1.0, Some(45.0)), (0.5, None), (0.0, Some(80.5))]);
    }

    #[test]
    fn a_measured_curve_is_sorted_lowest_first_and_names_its_source() {
        let f = parse_las(SMALL, "/field/2026/small.las").expect("valid");
        let down = IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 2.0 };
        let c = f.measured_curve("gr", &down, "/field/2026/small.las").expect("GR is there");
        // Depths 1.0, 1.5, 2.0 below a datum whose base is at depth 2 m: heights 1, 0.5, 0.
        assert_eq!(c.samples, vec![(0.0, Some(80.5)), (0.5, None), (1.0, Some(45.0))]);
        assert_eq!((c.mnemonic.as_str(), c.unit.as_str()), ("GR", "API"));
        assert_eq!(c.source_file, "small.las");
        assert_eq!((c.offset_m, c.direction), (2.0, IndexDirection::DepthBelowDatum));
        let e = f.measured_curve("TH", &down, "small.las").expect_err("no TH");
        assert_eq!(e.to_string(), "small.las: no curve \"TH\" in ~C; the file has GR");
        let bad = IndexToSection { direction: IndexDirection::HeightAboveDatum, zero_m: f64::NAN };
        assert!(f.measured_curve("GR", &bad, "small.las").is_err());
    }

    #[test]
    fn bed_means_average_samples_inside_each_bed() {
        use crate::model::{Bed, BedId, Lithology, Section};
        let f = parse_las(SMALL, "small.las").expect("valid");
        // Heights 0, 0.5 (NULL), 1.0 with the base at depth 2 m.
        let c = &f.curves(&IndexToSection { direction: IndexDirection::DepthBelowDatum, zero_m: 2.0 })[0];
        let mut s = Section::new("Test");
        s.beds.push(Bed::new(BedId(1), 0.75, Lithology::Mudstone, None));
        s.beds.push(Bed::new(BedId(2), 0.25, Lithology::Sandstone, None));
        s.beds.push(Bed::new(BedId(3), 1.0, Lithology::Mudstone, None));
        // Bed 1 (0–0.75): 80.5 and a NULL; bed 2 (0.75–1.0): none; bed 3 (1.0–2.0): 45.0.
        assert_eq!(bed_means(c, &s), vec![Some(80.5), None, Some(45.0)]);
    }

    #[test]
    fn header_mismatches_are_warnings() {
        assert!(parse_las(SMALL, "s.las").expect("valid").warnings.is_empty());
        let f = parse_las(
            &SMALL.replace("STOP.M   2.0", "STOP.M   2.5").replace("STEP.M   0.5", "STEP.M   0.25"),
            "s.las",
        )
        .expect("still readable");
        assert_eq!(f.warnings.len(), 2, "{:?}", f.warnings);
        assert!(
            f.warnings[0].starts_with("s.las, line 6: STOP is 2.5 but the last index value is 2"),
            "{:?}",
            f.warnings
        );
        assert!(f.warnings[1].contains("line 7: STEP is 0.25"), "{:?}", f.warnings);
    }

    #[test]
    fn clear_errors_with_line_numbers() {
        let e = parse_las(&SMALL.replace(" 1.5  -999.25", " 1.5"), "x.las").expect_err("short row");
        assert_eq!(e.to_string(), "x.las, line 14: expected 2 values (one per ~C curve), found 1");
        let e = parse_las(&SMALL.replace("80.5", "8o.5"), "x.las").expect_err("bad number");
        assert!(
            e.to_string().contains("line 15") && e.to_string().contains("\"8o.5\" is not a number"),
            "{e}"
        );
        let e = parse_las(&SMALL.replace("WRAP.   NO", "WRAP.   MAYBE"), "x.las").expect_err("wrap");
        assert!(e.to_string().contains("line 3") && e.to_string().contains("expected YES or NO"), "{e}");
        let e = parse_las(SMALL.split("~A").next().unwrap_or(""), "x.las").expect_err("no ~A");
        assert!(e.to_string().contains("no ~A"), "{e}");
        let e = parse_las(&SMALL.replace("~VERSION INFORMATION", "~OTHER"), "x.las").expect_err("no ~V");
        assert!(e.to_string().contains("~V"), "{e}");
    }
}
