//! Which column of an imported table holds which field of a bed: matched from the header by a
//! table of the variants people write (units in brackets, capitals, spaces, "thick", "rock type",
//! "grain size base", "from"/"to" heights …), or loaded from a saved mapping.
//!
//! The table is documented for users in `docs/import.md`; keep the two in step.

use super::values::GrainUnit;
use crate::model::LengthUnit;
use serde::{Deserialize, Serialize};

/// A field of a bed that a column can fill.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Field {
    Thickness,
    /// Height (or depth) of the bed's base: with `To`, instead of a thickness.
    From,
    /// Height (or depth) of the bed's top.
    To,
    Lithology,
    /// Grain size of the whole bed, or `base → top` in one cell.
    Grain,
    GrainBase,
    GrainTop,
    BaseContact,
    BaseRelief,
    /// The geologist's rank of the bed's base (storey surface, body base, within storey).
    BaseRank,
    Structures,
    Paleosol,
    PaleosolFeatures,
    CarbonateStage,
    Paleocurrents,
    Surface,
    SurfaceKind,
    Colour,
    Fossils,
    Samples,
    Notes,
}

impl Field {
    /// Every field, in the order the mapping is printed.
    pub const ALL: [Field; 21] = [
        Field::Thickness,
        Field::From,
        Field::To,
        Field::Lithology,
        Field::Grain,
        Field::GrainBase,
        Field::GrainTop,
        Field::BaseContact,
        Field::BaseRelief,
        Field::BaseRank,
        Field::Structures,
        Field::Paleosol,
        Field::PaleosolFeatures,
        Field::CarbonateStage,
        Field::Paleocurrents,
        Field::Surface,
        Field::SurfaceKind,
        Field::Colour,
        Field::Fossils,
        Field::Samples,
        Field::Notes,
    ];

    /// The field's name as printed and saved (`grain_base`).
    pub fn name(self) -> &'static str {
        match self {
            Field::Thickness => "thickness",
            Field::From => "from",
            Field::To => "to",
            Field::Lithology => "lithology",
            Field::Grain => "grain",
            Field::GrainBase => "grain_base",
            Field::GrainTop => "grain_top",
            Field::BaseContact => "base_contact",
            Field::BaseRelief => "base_relief",
            Field::BaseRank => "base_rank",
            Field::Structures => "structures",
            Field::Paleosol => "paleosol",
            Field::PaleosolFeatures => "paleosol_features",
            Field::CarbonateStage => "carbonate_stage",
            Field::Paleocurrents => "paleocurrents",
            Field::Surface => "surface",
            Field::SurfaceKind => "surface_kind",
            Field::Colour => "colour",
            Field::Fossils => "fossils",
            Field::Samples => "samples",
            Field::Notes => "notes",
        }
    }

    /// A field by its printed name.
    pub fn parse(text: &str) -> Option<Field> {
        let t = crate::model::grain::normalise_term(text);
        Field::ALL.iter().copied().find(|f| f.name() == t)
    }
}

