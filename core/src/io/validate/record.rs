//! Validation of the field record: what a bed records beyond its rock (samples, photos,
//! bioturbation index, Munsell colour, fossils, slope distance, list lengths) and how and where
//! a section was measured (uncertainty, bedding, traverse, GPS fixes, channel-body widths). Each
//! broken rule is a [`Problem`] at the field's path; image files that cannot be found are
//! warnings, given by [`missing_photo_files`].

use super::{check_text, show};
use crate::io::limits::{
    ELEVATION_RANGE_M, MAX_BED_THICKNESS_M, MAX_BODY_WIDTH_M, MAX_FIXES_PER_SECTION,
    MAX_RECORD_ITEMS_PER_BED, MAX_RECORD_NAME_CHARS,
};
use crate::io::{Problem, Warning};
use crate::model::{Bed, Munsell, Project, Section};
use std::collections::HashMap;
use std::path::Path;

/// A list longer than [`MAX_RECORD_ITEMS_PER_BED`]; its items are then not checked one by one.
fn too_many(out: &mut Vec<Problem>, at: impl FnOnce() -> String, n: usize, what: &str) -> bool {
    if n > MAX_RECORD_ITEMS_PER_BED {
        out.push(Problem::new(at(), format!("{n} {what}; at most {MAX_RECORD_ITEMS_PER_BED} per bed")));
        true
    } else {
        false
    }
}

/// A short name: not blank, at most [`MAX_RECORD_NAME_CHARS`] characters.
fn check_name(out: &mut Vec<Problem>, at: impl FnOnce() -> String, name: &str, what: &str) {
    let n = name.chars().count();
    if name.trim().is_empty() {
        out.push(Problem::new(at(), format!("must not be empty: give the {what}, or leave the entry out")));
    } else if n > MAX_RECORD_NAME_CHARS {
        out.push(Problem::new(
            at(),
            format!("a {what} of {n} characters; at most {MAX_RECORD_NAME_CHARS} allowed (it is printed beside the column)"),
        ));
    }
}

