//! The bed-table cells of the field record (what was taken and seen at a bed beyond its rock):
//! samples with their kind and height, photographs with their image files, trace and body
//! fossils, bioturbation index, Munsell colour, soil horizon, drainage, lithofacies code and
//! slope distance. Each cell is read with a message saying what would be valid, and written back
//! in the form it is read in, so that a table reads back to the same beds. `docs/notation.md`
//! and the README's CSV section document the cells.

use super::csv_rows::{escape_formula, unescape_formula};
use crate::model::shorthand::length;
use crate::model::vocab::{Drainage, SampleKind};
use crate::model::{FaciesCode, LengthUnit, Munsell, Photo, Sample, SoilHorizon};

/// Codes of sample kinds typed in brackets after a sample id (`SC-4 (dz)`); the full names
/// (`detrital zircon`) read too.
pub const SAMPLE_KIND_CODES: &[(&str, SampleKind)] = &[
    ("hs", SampleKind::HandSpecimen),
    ("ts", SampleKind::ThinSection),
    ("pal", SampleKind::Palynology),
    ("dz", SampleKind::DetritalZircon),
    ("gc", SampleKind::Geochemistry),
    ("gs", SampleKind::GrainSizeAnalysis),
    ("pm", SampleKind::Paleomagnetism),
    ("c14", SampleKind::Radiocarbon),
    ("lum", SampleKind::Luminescence),
    ("o", SampleKind::Other),
];

/// Codes of the drainage classes (initials of the Soil Survey Manual's class names); the full
/// names read too.
pub const DRAINAGE_CODES: &[(&str, Drainage)] = &[
    ("wd", Drainage::WellDrained),
    ("mwd", Drainage::ModeratelyWellDrained),
    ("spd", Drainage::SomewhatPoorlyDrained),
    ("pd", Drainage::PoorlyDrained),
    ("vpd", Drainage::VeryPoorlyDrained),
];

/// `code name, code name …` for messages.
fn code_list<T: Copy>(codes: &[(&str, T)], name: impl Fn(T) -> &'static str) -> String {
    codes.iter().map(|(c, t)| format!("{c} ({})", name(*t))).collect::<Vec<_>>().join(", ")
}

/// The kind codes listed for messages and documentation: `hs (hand specimen), ts (thin section) …`.
pub fn sample_kind_codes() -> String {
    code_list(SAMPLE_KIND_CODES, SampleKind::name)
}

/// The drainage codes listed for messages and documentation.
pub fn drainage_codes() -> String {
    code_list(DRAINAGE_CODES, Drainage::name)
}

/// A sample kind by code or full name.
fn sample_kind(text: &str) -> Option<SampleKind> {
    let t = text.trim();
    SAMPLE_KIND_CODES
        .iter()
        .find(|(c, _)| c.eq_ignore_ascii_case(t))
        .map(|(_, k)| *k)
        .or_else(|| SampleKind::parse(t))
}

/// The code a sample kind is written with.
fn sample_kind_code(kind: SampleKind) -> &'static str {
    SAMPLE_KIND_CODES.iter().find(|(_, k)| *k == kind).map_or("o", |(c, _)| *c)
}

/// The items of a list cell: split on `;`, each trimmed and unescaped (a leading `'` that
/// [`escape_formula`] added), empty ones left out.
pub fn list_items(cell: &str) -> impl Iterator<Item = &str> {
    cell.split(';').map(|s| unescape_formula(s.trim())).filter(|s| !s.is_empty())
}

/// Split `text` into what comes before its last bracketed part and that part's inside, when the
/// text ends with `)` and the brackets balance: `SC-4 (dz @0.4)` gives `SC-4` and `dz @0.4`, and
/// `IMG_7 (photos/a (b).jpg)` gives `IMG_7` and `photos/a (b).jpg`.
fn trailing_bracket(text: &str) -> Option<(&str, &str)> {
    let body = text.strip_suffix(')')?;
    let mut depth = 1usize;
    for (i, c) in body.char_indices().rev() {
        match c {
            ')' => depth += 1,
            '(' => {
                depth -= 1;
                if depth == 0 {
                    return Some((body[..i].trim_end(), &body[i + 1..]));
                }
            }
            _ => {}
        }
    }
    None
}

