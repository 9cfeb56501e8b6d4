//! Reader for LAS 1.2 and 2.0 log files (Canadian Well Logging Society, "LAS Version 2.0: A
//! Digital Standard for Logs", and its version 1.2), e.g. outcrop gamma-ray logs, turned into
//! curves on section heights. Odd files as tools write them are read with a warning naming the
//! line, or refused with the line and the reason (see [`parse_las`]).
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
fn header_warnings(path: &str, well: &[HeaderItem], index_unit: &str, index: &[f64]) -> Vec<String> {
    let mut out = Vec::new();
    let (Some(&first), Some(&last)) = (index.first(), index.last()) else {
        return out;
    };
    let find = |m: &str| well.iter().find(|i| i.mnemonic.eq_ignore_ascii_case(m));
    let step_data = if index.len() > 1 { (last - first) / (index.len() - 1) as f64 } else { 0.0 };
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
            let regular = index.windows(2).all(|w| ((w[1] - w[0]) - v).abs() <= tol);
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

/// Metres per unit of the index, from its unit as written (brackets removed).
fn index_unit_factor(unit: &str) -> Option<f64> {
    match unit.trim().to_ascii_uppercase().as_str() {
        "M" | "METER" | "METERS" | "METRE" | "METRES" => Some(1.0),
        "FT" | "F" | "FEET" | "FOOT" => Some(METRES_PER_FOOT),
        "CM" => Some(0.01),
        // Tenths of an inch, as some older tools write depth: 0.1 × 0.0254 m.
        ".1IN" | "0.1IN" => Some(0.00254),
        _ => None,
    }
}

/// Index units and mnemonics that mean time, not depth (refused: curves go on heights).
fn is_time_index(mnemonic: &str, unit: &str) -> bool {
    let m = mnemonic.trim().to_ascii_uppercase();
    let u = unit.trim().to_ascii_uppercase();
    ["TIME", "ETIM", "DATE", "DATETIME", "T"].contains(&m.as_str())
        || ["S", "SEC", "SECS", "MS", "MSEC", "MIN", "H", "HR", "HOUR", "HOURS", "D", "DAY", "DAYS"]
            .contains(&u.as_str())
}

/// A unit with the brackets some writers put round it removed (`(M)` → `M`).
fn strip_brackets(unit: &str) -> &str {
    let u = unit.trim();
    if u.len() >= 2 && ((u.starts_with('(') && u.ends_with(')')) || (u.starts_with('[') && u.ends_with(']')))
    {
        &u[1..u.len() - 1]
    } else {
        u
    }
}

/// Split a header line into its four parts. The mnemonic runs to the first period, the unit
/// from there to the first space, the value to the last colon and the description after it.
/// A line without a colon is read as mnemonic, unit and value with no description; a line
/// without a period before its colon as mnemonic and value (both as other readers do), each
/// with a warning naming the line.
fn parse_header_line(text: &str, line: usize, path: &str) -> Result<(HeaderItem, Option<String>), LasError> {
    let syntax = |message: String| LasError::Syntax { path: path.to_string(), line, message };
    let colon_at = text.rfind(':');
    let dot = text.find('.').filter(|d| colon_at.is_none_or(|c| *d < c));
    let Some(dot) = dot else {
        let Some(c) = colon_at else {
            return Err(syntax(format!(
                "expected `MNEMONIC.UNIT  VALUE : DESCRIPTION`, found no period and no colon in {:?}",
                text.trim()
            )));
        };
        let mnemonic = text[..c].trim().to_string();
        if mnemonic.is_empty() {
            return Err(syntax("expected a mnemonic before the colon".into()));
        }
        let item = HeaderItem {
            mnemonic,
            unit: String::new(),
            value: text[c + 1..].trim().to_string(),
            description: String::new(),
            line,
        };
        let warning = format!(
            "{path}, line {line}: no period after the mnemonic; read as {:?} = {:?} with no unit",
            item.mnemonic, item.value
        );
        return Ok((item, Some(warning)));
    };
    // A leading period (`.DEPT.M`) is skipped, as other readers do.
    let (start, dot) = if text[..dot].trim().is_empty() {
        match text[dot + 1..].find('.') {
            Some(d) => (dot + 1, dot + 1 + d),
            // Found by fuzzing: a lone period (` .   : DEPTH`) has no mnemonic at all.
            None => return Err(syntax("expected a mnemonic before the period".into())),
        }
    } else {
        (0, dot)
    };
    let mnemonic = text[start..dot].trim().to_string();
    if mnemonic.is_empty() {
        return Err(syntax("expected a mnemonic before the period".into()));
    }
    let rest = &text[dot + 1..];
    let unit_end = rest.find(char::is_whitespace).unwrap_or(rest.len());
    let (unit, rest) = rest.split_at(unit_end);
    // A unit glued to the colon (`STRT.M:`) leaves the colon inside the unit token.
    let (unit, value, description, warning) = match (unit.find(':'), rest.rfind(':')) {
        (Some(c), _) => (&unit[..c], "", format!("{}{rest}", &unit[c + 1..]), None),
        (None, Some(colon)) => (unit, rest[..colon].trim(), rest[colon + 1..].to_string(), None),
        (None, None) => (
            unit,
            rest.trim(),
            String::new(),
            Some(format!(
                "{path}, line {line}: no colon before a description; read as mnemonic {:?}, unit {:?}, value {:?}",
                mnemonic,
                strip_brackets(unit),
                rest.trim()
            )),
        ),
    };
    Ok((
        HeaderItem {
            mnemonic,
            unit: strip_brackets(unit).to_string(),
            value: value.to_string(),
            description: description.trim().to_string(),
            line,
        },
        warning,
    ))
}

/// Text that tools write for a missing or undefined reading (the C runtime's `-1.#IND` and
/// `1.#INF`, `NaN`, `(null)`, `#N/A` …): read as NULL with a warning.
fn is_null_marker(token: &str) -> bool {
    let t = token.to_ascii_lowercase();
    let t = t.trim_start_matches(['-', '+']);
    matches!(t, "nan" | "null" | "(null)" | "#n/a" | "n/a" | "na" | "inf" | "infinity" | "" | "-" | "--")
        || ["1.#ind", "1.#inf", "1.#qnan", "1.#snan", "1.#io"].iter().any(|m| t.starts_with(m))
}

/// One data value: a number, a NULL marker, or an error naming the line.
enum Token {
    Value(f64),
    Marker,
    Comma(f64),
}

fn parse_token(token: &str, line: usize, path: &str) -> Result<Token, LasError> {
    let bad = |why: &str| LasError::Syntax {
        path: path.to_string(),
        line,
        message: format!("data value: {token:?} is not a number{why}"),
    };
    if is_null_marker(token) {
        return Ok(Token::Marker);
    }
    let plain = !token.is_empty() && token.bytes().all(|b| b.is_ascii_digit() || b"+-.eE".contains(&b));
    if plain {
        return match token.parse::<f64>() {
            Ok(v) if v.is_finite() => Ok(Token::Value(v)),
            _ if token.matches('.').count() > 1
                || (token[1..].contains(['-', '+']) && !token.contains(['e', 'E'])) =>
            {
                Err(bad(" (two numbers run together? put a space between them)"))
            }
            _ => Err(bad("")),
        };
    }
    // A decimal comma (`12,5`); `1,500` could as well be a thousands separator and is refused.
    if let Some((a, b)) = token.split_once(',') {
        let digits = |s: &str| !s.is_empty() && s.bytes().all(|c| c.is_ascii_digit());
        let int = a.trim_start_matches(['-', '+']);
        if digits(int) && digits(b) {
            let grouped = b.len() == 3 && int.len() <= 3 && !int.starts_with('0');
            if grouped {
                return Err(bad(
                    ": a comma followed by three digits could be a decimal comma or a thousands separator; \
                     write it with a decimal point",
                ));
            }
            if let Ok(v) = format!("{a}.{b}").parse::<f64>() {
                return Ok(Token::Comma(v));
            }
        }
    }
    Err(bad(""))
}

/// Lines split on LF, CR LF or a lone CR (old Macintosh files).
fn split_lines(text: &str) -> Vec<&str> {
    let mut out = Vec::new();
    let bytes = text.as_bytes();
    let mut start = 0;
    let mut i = 0;
    while i < bytes.len() {
        match bytes[i] {
            b'\n' => {
                out.push(&text[start..i]);
                start = i + 1;
            }
            b'\r' => {
                out.push(&text[start..i]);
                if bytes.get(i + 1) == Some(&b'\n') {
                    i += 1;
                }
                start = i + 1;
            }
            _ => {}
        }
        i += 1;
    }
    if start < bytes.len() {
        out.push(&text[start..]);
    }
    out
}

/// Read a LAS 1.2 or 2.0 file from disk.
pub fn read_las(path: &Path) -> Result<LasFile, LasError> {
    let shown = path.display().to_string();
    let io = |message: String| LasError::Io { path: shown.clone(), message };
    let file = std::fs::File::open(path).map_err(|e| io(e.to_string()))?;
    let size = file.metadata().map_err(|e| io(e.to_string()))?.len();
    let limit = crate::io::MAX_FILE_BYTES;
    if size > limit {
        return Err(io(format!("the file is {size} bytes; at most {limit} bytes are read")));
    }
    let mut bytes = Vec::new();
    std::io::Read::read_to_end(&mut std::io::Read::take(file, limit + 1), &mut bytes)
        .map_err(|e| io(e.to_string()))?;
    if bytes.len() as u64 > limit {
        return Err(io(format!("the file is more than {limit} bytes; at most {limit} bytes are read")));
    }
    // LAS files are ASCII by the standard; tolerate stray Latin-1 bytes in descriptions.
    let text = String::from_utf8_lossy(&bytes);
    parse_las(&text, &shown)
}

/// Parse LAS 1.2 or 2.0 text; `path` is used in messages only.
///
/// Odd files as tools write them are read, each with a warning naming the line: a byte-order
/// mark, CR-only line breaks, tabs, a missing VERS, WRAP or NULL line, `-1.#IND`-style and text
/// NULL markers, decimal commas, duplicate mnemonics (renamed `GR:1`, `GR:2`), a header line
/// without its colon, and fewer data columns than ~C curves (the last curves are then empty).
/// Refused with the line: more data columns than curves, rows of differing length, run-on or
/// ambiguous numbers (`1,500`), a time index, LAS 3.0.
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
    let mut warnings: Vec<String> = Vec::new();
    let text = match text.strip_prefix('\u{feff}') {
        Some(rest) => {
            warnings.push(format!("{path}, line 1: a UTF-8 byte-order mark before ~V (skipped)"));
            rest
        }
        None => text,
    };
    if let Some(i) = text.find('\0') {
        let line = 1 + text[..i].matches('\n').count();
        return Err(syntax(
            line,
            "a NUL byte: this is not ASCII text (UTF-16 or a binary file?); save it as ASCII".into(),
        ));
    }
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
    let mut v_line = 0;
    let mut seen_a = false;
    let mut tabs_at = None;
    for (i, raw) in split_lines(text).into_iter().enumerate() {
        let line = i + 1;
        let trimmed = raw.trim();
        if trimmed.starts_with('#') || (trimmed.is_empty() && part != Part::O) {
            continue;
        }
        if tabs_at.is_none() && raw.contains('\t') {
            tabs_at = Some(line);
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
                v_line = line;
            } else if v_line == 0 {
                return Err(syntax(line, "expected the ~V (version) section first".into()));
            }
            if part == Part::A {
                seen_a = true;
            }
            continue;
        }
        let mut header = |items: &mut Vec<HeaderItem>| -> Result<(), LasError> {
            let (item, warning) = parse_header_line(raw, line, path)?;
            items.push(item);
            warnings.extend(warning);
            Ok(())
        };
        match part {
            Part::None => {
                return Err(syntax(line, "expected the ~V (version) section before any other line".into()));
            }
            Part::V => header(&mut version)?,
            Part::W => header(&mut well)?,
            Part::C => header(&mut curve_items)?,
            Part::P => header(&mut parameters)?,
            Part::O => {
                other.push_str(raw);
                other.push('\n');
            }
            Part::A => data_lines.push((line, raw)),
            Part::Unknown => {}
        }
    }
    if v_line == 0 {
        return Err(missing("no ~V (version) section: a LAS file must start with ~V".into()));
    }
    if let Some(line) = tabs_at {
        warnings.push(format!("{path}, line {line}: tabs between values (read as spaces)"));
    }
    let find =
        |items: &[HeaderItem], m: &str| items.iter().find(|i| i.mnemonic.eq_ignore_ascii_case(m)).cloned();
    let version_text = match find(&version, "VERS") {
        Some(vers) => {
            // The first word of the value (some writers add text after the number).
            let number =
                vers.value.split_whitespace().next().unwrap_or("").replace(',', ".").parse::<f64>().ok();
            match number {
                Some(v) if v == 1.2 || v == 2.0 => vers.value.clone(),
                Some(v) if v >= 3.0 => {
                    return Err(syntax(
                        vers.line,
                        format!("VERS is {:?}: LAS 3.0 files are not read; write LAS 2.0", vers.value),
                    ))
                }
                _ => {
                    return Err(syntax(
                        vers.line,
                        format!("VERS is {:?}; this reader reads LAS versions 1.2 and 2.0", vers.value),
                    ))
                }
            }
        }
        None => {
            warnings.push(format!("{path}, line {v_line}: ~V has no VERS line; read as LAS 2.0"));
            "2.0".to_string()
        }
    };
    let las12 = version_text
        .split_whitespace()
        .next()
        .unwrap_or("")
        .replace(',', ".")
        .parse::<f64>()
        .is_ok_and(|v| v < 2.0);
    if las12 {
        // LAS 1.2 writes most ~W items as `MNEM.UNIT DESCRIPTION : VALUE` (e.g.
        // `COMP. COMPANY: ANY OIL COMPANY`); only STRT, STOP, STEP and NULL keep the value first.
        for item in &mut well {
            if !["STRT", "STOP", "STEP", "NULL"].iter().any(|m| item.mnemonic.eq_ignore_ascii_case(m)) {
                std::mem::swap(&mut item.value, &mut item.description);
            }
        }
    }
    let wrapped = match find(&version, "WRAP") {
        Some(wrap) => match wrap.value.to_ascii_uppercase().as_str() {
            "YES" => Some(true),
            "NO" => Some(false),
            other => return Err(syntax(wrap.line, format!("WRAP is {other:?}; expected YES or NO"))),
        },
        None => None,
    };
    if !seen_a {
        return Err(missing("no ~A (data) section: expected ~A as the last section".into()));
    }
    if curve_items.is_empty() {
        return Err(missing("no ~C (curve) section or it lists no curves".into()));
    }
    // Duplicate mnemonics are numbered (`GR:1`, `GR:2`) so that each curve can be named.
    let mut seen: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    for item in &curve_items {
        *seen.entry(item.mnemonic.clone()).or_default() += 1;
    }
    let mut counter: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    for item in curve_items.iter_mut() {
        if seen.get(&item.mnemonic).copied().unwrap_or(0) > 1 {
            let n = counter.entry(item.mnemonic.clone()).or_default();
            *n += 1;
            warnings.push(format!(
                "{path}, line {}: the mnemonic {} appears more than once in ~C; this one is named {}:{n}",
                item.line, item.mnemonic, item.mnemonic
            ));
            item.mnemonic = format!("{}:{n}", item.mnemonic);
        }
    }
    let index = &curve_items[0];
    // Index unit: from the index curve, else from STRT.
    let strt = find(&well, "STRT");
    let index_unit = if !index.unit.is_empty() {
        index.unit.clone()
    } else {
        strt.as_ref().map(|s| s.unit.clone()).unwrap_or_default()
    };
    if is_time_index(&index.mnemonic, &index_unit) {
        return Err(syntax(
            index.line,
            format!(
                "the index is {} ({}), a time: curves are placed on section heights, so the first ~C curve \
                 must be a depth or height in M or FT",
                index.mnemonic,
                if index_unit.is_empty() { "no unit" } else { &index_unit }
            ),
        ));
    }
    let factor = index_unit_factor(&index_unit).ok_or_else(|| {
        syntax(
            index.line,
            format!(
                "index {} has unit {index_unit:?}, not a length unit; the first ~C curve must be a depth or \
                 height in M or FT (also F, CM, .1IN)",
                index.mnemonic
            ),
        )
    })?;
    let null_value = match find(&well, "NULL") {
        Some(n) if !n.value.is_empty() => {
            let text = n.value.replace(',', ".");
            Some(
                text.parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(|| syntax(n.line, format!("NULL value: {:?} is not a number", n.value)))?,
            )
        }
        _ => {
            let line = find(&well, "NULL").map_or(v_line, |n| n.line);
            warnings.push(format!(
                "{path}, line {line}: no NULL value in ~W, so no reading is taken as missing (values such as \
                 -999.25 are kept as numbers)"
            ));
            None
        }
    };
    let ncurves = curve_items.len();
    // Tokens of each data line.
    let mut markers: Option<(usize, String, usize)> = None;
    let mut commas: Option<(usize, String, usize)> = None;
    let mut lines: Vec<(usize, Vec<Option<f64>>)> = Vec::with_capacity(data_lines.len());
    for &(line, raw) in &data_lines {
        let clean = raw.replace('\u{1a}', "");
        let mut values = Vec::new();
        for t in clean.split_whitespace() {
            let note = |slot: &mut Option<(usize, String, usize)>| match slot {
                Some((_, _, n)) => *n += 1,
                None => *slot = Some((line, t.to_string(), 1)),
            };
            values.push(match parse_token(t, line, path)? {
                Token::Value(v) => Some(v),
                Token::Comma(v) => {
                    note(&mut commas);
                    Some(v)
                }
                Token::Marker => {
                    note(&mut markers);
                    None
                }
            });
        }
        if !values.is_empty() {
            lines.push((line, values));
        }
    }
    if lines.is_empty() {
        return Err(missing("the ~A section holds no data".into()));
    }
    let wrapped = wrapped.unwrap_or_else(|| {
        let guess = ncurves > 1 && lines[0].1.len() == 1;
        warnings.push(format!(
            "{path}, line {v_line}: ~V has no WRAP line; the data look {}",
            if guess { "wrapped (index alone on a line)" } else { "unwrapped (one line per depth)" }
        ));
        guess
    });
    // Rows: (line of the record, values).
    let mut rows: Vec<(usize, Vec<Option<f64>>)> = Vec::new();
    let mut columns = ncurves;
    if wrapped {
        let mut current: Vec<Option<f64>> = Vec::new();
        let mut record_line = 0;
        for (line, tokens) in lines {
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
            current.extend(tokens);
            if current.len() > ncurves {
                return Err(syntax(
                    line,
                    format!("wrapped data: the record starting on line {record_line} has more than {ncurves} values (one per ~C curve)"),
                ));
            }
            if current.len() == ncurves {
                rows.push((record_line, std::mem::take(&mut current)));
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
        let first = lines[0].1.len();
        for (line, tokens) in lines {
            if tokens.len() != first {
                return Err(syntax(
                    line,
                    format!("expected {first} values (one per ~C curve), found {}", tokens.len()),
                ));
            }
            rows.push((line, tokens));
        }
        if first > ncurves {
            return Err(syntax(
                rows[0].0,
                format!(
                    "the data lines hold {first} values but ~C lists {ncurves} curves: which column is which cannot \
                     be known; add the missing curves to ~C"
                ),
            ));
        }
        if first < ncurves {
            let empty: Vec<String> =
                curve_items[first..].iter().map(|c| format!("{} (line {})", c.mnemonic, c.line)).collect();
            warnings.push(format!(
                "{path}, line {}: ~C lists {ncurves} curves but each data line holds {first} values; the values are \
                 given to the first {first} curves in order and {} {} no data",
                rows[0].0,
                empty.join(", "),
                if empty.len() == 1 { "has" } else { "have" }
            ));
            columns = first;
        }
    }
    if let Some((line, token, n)) = markers {
        warnings.push(format!(
            "{path}, line {line}: {token:?} read as a missing value (NULL){}",
            if n > 1 { format!("; {} more such values on later lines", n - 1) } else { String::new() }
        ));
    }
    if let Some((line, token, n)) = commas {
        warnings.push(format!(
            "{path}, line {line}: {token:?} read with a decimal comma{}",
            if n > 1 { format!("; {} more such values on later lines", n - 1) } else { String::new() }
        ));
    }
    let mut index_values = Vec::with_capacity(rows.len());
    for (line, row) in &rows {
        match row[0] {
            Some(v) if null_value != Some(v) => index_values.push(v),
            _ => return Err(syntax(*line, "the index (depth) value is missing (NULL) on this line".into())),
        }
    }
    let is_null = |v: f64| null_value == Some(v);
    let index_m = index_values.iter().map(|d| d * factor).collect();
    let values = (1..ncurves)
        .map(|k| {
            rows.iter().map(|(_, r)| if k < columns { r[k].filter(|v| !is_null(*v)) } else { None }).collect()
        })
        .collect();
    warnings.extend(header_warnings(path, &well, &index_unit, &index_values));
    Ok(LasFile {
        warnings,
        version: version_text,
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