/// The field record of bed `i` (locations `beds[i].…`).
pub(super) fn bed_record(out: &mut Vec<Problem>, i: usize, bed: &Bed) {
    let at = |field: &str| format!("beds[{i}].{field}");
    too_many(out, || at("paleocurrents"), bed.paleocurrents.len(), "paleocurrent readings");
    if !too_many(out, || at("samples"), bed.samples.len(), "samples") {
        let mut first_with: HashMap<&str, usize> = HashMap::new();
        for (k, s) in bed.samples.iter().enumerate() {
            let sat = |field: &str| format!("beds[{i}].samples[{k}].{field}");
            if s.id.trim().is_empty() {
                out.push(Problem::new(
                    sat("id"),
                    "must not be empty: write the label on the bag (e.g. SC-14)",
                ));
            } else if let Some(first) = first_with.get(s.id.trim()) {
                out.push(Problem::new(
                    sat("id"),
                    format!(
                        "{:?} is already the id of an earlier sample of this bed (samples[{first}]); sample ids must differ",
                        s.id
                    ),
                ));
            } else {
                first_with.insert(s.id.trim(), k);
            }
            check_text(out, || sat("id"), &s.id);
            if let Some(h) = s.height_in_bed_m {
                // Above the bed's top is a warning (see `record_warnings`): an edit of the
                // thickness must not be refused for it.
                if !(h.is_finite() && (0.0..=MAX_BED_THICKNESS_M).contains(&h)) {
                    out.push(Problem::new(
                        sat("height_in_bed_m"),
                        format!(
                            "sample {:?}: the height above the bed's base must be ≥ 0 and ≤ {MAX_BED_THICKNESS_M} m, \
                             got {} m",
                            s.id,
                            show(h)
                        ),
                    ));
                }
            }
        }
    }
    if !too_many(out, || at("photos"), bed.photos.len(), "photos") {
        for (k, p) in bed.photos.iter().enumerate() {
            check_name(out, || format!("beds[{i}].photos[{k}].reference"), &p.reference, "photo reference");
            if let Some(file) = &p.file {
                let fat = format!("beds[{i}].photos[{k}].file");
                if file.trim().is_empty() {
                    out.push(Problem::new(
                        &fat,
                        "must not be empty: give the image file's path, or leave the field out",
                    ));
                }
                check_text(out, || fat, file);
            }
        }
    }
    for (field, names, what) in [
        ("trace_fossils", &bed.trace_fossils, "trace-fossil names"),
        ("body_fossils", &bed.body_fossils, "body-fossil names"),
    ] {
        if !too_many(out, || at(field), names.len(), what) {
            for (k, name) in names.iter().enumerate() {
                check_name(out, || format!("beds[{i}].{field}[{k}]"), name, "fossil name");
            }
        }
    }
    if let Some(bi) = bed.bioturbation_index {
        if bi > 6 {
            out.push(Problem::new(
                at("bioturbation_index"),
                format!("must be a bioturbation index 0–6 (Taylor & Goldring 1993), got {bi}"),
            ));
        }
    }
    if let Some(m) = &bed.munsell {
        // Values set in code rather than read from text are checked as the reader checks text.
        if Munsell::parse(&m.to_string()).as_ref() != Ok(m) {
            out.push(Problem::new(
                at("munsell"),
                format!("{m} is not a Munsell notation (hue value/chroma, e.g. 10YR 5/4)"),
            ));
        }
    }
    check_text(out, || at("lag_composition"), &bed.lag_composition);
    if let Some(d) = bed.slope_distance_m {
        if !(d.is_finite() && d > 0.0 && d <= MAX_BED_THICKNESS_M) {
            out.push(Problem::new(
                at("slope_distance_m"),
                format!("must be > 0 and ≤ {MAX_BED_THICKNESS_M} m, got {}", show(d)),
            ));
        }
    }
}

/// A number within a closed range, else a problem naming the range.
fn in_range(out: &mut Vec<Problem>, at: &str, v: f64, lo: f64, hi: f64, unit: &str) {
    if !(v.is_finite() && (lo..=hi).contains(&v)) {
        out.push(Problem::new(at, format!("must lie between {lo} and {hi}{unit}, got {}", show(v))));
    }
}