/// Read a samples cell: samples separated by `;`, each an id optionally followed by its kind and
/// height in brackets — `SC-4 (dz @0.4)`: sample SC-4, for detrital zircon, 0.4 above the bed's
/// base in `unit` (the table's unit; `@40cm` says another). Either may be left out (`SC-5 (ts)`,
/// `SC-6 (@1.2)`, `SC-7`); empty brackets (`SC-8 (a) ()`) keep an id that itself ends in a
/// bracket. Every bad item is reported; the good ones are kept.
pub fn samples(cell: &str, unit: LengthUnit) -> (Vec<Sample>, Vec<String>) {
    let mut out = Vec::new();
    let mut errors = Vec::new();
    for item in list_items(cell) {
        match sample(item, unit) {
            Ok(s) => out.push(s),
            Err(e) => errors.push(e),
        }
    }
    (out, errors)
}

fn sample(item: &str, unit: LengthUnit) -> Result<Sample, String> {
    let Some((id, inside)) = trailing_bracket(item) else { return Ok(Sample::labelled(item)) };
    if id.is_empty() {
        return Err(format!(
            "{item:?} has no sample id before its brackets; write the id first, e.g. SC-4 (dz @0.4)"
        ));
    }
    let mut kind_words: Vec<&str> = Vec::new();
    let mut height_in_bed_m = None;
    for token in inside.split_whitespace().map(|t| t.trim_end_matches(',')).filter(|t| !t.is_empty()) {
        match token.strip_prefix('@') {
            Some(h) => match length(h, unit) {
                Ok(v) if v >= 0.0 => height_in_bed_m = Some(v),
                Ok(_) => {
                    return Err(format!("sample {id}: the height above the bed's base must be ≥ 0, got {h}"))
                }
                Err(e) => return Err(format!("sample {id}: height after @: {e}")),
            },
            None => kind_words.push(token),
        }
    }
    let kind = if kind_words.is_empty() {
        None
    } else {
        let words = kind_words.join(" ");
        Some(sample_kind(&words).ok_or_else(|| {
            format!(
                "sample {id}: {words:?} is not a sample kind; write one of {} (or its full name), and @ \
                 before a height, e.g. SC-4 (dz @0.4)",
                sample_kind_codes()
            )
        })?)
    };
    Ok(Sample { id: id.to_string(), kind, height_in_bed_m })
}

/// Samples written back in the cell's form (`SC-4 (dz @0.4);SC-5`), the height in `unit`.
pub fn samples_code(samples: &[Sample], unit: LengthUnit) -> String {
    samples
        .iter()
        .map(|s| {
            let mut details: Vec<String> = Vec::new();
            if let Some(k) = s.kind {
                details.push(sample_kind_code(k).to_string());
            }
            if let Some(h) = s.height_in_bed_m {
                // Full precision, as the thickness column is written, so the height reads back.
                details.push(format!("@{}", unit.from_metres(h)));
            }
            escape_formula(&with_details(&s.id, &details.join(" ")))
        })
        .collect::<Vec<_>>()
        .join(";")
}

/// `name (details)`, or `name` alone; a name that ends in `)` gets empty brackets after it when
/// it has no details, so that the reader does not take its own bracket for details.
fn with_details(name: &str, details: &str) -> String {
    if !details.is_empty() {
        format!("{name} ({details})")
    } else if name.ends_with(')') {
        format!("{name} ()")
    } else {
        name.to_string()
    }
}

/// Read a photos cell: references separated by `;`, each the camera's file name or number,
/// optionally followed by the path of the image file in brackets: `IMG_2041; IMG_2042
/// (photos/IMG_2042.jpg)`. A path is absolute or relative to the file that holds the section.
pub fn photos(cell: &str) -> Vec<Photo> {
    list_items(cell)
        .map(|item| match trailing_bracket(item) {
            Some((reference, file)) if !reference.is_empty() => Photo {
                reference: reference.to_string(),
                file: Some(file.trim()).filter(|f| !f.is_empty()).map(str::to_string),
            },
            _ => Photo { reference: item.to_string(), file: None },
        })
        .collect()
}