/// Header variants (after [`fold_header`]: lower case, units and punctuation removed, words
/// separated by one space) and the field each names. Common practice in logging sheets and the
/// bed table's own column names; no single published list.
pub const HEADER_VARIANTS: [(&str, Field); 89] = [
    ("thickness", Field::Thickness),
    ("thick", Field::Thickness),
    ("thk", Field::Thickness),
    ("thickn", Field::Thickness),
    ("bed thickness", Field::Thickness),
    ("mächtigkeit", Field::Thickness),
    ("epaisseur", Field::Thickness),
    ("épaisseur", Field::Thickness),
    ("true thickness", Field::Thickness),
    ("from", Field::From),
    ("base", Field::From),
    ("bottom", Field::From),
    ("base height", Field::From),
    ("height base", Field::From),
    ("height from", Field::From),
    ("from height", Field::From),
    ("depth from", Field::From),
    ("from depth", Field::From),
    ("to", Field::To),
    ("top", Field::To),
    ("top height", Field::To),
    ("height top", Field::To),
    ("height to", Field::To),
    ("to height", Field::To),
    ("depth to", Field::To),
    ("to depth", Field::To),
    ("lithology", Field::Lithology),
    ("lith", Field::Lithology),
    ("litho", Field::Lithology),
    ("rock type", Field::Lithology),
    ("rocktype", Field::Lithology),
    ("rock", Field::Lithology),
    ("lithotype", Field::Lithology),
    ("lithologie", Field::Lithology),
    ("grain", Field::Grain),
    ("grain size", Field::Grain),
    ("grainsize", Field::Grain),
    ("gs", Field::Grain),
    ("grain size class", Field::Grain),
    ("korngröße", Field::Grain),
    ("korngrösse", Field::Grain),
    ("granulometrie", Field::Grain),
    ("grain base", Field::GrainBase),
    ("grain size base", Field::GrainBase),
    ("base grain size", Field::GrainBase),
    ("grain size bottom", Field::GrainBase),
    ("basal grain size", Field::GrainBase),
    ("grain top", Field::GrainTop),
    ("grain size top", Field::GrainTop),
    ("top grain size", Field::GrainTop),
    ("base contact", Field::BaseContact),
    ("basal contact", Field::BaseContact),
    ("contact", Field::BaseContact),
    ("lower contact", Field::BaseContact),
    ("base relief", Field::BaseRelief),
    ("relief", Field::BaseRelief),
    ("erosional relief", Field::BaseRelief),
    ("structures", Field::Structures),
    ("structure", Field::Structures),
    ("sedimentary structures", Field::Structures),
    ("sed structures", Field::Structures),
    ("paleosol", Field::Paleosol),
    ("palaeosol", Field::Paleosol),
    ("paleosol development", Field::Paleosol),
    ("paleosol features", Field::PaleosolFeatures),
    ("palaeosol features", Field::PaleosolFeatures),
    ("pedogenic features", Field::PaleosolFeatures),
    ("carbonate stage", Field::CarbonateStage),
    ("paleocurrents", Field::Paleocurrents),
    ("palaeocurrents", Field::Paleocurrents),
    ("paleocurrent", Field::Paleocurrents),
    ("palaeocurrent", Field::Paleocurrents),
    ("paleoflow", Field::Paleocurrents),
    ("base rank", Field::BaseRank),
    ("rank of base", Field::BaseRank),
    ("surface", Field::Surface),
    ("surface kind", Field::SurfaceKind),
    ("colour", Field::Colour),
    ("color", Field::Colour),
    ("fossils", Field::Fossils),
    ("samples", Field::Samples),
    ("sample", Field::Samples),
    ("notes", Field::Notes),
    ("remarks", Field::Notes),
    ("comments", Field::Notes),
    ("comment", Field::Notes),
    ("description", Field::Notes),
    ("bemerkung", Field::Notes),
    ("bemerkungen", Field::Notes),
];

/// Headers read as "not a field" without a remark (bed numbers).
const IGNORED_HEADERS: [&str; 7] = ["", "no", "nr", "bed", "bed no", "id", "bed number"];

/// Unit words recognised in headers.
const UNIT_WORDS: [&str; 11] =
    ["m", "cm", "ft", "feet", "metres", "meters", "metre", "meter", "mm", "phi", "φ"];