/// How and where the section was measured (locations relative to the section).
/// `has_bed` answers whether a bed id is in the section; `None` leaves out the references to beds.
pub(super) fn section_record(
    out: &mut Vec<Problem>,
    section: &Section,
    has_bed: Option<&dyn Fn(crate::model::BedId) -> bool>,
) {
    if let Some(u) = section.thickness_uncertainty_m {
        if !(u.is_finite() && (0.0..=MAX_BED_THICKNESS_M).contains(&u)) {
            out.push(Problem::new(
                "thickness_uncertainty_m",
                format!("must be ≥ 0 and ≤ {MAX_BED_THICKNESS_M} m (the ± of one reading), got {}", show(u)),
            ));
        }
    }
    if let Some(b) = section.bedding {
        in_range(out, "bedding.dip_deg", b.dip_deg, 0.0, 90.0, " degrees");
        in_range(out, "bedding.dip_direction_deg", b.dip_direction_deg, 0.0, 360.0, " degrees");
    }
    if let Some(t) = section.traverse {
        in_range(out, "traverse.slope_deg", t.slope_deg, -90.0, 90.0, " degrees (positive uphill)");
        in_range(out, "traverse.bearing_deg", t.bearing_deg, 0.0, 360.0, " degrees");
    }
    if section.fixes.len() > MAX_FIXES_PER_SECTION {
        out.push(Problem::new(
            "fixes",
            format!("{} GPS fixes; at most {MAX_FIXES_PER_SECTION} per section", section.fixes.len()),
        ));
    } else {
        for (k, f) in section.fixes.iter().enumerate() {
            let at = |field: &str| format!("fixes[{k}].{field}");
            in_range(out, &at("lat_deg"), f.lat_deg, -90.0, 90.0, "");
            in_range(out, &at("lon_deg"), f.lon_deg, -180.0, 180.0, "");
            // Above the section's top is a warning (see `record_warnings`), so that shortening a
            // bed is not refused for it.
            if !(f.height_m.is_finite() && f.height_m >= 0.0) {
                out.push(Problem::new(
                    at("height_m"),
                    format!(
                        "must be a height of 0 m or more above the section's base, got {}",
                        show(f.height_m)
                    ),
                ));
            }
            if let Some(e) = f.elevation_m {
                let (lo, hi) = ELEVATION_RANGE_M;
                in_range(out, &at("elevation_m"), e, lo, hi, " m above sea level");
            }
            check_text(out, || at("note"), &f.note);
        }
    }
    let mut first_for: HashMap<u64, usize> = HashMap::new();
    for (k, b) in section.body_lateral.iter().enumerate() {
        let at = |field: &str| format!("body_lateral[{k}].{field}");
        if has_bed.is_some_and(|f| !f(b.base_bed)) {
            out.push(Problem::new(
                at("base_bed"),
                format!("refers to bed id {}, which is not in this section", b.base_bed.0),
            ));
        } else if let Some(first) = first_for.get(&b.base_bed.0) {
            out.push(Problem::new(
                at("base_bed"),
                format!(
                    "bed id {} already has lateral data in body_lateral[{first}]; keep one",
                    b.base_bed.0
                ),
            ));
        } else {
            first_for.insert(b.base_bed.0, k);
        }
        if let Some(w) = b.width_m {
            if !(w.is_finite() && w > 0.0 && w <= MAX_BODY_WIDTH_M) {
                out.push(Problem::new(
                    at("width_m"),
                    format!("must be > 0 and ≤ {MAX_BODY_WIDTH_M} m, got {}", show(w)),
                ));
            }
        }
        check_text(out, || at("note"), &b.note);
    }
}

/// Inconsistencies of the field record that do not stop a file from being read or saved, so
/// that no edit is refused for them, located relative to the section: a sample above the top of
/// its bed, a GPS fix above the top of the section. (A tolerance of one part in 10⁹ allows for
/// the rounding of a unit conversion.)
pub fn record_warnings(section: &Section) -> Vec<Problem> {
    let mut out = Vec::new();
    for (i, bed) in section.beds.iter().enumerate() {
        let t = bed.thickness_m;
        for (k, s) in bed.samples.iter().enumerate() {
            match s.height_in_bed_m {
                Some(h) if h.is_finite() && t.is_finite() && h > t * (1.0 + 1e-9) => out.push(Problem::new(
                    format!("beds[{i}].samples[{k}].height_in_bed_m"),
                    format!(
                        "sample {:?} is {} m above the bed's base, above its top (the bed is {} m thick); \
                         check the height or the thickness",
                        s.id,
                        show(h),
                        show(t)
                    ),
                )),
                _ => {}
            }
        }
    }
    for (i, bed) in section.beds.iter().enumerate() {
        if let Some(why) = crate::rules::facies::code_against_rock(bed) {
            out.push(Problem::new(format!("beds[{i}].facies"), why));
        }
    }
    let total = section.total_thickness_m();
    for (k, f) in section.fixes.iter().enumerate() {
        if f.height_m.is_finite() && f.height_m > total * (1.0 + 1e-9) {
            out.push(Problem::new(
                format!("fixes[{k}].height_m"),
                format!(
                    "the {} fix is at {} m, above the section's top at {} m; check its height or the thicknesses",
                    f.role.name(),
                    show(f.height_m),
                    show(total)
                ),
            ));
        }
    }
    out
}