/// Photos written back in the cell's form.
pub fn photos_code(photos: &[Photo]) -> String {
    photos
        .iter()
        .map(|p| escape_formula(&with_details(&p.reference, p.file.as_deref().unwrap_or(""))))
        .collect::<Vec<_>>()
        .join(";")
}

/// Names separated by `;` (trace fossils, body fossils).
pub fn names(cell: &str) -> Vec<String> {
    list_items(cell).map(str::to_string).collect()
}

/// Names written back in the cell's form.
pub fn names_code(names: &[String]) -> String {
    names.iter().map(|n| escape_formula(n)).collect::<Vec<_>>().join(";")
}

/// Read a bioturbation index: 0–6 (Taylor & Goldring 1993), optionally after `BI` (`BI 3`).
pub fn bioturbation_index(cell: &str) -> Result<u8, String> {
    let t = cell.trim();
    let number =
        t.strip_prefix("BI").or_else(|| t.strip_prefix("bi")).or_else(|| t.strip_prefix("Bi")).unwrap_or(t);
    match number.trim().parse::<u8>() {
        Ok(v) if v <= 6 => Ok(v),
        _ => Err(format!(
            "{t:?} is not a bioturbation index; write a whole number from 0 (no bioturbation) to 6 (completely \
             bioturbated), Taylor & Goldring 1993, e.g. 2 or BI 2"
        )),
    }
}

/// Read a Munsell colour notation (`10YR 5/4`, `N 7/`).
pub fn munsell(cell: &str) -> Result<Munsell, String> {
    Munsell::parse(cell).map_err(|e| e.to_string())
}

/// Read a soil-horizon designation (`Bt`, `Bk2`, `2Bg`).
pub fn soil_horizon(cell: &str) -> Result<SoilHorizon, String> {
    SoilHorizon::parse(cell).map_err(|e| e.to_string())
}

/// Read a drainage class by code (`pd`) or name (`poorly drained`).
pub fn drainage(cell: &str) -> Result<Drainage, String> {
    let t = cell.trim();
    DRAINAGE_CODES
        .iter()
        .find(|(c, _)| c.eq_ignore_ascii_case(t))
        .map(|(_, d)| *d)
        .or_else(|| Drainage::parse(t))
        .ok_or_else(|| format!("{t:?} is not a drainage class; write one of {}", drainage_codes()))
}

/// Read a lithofacies code (Miall 1978, 1996): `St`, `Fsm`; the first letter's case is forgiven.
pub fn facies(cell: &str) -> Result<FaciesCode, String> {
    FaciesCode::parse(cell).ok_or_else(|| {
        format!(
            "{:?} is not a lithofacies code; valid codes (Miall 1978, 1996) are {}; leave the cell empty to keep the \
             suggested code",
            cell.trim(),
            FaciesCode::valid_list()
        )
    })
}