/// A header folded for look-up, with the unit it names in brackets or as a last word
/// (`Thickness (m)` → `thickness`, `m`; `thickness_cm` → `thickness`, `cm`; `thick.` → `thick`).
pub fn fold_header(header: &str) -> (String, Option<String>) {
    let mut text = header.trim().trim_start_matches('\u{feff}').to_lowercase();
    let mut unit = None;
    // A unit in brackets: "(m)", "[cm]", "{ft}".
    for (open, close) in [('(', ')'), ('[', ']'), ('{', '}')] {
        if let (Some(a), Some(b)) = (text.find(open), text.rfind(close)) {
            if a < b {
                let inner = text[a + 1..b].trim().to_string();
                // A note in brackets that is not a unit ("Grain size (top)") stays as words.
                let keep = if UNIT_WORDS.contains(&inner.as_str()) {
                    unit = Some(inner);
                    String::new()
                } else {
                    inner
                };
                text = format!("{} {keep} {}", &text[..a], &text[b + 1..]);
            }
        }
    }
    let words: Vec<String> = text
        .split(|c: char| !c.is_alphanumeric() && c != '#')
        .filter(|w| !w.is_empty())
        .map(str::to_string)
        .collect();
    let mut words = words;
    // A last word that is a unit ("thickness_m", "height in m", "grain size mm").
    if words.len() > 1 {
        if let Some(last) = words.last() {
            if UNIT_WORDS.contains(&last.as_str()) {
                unit = unit.or_else(|| Some(last.clone()));
                words.pop();
                if words.last().is_some_and(|w| w == "in") {
                    words.pop();
                }
            }
        }
    }
    (words.join(" "), unit)
}

/// The field a header names, by `HEADER_VARIANTS`.
pub fn field_of_header(header: &str) -> Option<Field> {
    let (folded, _) = fold_header(header);
    HEADER_VARIANTS.iter().find(|(k, _)| *k == folded).map(|(_, f)| *f)
}

/// Length unit named by a header's unit text.
fn length_unit(unit: &str) -> Option<LengthUnit> {
    match unit.trim() {
        "m" | "metres" | "meters" | "metre" | "meter" => Some(LengthUnit::Metre),
        "cm" => Some(LengthUnit::Centimetre),
        "ft" | "feet" | "foot" => Some(LengthUnit::Foot),
        _ => None,
    }
}

/// One column of the table and the field it fills (`None`: not read).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MappedColumn {
    /// The header as written in the file.
    pub header: String,
    pub field: Option<Field>,
}

/// Which column fills which field, and how to read the numbers. Saved as JSON for `--mapping`
/// and for the window's next import.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ColumnMapping {
    /// Always `MAPPING_FORMAT`.
    pub format: String,
    /// One per header, in the table's order.
    pub columns: Vec<MappedColumn>,
    /// Unit of thickness, from and to.
    pub length_unit: LengthUnit,
    /// Unit of bare numbers in grain-size columns, if the header named one.
    #[serde(default)]
    pub grain_unit: Option<GrainUnit>,
    /// The log is written from the top down: rows are reversed (from/to are then depths).
    #[serde(default)]
    pub top_first: bool,
}

/// The `format` of a saved mapping.
pub const MAPPING_FORMAT: &str = "aggrade import mapping 1";

impl ColumnMapping {
    /// The column index of a field, if mapped.
    pub fn column_of(&self, field: Field) -> Option<usize> {
        self.columns.iter().position(|c| c.field == Some(field))
    }

    /// One line per mapped column, then the ignored ones: what the importer prints.
    pub fn describe(&self) -> String {
        let mut out = String::new();
        for c in &self.columns {
            if let Some(f) = c.field {
                let unit = match f {
                    Field::Thickness | Field::From | Field::To => {
                        format!(" (in {})", self.length_unit.name())
                    }
                    Field::Grain | Field::GrainBase | Field::GrainTop => match self.grain_unit {
                        Some(GrainUnit::Mm) => " (numbers in mm)".to_string(),
                        Some(GrainUnit::Phi) => " (numbers in phi)".to_string(),
                        None => String::new(),
                    },
                    _ => String::new(),
                };
                out.push_str(&format!("  {:?} → {}{unit}\n", c.header, f.name()));
            }
        }
        let ignored: Vec<String> =
            self.columns.iter().filter(|c| c.field.is_none()).map(|c| format!("{:?}", c.header)).collect();
        if !ignored.is_empty() {
            out.push_str(&format!("  not read: {}\n", ignored.join(", ")));
        }
        if self.top_first {
            out.push_str("  rows reversed: the log is written from the top down\n");
        }
        out
    }