/// Warnings on the field record of a file read from `path`, each naming the file, the line and
/// the field (or column): [`record_warnings`] of every section, and photos whose image file
/// cannot be found (the reference is kept, and the file may be on another disk; a relative path
/// is taken from the folder of `path`).
pub fn field_record_warnings(path: &Path, project: &Project) -> Vec<Warning> {
    let folder = path.parent().unwrap_or_else(|| Path::new(""));
    let mut found: Vec<Problem> = Vec::new();
    for (i, s) in project.sections.iter().enumerate() {
        found.extend(record_warnings(s).into_iter().map(|p| p.prefixed(&format!("sections[{i}]."))));
        for (j, b) in s.beds.iter().enumerate() {
            for (k, p) in b.photos.iter().enumerate() {
                let Some(file) = p.file.as_deref().filter(|f| !f.trim().is_empty()) else { continue };
                let image = folder.join(file.trim());
                if !image.exists() {
                    let shown: String = file.chars().take(200).collect();
                    found.push(Problem::new(
                        format!("sections[{i}].beds[{j}].photos[{k}].file"),
                        format!(
                            "no image file at {shown:?} (looked for {}); the photo reference {:?} is kept",
                            image.display(),
                            p.reference
                        ),
                    ));
                }
            }
        }
    }
    if found.is_empty() {
        return Vec::new();
    }
    let text = std::fs::read_to_string(path).unwrap_or_default();
    if crate::io::FileKind::of(path) == Some(crate::io::FileKind::BedTable) {
        // A bed table holds one section: the row gives the line, the field its column.
        let rows = crate::io::read_bed_table(&text, "photos").map(|r| r.lines).unwrap_or_default();
        for p in &mut found {
            let (bed, column) = csv_place(&p.location);
            p.line = bed.and_then(|j| rows.get(j).copied());
            p.location = column;
        }
    } else {
        let paths: Vec<&str> = found.iter().map(|p| p.location.as_str()).collect();
        let at = crate::io::json_scan::lines_of(&text, &paths);
        for p in &mut found {
            p.line = at.get(&p.location).copied();
        }
    }
    found.sort_by_key(|p| p.line);
    found.into_iter().map(|problem| Warning { path: path.to_path_buf(), problem }).collect()
}