/// Read a slope distance: a length in `unit` (or with `m`, `cm`, `ft` after it) greater than 0.
pub fn slope_distance(cell: &str, unit: LengthUnit) -> Result<f64, String> {
    match length(cell, unit) {
        Ok(v) if v > 0.0 => Ok(v),
        Ok(_) => Err(format!("must be > 0, got {}", cell.trim())),
        Err(e) => Err(e.to_string()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn drainage_code(d: Drainage) -> &'static str {
        DRAINAGE_CODES.iter().find(|(_, x)| *x == d).map_or("", |(c, _)| *c)
    }

    #[test]
    fn samples_read_with_kind_and_height_in_the_tables_unit() {
        let (got, errors) =
            samples("SC-1 (dz @0.4); SC-2 (thin section); SC-3 (@40cm); SC-4", LengthUnit::Metre);
        assert!(errors.is_empty(), "{errors:?}");
        assert_eq!(got.len(), 4);
        assert_eq!(
            (got[0].id.as_str(), got[0].kind, got[0].height_in_bed_m),
            ("SC-1", Some(SampleKind::DetritalZircon), Some(0.4))
        );
        assert_eq!(got[1].kind, Some(SampleKind::ThinSection));
        assert_eq!(got[2].height_in_bed_m, Some(0.4));
        assert_eq!(got[3], Sample::labelled("SC-4"));
        // In feet: 1 ft = 0.3048 m (1959 international yard and pound agreement).
        let (ft, _) = samples("P-1 (pal @2)", LengthUnit::Foot);
        assert!((ft[0].height_in_bed_m.unwrap_or(0.0) - 0.6096).abs() < 1e-12);
        assert_eq!(samples_code(&got, LengthUnit::Metre), "SC-1 (dz @0.4);SC-2 (ts);SC-3 (@0.4);SC-4");
    }

    #[test]
    fn every_sample_kind_and_drainage_code_reads_back() {
        for k in SampleKind::ALL {
            assert_eq!(sample_kind(sample_kind_code(*k)), Some(*k));
            assert_eq!(sample_kind(k.name()), Some(*k));
        }
        assert_eq!(SAMPLE_KIND_CODES.len(), SampleKind::ALL.len());
        for d in Drainage::ALL {
            assert_eq!(drainage(drainage_code(*d)), Ok(*d));
            assert_eq!(drainage(d.name()), Ok(*d));
        }
        assert_eq!(DRAINAGE_CODES.len(), Drainage::ALL.len());
    }

    #[test]
    fn bad_samples_are_named_and_the_good_ones_kept() {
        let (got, errors) = samples("A (dz); B (zircons); (ts); C (@-1); D (@x)", LengthUnit::Metre);
        assert_eq!(got.len(), 1);
        assert_eq!(errors.len(), 4, "{errors:?}");
        assert!(
            errors[0].contains("\"zircons\" is not a sample kind")
                && errors[0].contains("dz (detrital zircon)")
        );
        assert!(errors[1].contains("no sample id"));
        assert!(errors[2].contains("≥ 0"));
        assert!(errors[3].contains("not a length"));
    }

    #[test]
    fn brackets_in_names_survive_a_round_trip() {
        let odd = vec![Sample::labelled("SC-9 (dup)"), Sample::labelled("=x"), Sample::labelled("f(x)")];
        let code = samples_code(&odd, LengthUnit::Metre);
        assert_eq!(code, "SC-9 (dup) ();'=x;f(x) ()");
        assert_eq!(samples(&code, LengthUnit::Metre), (odd, vec![]));
        let photos_in = vec![
            Photo { reference: "IMG_7".into(), file: Some("photos/a (b).jpg".into()) },
            Photo { reference: "roll 3 #12".into(), file: None },
            Photo { reference: "(spare)".into(), file: None },
        ];
        let code = photos_code(&photos_in);
        assert_eq!(code, "IMG_7 (photos/a (b).jpg);roll 3 #12;(spare) ()");
        assert_eq!(photos(&code), photos_in);
    }

    #[test]
    fn single_value_cells_say_what_is_valid() {
        assert_eq!(bioturbation_index("BI 3"), Ok(3));
        assert_eq!(bioturbation_index("0"), Ok(0));
        assert!(bioturbation_index("7")
            .expect_err("7 is past the scale")
            .contains("0 (no bioturbation) to 6"));
        assert!(munsell("10YR 11/4").is_err());
        assert_eq!(munsell("10yr 5/4").map(|m| m.to_string()), Ok("10YR 5/4".to_string()));
        assert!(facies("Sx").expect_err("unknown").contains("St, Sp"));
        assert_eq!(facies("st"), Ok(FaciesCode::St));
        assert!(drainage("soggy").expect_err("unknown").contains("pd (poorly drained)"));
        assert!(soil_horizon("bt").is_err());
        assert_eq!(slope_distance("3.5", LengthUnit::Metre), Ok(3.5));
        assert!(slope_distance("0", LengthUnit::Metre).is_err());
        assert!(slope_distance("far", LengthUnit::Metre).is_err());
    }
}