    /// What is missing or contradictory for a section to be built; empty when usable.
    pub fn problems(&self) -> Vec<String> {
        let mut out = Vec::new();
        let has = |f| self.column_of(f).is_some();
        for f in Field::ALL {
            let n = self.columns.iter().filter(|c| c.field == Some(f)).count();
            if n > 1 {
                let names: Vec<String> = self
                    .columns
                    .iter()
                    .filter(|c| c.field == Some(f))
                    .map(|c| format!("{:?}", c.header))
                    .collect();
                out.push(format!("{} is given by {} columns ({}); keep one", f.name(), n, names.join(", ")));
            }
        }
        let heights = has(Field::From) || has(Field::To);
        if !has(Field::Thickness) && !heights {
            out.push("no thickness column, and no from/to (base/top height) columns".to_string());
        }
        if !has(Field::Thickness) && heights && has(Field::From) != has(Field::To) {
            out.push("a from (base) or to (top) height column alone: give both, or a thickness".to_string());
        }
        if !has(Field::Lithology) {
            out.push("no lithology column".to_string());
        }
        if has(Field::Grain) && (has(Field::GrainBase) || has(Field::GrainTop)) {
            out.push("grain and grain base/top columns together; keep one kind".to_string());
        }
        out
    }
}

/// Guess a mapping from a header row by `HEADER_VARIANTS`; the length unit comes from the
/// first thickness or height header naming one (metres otherwise).
pub fn guess_mapping(headers: &[String], top_first: bool) -> ColumnMapping {
    let mut length_unit = None;
    let mut grain_unit = None;
    let columns = headers
        .iter()
        .map(|h| {
            let (folded, unit) = fold_header(h);
            let field = if IGNORED_HEADERS.contains(&folded.as_str()) || folded.starts_with('#') {
                None
            } else {
                HEADER_VARIANTS.iter().find(|(k, _)| *k == folded).map(|(_, f)| *f)
            };
            match (field, unit.as_deref()) {
                (Some(Field::Thickness | Field::From | Field::To), Some(u)) => {
                    length_unit = length_unit.or_else(|| length_unit_of(u));
                }
                (Some(Field::Grain | Field::GrainBase | Field::GrainTop), Some("mm")) => {
                    grain_unit = Some(GrainUnit::Mm)
                }
                (Some(Field::Grain | Field::GrainBase | Field::GrainTop), Some("phi" | "φ")) => {
                    grain_unit = Some(GrainUnit::Phi)
                }
                _ => {}
            }
            MappedColumn { header: h.clone(), field }
        })
        .collect();
    ColumnMapping {
        format: MAPPING_FORMAT.to_string(),
        columns,
        length_unit: length_unit.unwrap_or(LengthUnit::Metre),
        grain_unit,
        top_first,
    }
}

fn length_unit_of(unit: &str) -> Option<LengthUnit> {
    length_unit(unit)
}

/// Fit a saved mapping to a table's headers: columns are matched by header text (trimmed,
/// case-insensitive). A saved column the table lacks is an error naming the headers found;
/// a table column the mapping does not name is not read.
pub fn fit_saved(saved: &ColumnMapping, headers: &[String]) -> Result<ColumnMapping, String> {
    let same = |a: &str, b: &str| a.trim().trim_start_matches('\u{feff}').eq_ignore_ascii_case(b.trim());
    let missing: Vec<String> = saved
        .columns
        .iter()
        .filter(|c| c.field.is_some() && !headers.iter().any(|h| same(h, &c.header)))
        .map(|c| format!("{:?}", c.header))
        .collect();
    if !missing.is_empty() {
        return Err(format!(
            "the saved mapping names column(s) {} that the table does not have; headers found: {}",
            missing.join(", "),
            quoted(headers)
        ));
    }
    let columns = headers
        .iter()
        .map(|h| MappedColumn {
            header: h.clone(),
            field: saved.columns.iter().find(|c| same(h, &c.header)).and_then(|c| c.field),
        })
        .collect();
    Ok(ColumnMapping { columns, ..saved.clone() })
}