/// The bed index and the bed-table column of a path such as `sections[0].beds[3].photos[1].file`
/// (`column photos, photo 2`).
fn csv_place(location: &str) -> (Option<usize>, String) {
    let index = |s: &str, key: &str| -> Option<usize> {
        let rest = &s[s.find(key)? + key.len()..];
        rest[..rest.find(']')?].parse().ok()
    };
    let bed = index(location, "beds[");
    let column = if let Some(k) = index(location, "photos[") {
        format!("column photos, photo {}", k + 1)
    } else if let Some(k) = index(location, "samples[") {
        format!("column samples, sample {}", k + 1)
    } else {
        location.to_string()
    };
    (bed, column)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::io::limits::MAX_STRING_CHARS;
    use crate::io::validate_section;
    use crate::model::{
        BedId, BeddingAttitude, BodyLateral, FixRole, GpsFix, GrainSize, Lithology, Photo, Sample, Traverse,
        WentworthClass,
    };

    fn sand(id: u64, t: f64) -> Bed {
        Bed::new(BedId(id), t, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand)))
    }

    fn locations(s: &Section) -> Vec<String> {
        validate_section(s).into_iter().map(|p| p.location).collect()
    }

    #[test]
    fn a_full_record_within_its_ranges_is_valid() {
        let mut s = Section::new("Corrie Wash");
        let mut b = sand(1, 2.0);
        b.samples = vec![
            Sample { id: "CW-1".into(), kind: None, height_in_bed_m: Some(0.0) },
            Sample { id: "CW-2".into(), kind: None, height_in_bed_m: Some(2.0) },
        ];
        b.photos = vec![Photo { reference: "IMG_1".into(), file: Some("photos/1.jpg".into()) }];
        b.bioturbation_index = Some(6);
        b.munsell = Munsell::parse("10YR 5/4").ok();
        b.slope_distance_m = Some(5.0);
        b.trace_fossils = vec!["Skolithos".into()];
        s.beds = vec![b, sand(2, 1.0)].into();
        s.thickness_uncertainty_m = Some(0.0);
        s.bedding = Some(BeddingAttitude { dip_deg: 90.0, dip_direction_deg: 360.0 });
        s.traverse = Some(Traverse { bearing_deg: 0.0, slope_deg: -90.0 });
        s.fixes = vec![GpsFix {
            role: FixRole::Top,
            height_m: 3.0,
            lat_deg: -90.0,
            lon_deg: 180.0,
            elevation_m: Some(-400.0),
            note: String::new(),
        }];
        s.body_lateral = vec![BodyLateral {
            base_bed: BedId(2),
            width_m: Some(120.0),
            beyond_outcrop: true,
            note: String::new(),
        }];
        assert_eq!(validate_section(&s), vec![]);
    }

    #[test]
    fn every_field_out_of_range_is_named() {
        let mut s = Section::new("Corrie Wash");
        let mut b = sand(1, 2.0);
        b.samples = vec![
            Sample { id: "CW-1".into(), kind: None, height_in_bed_m: Some(2.5) },
            Sample::labelled(" "),
            Sample::labelled("CW-1"),
            Sample { id: "CW-3".into(), kind: None, height_in_bed_m: Some(f64::NAN) },
        ];
        b.photos = vec![Photo { reference: "".into(), file: Some(" ".into()) }];
        b.bioturbation_index = Some(7);
        b.munsell = Some(Munsell { hue_step: 10.0, hue: "YR".into(), value: 12.0, chroma: 4.0 });
        b.slope_distance_m = Some(0.0);
        b.body_fossils = vec!["x".repeat(MAX_RECORD_NAME_CHARS + 1)];
        b.lag_composition = "q".repeat(MAX_STRING_CHARS + 1);
        s.beds = vec![b].into();
        s.thickness_uncertainty_m = Some(-0.1);
        s.bedding = Some(BeddingAttitude { dip_deg: 91.0, dip_direction_deg: -1.0 });
        s.traverse = Some(Traverse { bearing_deg: 361.0, slope_deg: f64::NAN });
        s.fixes = vec![GpsFix {
            role: FixRole::Base,
            height_m: 2.5,
            lat_deg: 91.0,
            lon_deg: -181.0,
            elevation_m: Some(f64::INFINITY),
            note: String::new(),
        }];
        s.body_lateral = vec![
            BodyLateral {
                base_bed: BedId(9),
                width_m: Some(0.0),
                beyond_outcrop: false,
                note: String::new(),
            },
            BodyLateral { base_bed: BedId(1), width_m: None, beyond_outcrop: false, note: String::new() },
            BodyLateral {
                base_bed: BedId(1),
                width_m: Some(-5.0),
                beyond_outcrop: false,
                note: String::new(),
            },
        ];
        let got = locations(&s);
        let want = [
            "beds[0].samples[1].id",
            "beds[0].samples[2].id",
            "beds[0].samples[3].height_in_bed_m",
            "beds[0].photos[0].reference",
            "beds[0].photos[0].file",
            "beds[0].body_fossils[0]",
            "beds[0].bioturbation_index",
            "beds[0].munsell",
            "beds[0].lag_composition",
            "beds[0].slope_distance_m",
            "thickness_uncertainty_m",
            "bedding.dip_deg",
            "bedding.dip_direction_deg",
            "traverse.slope_deg",
            "traverse.bearing_deg",
            "fixes[0].lat_deg",
            "fixes[0].lon_deg",
            "fixes[0].elevation_m",
            "body_lateral[0].base_bed",
            "body_lateral[0].width_m",
            "body_lateral[2].base_bed",
            "body_lateral[2].width_m",
        ];
        for w in want {
            assert!(got.iter().any(|g| g == w), "{w} missing from {got:?}");
        }
        assert_eq!(got.len(), want.len(), "{got:?}");
    }

    #[test]
    fn overlong_lists_are_refused_without_checking_each_item() {
        let mut s = Section::new("x");
        let mut b = sand(1, 1.0);
        b.samples = (0..=MAX_RECORD_ITEMS_PER_BED).map(|_| Sample::labelled("")).collect();
        b.trace_fossils = vec![String::new(); MAX_RECORD_ITEMS_PER_BED + 5];
        s.beds = vec![b].into();
        let problems = validate_section(&s);
        assert_eq!(problems.len(), 2, "{problems:?}");
        assert_eq!(problems[0].to_string(), "beds[0].samples: 1001 samples; at most 1000 per bed");
        assert_eq!(problems[1].location, "beds[0].trace_fossils");
    }

    #[test]
    fn missing_image_files_are_warnings_with_their_line() {
        let dir = tempfile::tempdir().expect("temporary folder");
        std::fs::create_dir(dir.path().join("photos")).expect("folder");
        std::fs::write(dir.path().join("photos/here.jpg"), b"jpeg").expect("image");
        let csv = "thickness_m,lithology,grain,photos\n1,sandstone,f,A (photos/here.jpg)\n2,sandstone,f,B;C (photos/gone.jpg)\n";
        let path = dir.path().join("t.csv");
        std::fs::write(&path, csv).expect("write");
        let project = crate::io::load(&path).expect("reads").project;
        let warnings = field_record_warnings(&path, &project);
        assert_eq!(warnings.len(), 1, "{warnings:?}");
        let w = warnings[0].to_string();
        assert!(w.contains("line 3: column photos, photo 2: no image file at \"photos/gone.jpg\""), "{w}");
        assert!(w.starts_with(&path.display().to_string()), "{w}");
    }

    #[test]
    fn a_sample_above_its_bed_and_a_fix_above_the_top_are_warnings_not_errors() {
        let mut s = Section::new("x");
        let mut b = sand(1, 2.0);
        b.samples = vec![
            Sample { id: "A".into(), kind: None, height_in_bed_m: Some(2.0) },
            Sample { id: "B".into(), kind: None, height_in_bed_m: Some(2.5) },
        ];
        s.beds = vec![b].into();
        s.fixes = vec![GpsFix {
            role: FixRole::Top,
            height_m: 3.0,
            lat_deg: 0.0,
            lon_deg: 0.0,
            elevation_m: None,
            note: String::new(),
        }];
        // Shortening a bed must not make a section invalid (the window refuses edits that do).
        assert_eq!(validate_section(&s), vec![]);
        let w: Vec<String> = record_warnings(&s).iter().map(ToString::to_string).collect();
        assert_eq!(
            w,
            [
                "beds[0].samples[1].height_in_bed_m: sample \"B\" is 2.5 m above the bed's base, above its top (the \
                 bed is 2 m thick); check the height or the thickness",
                "fixes[0].height_m: the top fix is at 3 m, above the section's top at 2 m; check its height or the \
                 thicknesses"
            ]
        );
        // A bed table names the row and the sample.
        let dir = tempfile::tempdir().expect("temporary folder");
        let path = dir.path().join("t.csv");
        std::fs::write(
            &path,
            "thickness_m,lithology,grain,samples\n1,sandstone,f,\n1,sandstone,f,A;B (@1.5)\n",
        )
        .expect("write");
        let project = crate::io::load(&path).expect("reads: a warning only").project;
        let w: Vec<String> =
            field_record_warnings(&path, &project).iter().map(|w| w.problem.to_string()).collect();
        assert_eq!(w.len(), 1, "{w:?}");
        assert!(w[0].starts_with("line 3: column samples, sample 2: sample \"B\" is 1.5 m above"), "{w:?}");
    }
}