/// Headers quoted and joined for messages.
pub fn quoted(headers: &[String]) -> String {
    if headers.is_empty() {
        return "none".to_string();
    }
    headers.iter().map(|h| format!("{h:?}")).collect::<Vec<_>>().join(", ")
}

/// Read a saved mapping (JSON).
pub fn mapping_from_json(text: &str) -> Result<ColumnMapping, String> {
    let m: ColumnMapping =
        serde_json::from_str(text).map_err(|e| format!("not a saved import mapping: {e}"))?;
    if m.format != MAPPING_FORMAT {
        return Err(format!("format is {:?}; expected {MAPPING_FORMAT:?}", m.format));
    }
    Ok(m)
}

/// A mapping as JSON to save.
pub fn mapping_to_json(m: &ColumnMapping) -> String {
    let mut s = serde_json::to_string_pretty(m).unwrap_or_default();
    s.push('\n');
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    fn h(list: &[&str]) -> Vec<String> {
        list.iter().map(|s| s.to_string()).collect()
    }

    #[test]
    fn header_variants_fold_to_fields() {
        assert_eq!(fold_header("Thickness (m)"), ("thickness".into(), Some("m".into())));
        assert_eq!(fold_header("thickness_cm"), ("thickness".into(), Some("cm".into())));
        assert_eq!(fold_header("Grain size - Base"), ("grain size base".into(), None));
        assert_eq!(field_of_header("THICK."), Some(Field::Thickness));
        assert_eq!(field_of_header("Rock type"), Some(Field::Lithology));
        assert_eq!(field_of_header("Grain size (top)"), Some(Field::GrainTop));
        assert_eq!(field_of_header("grain_size_top"), Some(Field::GrainTop));
        assert_eq!(field_of_header("Height from [m]"), Some(Field::From));
        assert_eq!(field_of_header("weather"), None);
        // Every column name of the bed table itself maps.
        for name in crate::io::bed_table::KNOWN_COLUMNS {
            assert!(field_of_header(name).is_some(), "{name}");
        }
    }

    #[test]
    fn guessed_mapping_takes_units_from_headers() {
        let m = guess_mapping(&h(&["#", "Thickness (cm)", "Lithology", "Grain size (mm)", "Notes"]), false);
        assert_eq!(m.length_unit, LengthUnit::Centimetre);
        assert_eq!(m.grain_unit, Some(GrainUnit::Mm));
        assert_eq!(m.column_of(Field::Lithology), Some(2));
        assert!(m.problems().is_empty());
        let bad = guess_mapping(&h(&["Dicke", "Gestein"]), false);
        assert_eq!(bad.problems().len(), 2, "{:?}", bad.problems());
    }

    #[test]
    fn saved_mapping_round_trips_and_fits_by_header() {
        let mut m = guess_mapping(&h(&["Dicke", "Gestein", "Wetter"]), true);
        m.columns[0].field = Some(Field::Thickness);
        m.columns[1].field = Some(Field::Lithology);
        let back = mapping_from_json(&mapping_to_json(&m)).expect("reads back");
        assert_eq!(back, m);
        let fitted = fit_saved(&back, &h(&["gestein", "DICKE"])).expect("fits");
        assert_eq!(fitted.column_of(Field::Thickness), Some(1));
        let e = fit_saved(&back, &h(&["Gestein"])).expect_err("Dicke missing");
        assert!(e.contains("\"Dicke\"") && e.contains("headers found: \"Gestein\""), "{e}");
    }
}
