//! Validation of sections and projects: every rule a loaded or edited section must satisfy, each
//! broken rule reported as a [`Problem`] with its path and what would be valid.

use super::limits::{
    MAX_BEDS_PER_SECTION, MAX_CURVES_PER_SECTION, MAX_CURVE_SAMPLES, MAX_LINK_LABEL_CHARS, MAX_SECTIONS,
    MAX_STRING_CHARS,
};
pub use super::limits::{MAX_BED_THICKNESS_M, MAX_PANEL_POSITION_M};
use super::problem::Problem;
use crate::model::{Bed, BedId, GrainSize, GrainSizeRule, MeasuredCurve, Project, Section};
use std::collections::HashMap;

mod record;
pub use record::{field_record_warnings, record_warnings};

/// Every problem in one section. Locations are relative to the section (`beds[3].thickness_m`).
pub fn validate_section(section: &Section) -> Vec<Problem> {
    let mut out = Vec::new();
    section_head(&mut out, section);
    if too_many_beds(&mut out, section) {
        return out;
    }
    let mut first_with_id: HashMap<u64, usize> = HashMap::with_capacity(section.beds.len());
    for (i, bed) in section.beds.iter().enumerate() {
        if let Some(first) = first_with_id.get(&bed.id.0) {
            out.push(duplicate_id(i, bed.id, *first));
        } else {
            first_with_id.insert(bed.id.0, i);
        }
        bed_problems(&mut out, i, bed);
    }
    section_tail(&mut out, section, Some(&|id: BedId| first_with_id.contains_key(&id.0)));
    out
}

/// The section's own fields that come before its beds in the list of problems.
fn section_head(out: &mut Vec<Problem>, section: &Section) {
    if section.name.trim().is_empty() {
        out.push(Problem::new("name", "must not be empty"));
    }
    for (field, text) in [
        ("name", &section.name),
        ("locality", &section.locality),
        ("logged_by", &section.logged_by),
        ("notes", &section.notes),
    ] {
        check_text(out, || field.to_string(), text);
    }
    if let Some(c) = section.coordinates {
        if !(c.lat_deg.is_finite() && (-90.0..=90.0).contains(&c.lat_deg)) {
            out.push(Problem::new(
                "coordinates.lat_deg",
                format!("must lie between -90 and 90, got {}", show(c.lat_deg)),
            ));
        }
        if !(c.lon_deg.is_finite() && (-180.0..=180.0).contains(&c.lon_deg)) {
            out.push(Problem::new(
                "coordinates.lon_deg",
                format!("must lie between -180 and 180, got {}", show(c.lon_deg)),
            ));
        }
    }
    if let Some(sheet) = &section.trace {
        out.extend(sheet.problems().into_iter().map(|(f, why)| Problem::new(format!("trace.{f}"), why)));
    }
    if let Some(date) = &section.date_logged {
        if let Err(why) = check_iso_date(date) {
            out.push(Problem::new(
                "date_logged",
                format!("{why}, got {date:?}; write YYYY-MM-DD, e.g. 2026-07-14"),
            ));
        }
    }
    if let Some(x) = section.panel_position_m {
        if !(x.is_finite() && x.abs() <= MAX_PANEL_POSITION_M) {
            out.push(Problem::new(
                "panel_position_m",
                format!("must be a finite number of metres within ±{MAX_PANEL_POSITION_M}, got {}", show(x)),
            ));
        }
    }
}

/// More beds than a section may hold (their problems are then not listed one by one).
fn too_many_beds(out: &mut Vec<Problem>, section: &Section) -> bool {
    if section.beds.len() > MAX_BEDS_PER_SECTION {
        out.push(Problem::new(
            "beds",
            format!("{} beds; at most {MAX_BEDS_PER_SECTION} per section", section.beds.len()),
        ));
        return true;
    }
    false
}

fn duplicate_id(i: usize, id: BedId, first: usize) -> Problem {
    Problem::new(
        format!("beds[{i}].id"),
        format!("{} is also the id of beds[{first}]; bed ids must be unique", id.0),
    )
}

/// The problems of bed `i` on its own (all but a repeated id).
fn bed_problems(out: &mut Vec<Problem>, i: usize, bed: &Bed) {
    let at = |field: &str| format!("beds[{i}].{field}");
    let t = bed.thickness_m;
    if !(t.is_finite() && t > 0.0 && t <= MAX_BED_THICKNESS_M) {
        out.push(Problem::new(
            at("thickness_m"),
            format!("must be > 0 and ≤ {MAX_BED_THICKNESS_M} m, got {}", show(t)),
        ));
    }
    let litho = bed.lithology;
    for (field, grain) in [("grain_base", bed.grain_base), ("grain_top", bed.grain_top)] {
        match (litho.grain_size_rule(), grain) {
            (GrainSizeRule::Required, None) => out.push(Problem::new(
                at(field),
                format!(
                    "required for {litho}: a Wentworth class (e.g. \"fine sand\") or a size such as 0.3mm or 1.7phi"
                ),
            )),
            (GrainSizeRule::Forbidden, Some(g)) => out.push(Problem::new(
                at(field),
                format!("must be empty for a {litho} interval (nothing exposed to size), got {g}"),
            )),
            (_, Some(GrainSize::Phi(p))) if !(p.is_finite() && (-12.0..=14.0).contains(&p)) => {
                out.push(Problem::new(at(field), format!("phi must lie between -12 and 14, got {}", show(p))))
            }
            _ => {}
        }
    }
    if let Some(r) = bed.base_relief_m {
        if !(r.is_finite() && (0.0..=MAX_BED_THICKNESS_M).contains(&r)) {
            out.push(Problem::new(
                at("base_relief_m"),
                format!("must be ≥ 0 and ≤ {MAX_BED_THICKNESS_M} m, got {}", show(r)),
            ));
        }
    }
    for (k, p) in bed.paleocurrents.iter().enumerate() {
        let a = p.azimuth_deg;
        if !(a.is_finite() && (0.0..=360.0).contains(&a)) {
            out.push(Problem::new(
                format!("beds[{i}].paleocurrents[{k}].azimuth_deg"),
                format!("an azimuth must lie between 0 and 360 degrees, got {}", show(a)),
            ));
        }
        if let Some(d) = p.dip_deg {
            if !(d.is_finite() && (0.0..=90.0).contains(&d)) {
                out.push(Problem::new(
                    format!("beds[{i}].paleocurrents[{k}].dip_deg"),
                    format!("a dip must lie between 0 and 90 degrees, got {}", show(d)),
                ));
            }
        }
    }
    if let Some(stage) = bed.carbonate_stage {
        if !(1..=6).contains(&stage) {
            out.push(Problem::new(
                at("carbonate_stage"),
                format!("must be a carbonate stage 1–6 (I–VI), got {stage}"),
            ));
        }
    }
    if let Some(surface) = &bed.base_surface {
        if surface.name.trim().is_empty() {
            out.push(Problem::new(at("base_surface.name"), "must not be empty"));
        }
        check_text(out, || at("base_surface.name"), &surface.name);
    }
    for (field, text) in [("colour", &bed.colour), ("fossils", &bed.fossils), ("notes", &bed.notes)] {
        check_text(out, || at(field), text);
    }
    record::bed_record(out, i, bed);
}

/// What comes after the beds: how the section was measured, review decisions and curves.
/// `has_bed` answers whether a bed id is in the section; `None` leaves out the checks that need
/// it (references from the review and the channel-body records to beds).
fn section_tail(out: &mut Vec<Problem>, section: &Section, has_bed: Option<&dyn Fn(BedId) -> bool>) {
    record::section_record(out, section, has_bed);
    let has_bed = |id: BedId| has_bed.is_none_or(|f| f(id));
    let mut decided: HashMap<u64, usize> = HashMap::new();
    for (k, d) in section.review.iter().enumerate() {
        if !has_bed(d.bed) {
            out.push(Problem::new(
                format!("review[{k}].bed"),
                format!("refers to bed id {}, which is not in this section", d.bed.0),
            ));
        }
        if let Some(first) = decided.get(&d.bed.0) {
            out.push(Problem::new(
                format!("review[{k}].bed"),
                format!("bed id {} already has a decision in review[{first}]; keep one", d.bed.0),
            ));
        } else {
            decided.insert(d.bed.0, k);
        }
        check_text(out, || format!("review[{k}].note"), &d.note);
        if let Some(label) = &d.link {
            if let Err(why) = check_link_label(label) {
                out.push(Problem::new(format!("review[{k}].link"), why));
            }
        }
    }
    validate_curves(&section.curves, out);
}

/// Most problems reported for the samples of one curve (a whole bad curve would otherwise list
/// every sample); the count of the rest is given.
const MAX_SAMPLE_PROBLEMS: usize = 10;

/// Measured curves: limits, unique mnemonics, finite offsets, finite sorted heights, finite values.
fn validate_curves(curves: &[MeasuredCurve], out: &mut Vec<Problem>) {
    if curves.len() > MAX_CURVES_PER_SECTION {
        out.push(Problem::new(
            "curves",
            format!("{} curves; at most {MAX_CURVES_PER_SECTION} per section", curves.len()),
        ));
        return;
    }
    let mut first_with: HashMap<String, usize> = HashMap::new();
    for (k, c) in curves.iter().enumerate() {
        let at = |field: &str| format!("curves[{k}].{field}");
        if c.mnemonic.trim().is_empty() {
            out.push(Problem::new(at("mnemonic"), "must not be empty (e.g. GR)"));
        } else if let Some(first) = first_with.get(&c.mnemonic.trim().to_lowercase()) {
            out.push(Problem::new(
                at("mnemonic"),
                format!(
                    "{:?} is also the mnemonic of curves[{first}]; a section's curves need different mnemonics",
                    c.mnemonic
                ),
            ));
        } else {
            first_with.insert(c.mnemonic.trim().to_lowercase(), k);
        }
        for (field, text) in [
            ("mnemonic", &c.mnemonic),
            ("unit", &c.unit),
            ("description", &c.description),
            ("source_file", &c.source_file),
        ] {
            check_text(out, || at(field), text);
        }
        if !c.offset_m.is_finite() {
            out.push(Problem::new(
                at("offset_m"),
                format!("must be a finite number of metres, got {}", show(c.offset_m)),
            ));
        }
        if c.samples.len() > MAX_CURVE_SAMPLES {
            out.push(Problem::new(
                at("samples"),
                format!("{} samples; at most {MAX_CURVE_SAMPLES} per curve", c.samples.len()),
            ));
            continue;
        }
        let mut found = 0usize;
        let mut previous: Option<f64> = None;
        for (i, &(h, v)) in c.samples.iter().enumerate() {
            let why = if !h.is_finite() {
                Some(format!("height must be a finite number of metres, got {}", show(h)))
            } else if let Some(p) = previous.filter(|p| h < *p) {
                Some(format!(
                    "height {} m is below the previous sample's {} m; samples must be sorted lowest first",
                    show(h),
                    show(p)
                ))
            } else {
                v.filter(|v| !v.is_finite())
                    .map(|v| format!("value must be a finite number or null (a gap), got {}", show(v)))
            };
            if h.is_finite() {
                previous = Some(h);
            }
            if let Some(why) = why {
                found += 1;
                if found <= MAX_SAMPLE_PROBLEMS {
                    out.push(Problem::new(format!("curves[{k}].samples[{i}]"), why));
                }
            }
        }
        if found > MAX_SAMPLE_PROBLEMS {
            out.push(Problem::new(
                at("samples"),
                format!("{} more samples have problems like those above", found - MAX_SAMPLE_PROBLEMS),
            ));
        }
    }
}

/// Every problem in a project, located from its root (`sections[2].beds[0].thickness_m`).
pub fn validate_project(project: &Project) -> Vec<Problem> {
    project_problems(project, |_, section| validate_section(section))
}

/// The problems of a project, with `section_problems(i, section)` giving each section's.
fn project_problems(
    project: &Project,
    mut section_problems: impl FnMut(usize, &Section) -> Vec<Problem>,
) -> Vec<Problem> {
    let mut out = Vec::new();
    if project.format_version != Project::CURRENT_VERSION {
        out.push(Problem::new(
            "format_version",
            format!("must be {} after reading, got {}", Project::CURRENT_VERSION, project.format_version),
        ));
    }
    if project.sections.len() > MAX_SECTIONS {
        out.push(Problem::new(
            "sections",
            format!("{} sections; at most {MAX_SECTIONS} per project", project.sections.len()),
        ));
        return out;
    }
    if let Err(faults) = crate::rules::RuleParams::from_fields(&project.rule_params) {
        out.extend(faults.into_iter().map(|f| Problem::new("rule_params", f)));
    }
    let mut names: HashMap<String, usize> = HashMap::new();
    for (i, section) in project.sections.iter().enumerate() {
        let prefix = format!("sections[{i}].");
        out.extend(section_problems(i, section).into_iter().map(|p| p.prefixed(&prefix)));
        let key = section.name.trim().to_lowercase();
        if key.is_empty() {
            continue;
        }
        if let Some(first) = names.get(&key) {
            out.push(Problem::new(
                format!("sections[{i}].name"),
                format!(
                    "{:?} is also the name of sections[{first}]; section names must be unique (ignoring case)",
                    section.name
                ),
            ));
        } else {
            names.insert(key, i);
        }
    }
    out
}

/// Above this many changed beds (or this share of a section) an edit's section is checked
/// whole: the checks of a run of beds against the rest cost the run's length times the section's.
const CHANGED_RUN_CHECKED_ALONE: usize = 64;

/// The problems an edit brought in: those of [`validate_project`]`(after)` that
/// `validate_project(before)` does not have, where `after` was made from `before` by an edit
/// that shares the beds it did not touch ([`crate::model::Beds`]). Beds left shared are not read
/// again (their problems are the ones they had), so an edit of one bed in a section of 50,000
/// checks that bed, the section's own fields and the ids around it, not the 50,000.
pub fn new_problems(before: &Project, after: &Project) -> Vec<Problem> {
    let was = project_problems(before, |i, section| section_problems_since(section, after.sections.get(i)));
    let now = project_problems(after, |i, section| section_problems_since(section, before.sections.get(i)));
    now.into_iter().filter(|p| !was.contains(p)).collect()
}

/// The problems of `section` that can differ from those of `other` (the same section before or
/// after an edit): its own fields, and the beds of the run it does not share with `other`. With
/// no `other`, or a long changed run, every problem.
fn section_problems_since(section: &Section, other: Option<&Section>) -> Vec<Problem> {
    let Some(other) = other else { return validate_section(section) };
    let run = section.beds.changed_since(&other.beds);
    let long = run.len() > CHANGED_RUN_CHECKED_ALONE || run.len() * 8 > section.beds.len();
    if long || section.beds.len() > MAX_BEDS_PER_SECTION || other.beds.len() > MAX_BEDS_PER_SECTION {
        return validate_section(section);
    }
    let mut out = Vec::new();
    section_head(&mut out, section);
    let other_run = run.start..other.beds.len() - (section.beds.len() - run.end);
    let sorted_ids = |beds: crate::model::beds::Iter<'_, Bed>| {
        let mut ids: Vec<u64> = beds.map(|b| b.id.0).collect();
        ids.sort_unstable();
        ids
    };
    let (ids, other_ids) =
        (sorted_ids(section.beds.range(run.clone())), sorted_ids(other.beds.range(other_run)));
    // Ids the changed run holds that the other's run did not (a bed added, an id changed): only
    // these can be repeated in one section and not in the other.
    let mut new_ids = ids.clone();
    for id in &other_ids {
        if let Ok(k) = new_ids.binary_search(id) {
            new_ids.remove(k);
        }
    }
    for i in run.clone() {
        let bed = &section.beds[i];
        if new_ids.binary_search(&bed.id.0).is_ok() {
            // A repeated id: the first bed with it is named, every later one is the problem.
            let mut first = None;
            for (j, b) in section.beds.iter().enumerate() {
                if b.id == bed.id {
                    match first {
                        None => first = Some(j),
                        Some(f) if j == i || !run.contains(&j) => out.push(duplicate_id(j, bed.id, f)),
                        Some(_) => {}
                    }
                }
            }
        }
        bed_problems(&mut out, i, bed);
    }
    // References from the review and the channel-body records to beds are read again when
    // either list or the set of beds' ids may have changed.
    let ids_kept = ids == other_ids;
    if ids_kept && section.review == other.review && section.body_lateral == other.body_lateral {
        section_tail(&mut out, section, None);
    } else {
        let ids: std::collections::HashSet<u64> = section.beds.iter().map(|b| b.id.0).collect();
        section_tail(&mut out, section, Some(&|id: BedId| ids.contains(&id.0)));
    }
    out
}

/// A number as a person would type it; very large or small ones in exponent form (1e300).
pub(crate) fn show(v: f64) -> String {
    if v.is_finite() && v != 0.0 && !(1e-6..1e9).contains(&v.abs()) {
        format!("{v:e}")
    } else {
        format!("{v}")
    }
}

/// A text of at most [`MAX_STRING_CHARS`] characters; the location is only written out for a
/// problem (this runs for every text of every bed on each edit).
fn check_text(out: &mut Vec<Problem>, location: impl FnOnce() -> String, text: &str) {
    if text.len() <= MAX_STRING_CHARS {
        // No more characters than bytes.
        return;
    }
    let n = text.chars().count();
    if n > MAX_STRING_CHARS {
        out.push(Problem::new(
            location(),
            format!("text of {n} characters; at most {MAX_STRING_CHARS} allowed"),
        ));
    }
}

/// Check a correlation label for an accepted boundary: not blank, at most
/// [`MAX_LINK_LABEL_CHARS`] characters, no control characters (it is printed on the panel).
pub fn check_link_label(label: &str) -> Result<(), String> {
    let n = label.chars().count();
    if label.trim().is_empty() {
        return Err("must not be blank; leave the field out for no correlation label".to_string());
    }
    if n > MAX_LINK_LABEL_CHARS {
        return Err(format!(
            "a correlation label of {n} characters; at most {MAX_LINK_LABEL_CHARS} allowed (e.g. SB-2)"
        ));
    }
    if let Some(c) = label.chars().find(|c| c.is_control()) {
        return Err(format!(
            "must not hold control characters (found U+{:04X} in {:?}); write a short label such as SB-2",
            u32::from(c),
            label.chars().take(60).collect::<String>()
        ));
    }
    Ok(())
}

/// Check an ISO 8601 calendar date `YYYY-MM-DD` (proleptic Gregorian, years 1000–9999).
pub fn check_iso_date(text: &str) -> Result<(), String> {
    let parts: Vec<&str> = text.split('-').collect();
    let digits = |s: &str, n: usize| s.len() == n && s.bytes().all(|b| b.is_ascii_digit());
    if parts.len() != 3 || !digits(parts[0], 4) || !digits(parts[1], 2) || !digits(parts[2], 2) {
        return Err("not a date in the form YYYY-MM-DD".to_string());
    }
    let (year, month, day): (u32, u32, u32) = match (parts[0].parse(), parts[1].parse(), parts[2].parse()) {
        (Ok(y), Ok(m), Ok(d)) => (y, m, d),
        _ => return Err("not a date in the form YYYY-MM-DD".to_string()),
    };
    if year < 1000 {
        return Err("year must be 1000 or later".to_string());
    }
    if !(1..=12).contains(&month) {
        return Err("month must be 01–12".to_string());
    }
    let leap = (year % 4 == 0 && year % 100 != 0) || year % 400 == 0;
    let days = match month {
        2 if leap => 29,
        2 => 28,
        4 | 6 | 9 | 11 => 30,
        _ => 31,
    };
    if !(1..=days).contains(&day) {
        return Err(format!("day must be 01–{days} for that month"));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Bed, BedId, Lithology, Paleocurrent, ReviewDecision, ReviewState, WentworthClass};

    fn sand(id: u64, t: f64) -> Bed {
        Bed::new(BedId(id), t, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::FineSand)))
    }

    #[test]
    fn a_valid_section_has_no_problems() {
        let mut s = Section::new("Corrie Wash");
        s.beds = vec![sand(1, 1.0), Bed::new(BedId(2), 0.5, Lithology::Covered, None)].into();
        s.date_logged = Some("2024-02-29".into());
        assert_eq!(validate_section(&s), vec![]);
    }

    #[test]
    fn reports_every_problem_with_its_path() {
        let mut s = Section::new("  ");
        let mut b = sand(1, -1.2);
        b.paleocurrents = vec![Paleocurrent::azimuth(10.0), Paleocurrent::azimuth(361.0)];
        b.carbonate_stage = Some(7);
        b.base_relief_m = Some(-0.1);
        let mut covered = Bed::new(BedId(1), 1.0, Lithology::Covered, None);
        covered.grain_top = Some(GrainSize::Class(WentworthClass::Silt));
        let mut mud = Bed::new(BedId(3), 1.0, Lithology::Mudstone, None);
        mud.grain_top = Some(GrainSize::Phi(f64::NAN));
        s.beds = vec![b, covered, mud].into();
        s.review = vec![ReviewDecision {
            bed: BedId(9),
            state: ReviewState::Accepted,
            note: String::new(),
            link: None,
        }];
        s.date_logged = Some("2023-02-29".into());
        let locations: Vec<String> = validate_section(&s).into_iter().map(|p| p.location).collect();
        for expected in [
            "name",
            "date_logged",
            "beds[0].thickness_m",
            "beds[0].base_relief_m",
            "beds[0].paleocurrents[1].azimuth_deg",
            "beds[0].carbonate_stage",
            "beds[1].id",
            "beds[1].grain_top",
            "beds[2].grain_base",
            "beds[2].grain_top",
            "review[0].bed",
        ] {
            assert!(locations.iter().any(|l| l == expected), "{expected} missing from {locations:?}");
        }
        assert_eq!(locations.len(), 11, "{locations:?}");
    }

    #[test]
    fn curve_problems_name_the_curve_and_sample() {
        use crate::model::IndexDirection;
        let mut s = Section::new("Kestrel Bluff");
        s.beds = vec![sand(1, 10.0)].into();
        let good = MeasuredCurve {
            mnemonic: "GR".into(),
            unit: "API".into(),
            description: String::new(),
            source_file: "gr.las".into(),
            offset_m: 10.0,
            direction: IndexDirection::DepthBelowDatum,
            samples: vec![(0.0, Some(60.0)), (0.5, None), (0.5, Some(61.0)), (1.0, Some(62.0))],
        };
        s.curves = vec![good.clone()];
        assert_eq!(validate_section(&s), vec![], "equal heights and NULL gaps are fine");
        let mut bad = good.clone();
        bad.mnemonic = "gr".into();
        bad.offset_m = f64::NAN;
        bad.samples = vec![(1.0, Some(1.0)), (0.5, Some(2.0)), (f64::INFINITY, None), (2.0, Some(f64::NAN))];
        s.curves.push(bad);
        let locations: Vec<String> = validate_section(&s).into_iter().map(|p| p.location).collect();
        assert_eq!(
            locations,
            [
                "curves[1].mnemonic",
                "curves[1].offset_m",
                "curves[1].samples[1]",
                "curves[1].samples[2]",
                "curves[1].samples[3]"
            ]
        );
        // A long run of bad samples is summarised after the first ten.
        let mut many = good;
        many.samples = (0..50).map(|i| (-(i as f64), Some(1.0))).collect();
        s.curves = vec![many];
        let problems = validate_section(&s);
        assert_eq!(problems.len(), MAX_SAMPLE_PROBLEMS + 1, "{problems:?}");
        assert!(problems[MAX_SAMPLE_PROBLEMS].message.starts_with("39 more samples"), "{problems:?}");
    }

    #[test]
    fn correlation_labels_are_short_printable_text() {
        assert_eq!(check_link_label("SB-2"), Ok(()));
        assert_eq!(check_link_label("base of the upper storey system"), Ok(()));
        assert!(check_link_label("  ").expect_err("blank").contains("blank"));
        assert!(check_link_label(&"x".repeat(41)).expect_err("long").contains("41 characters"));
        assert!(check_link_label(&"x".repeat(40)).is_ok());
        // Control characters (Unicode general category Cc) are refused, named by code point.
        let e = check_link_label("SB\n2").expect_err("newline");
        assert!(e.contains("U+000A"), "{e}");
        let e = check_link_label("SB\u{1b}2").expect_err("escape");
        assert!(e.contains("U+001B"), "{e}");
        assert!(check_link_label("Schichtfläche 2").is_ok(), "letters beyond ASCII are fine");
        // In a section: located at the decision's link field.
        let mut s = Section::new("Corrie Wash");
        s.beds = vec![sand(1, 1.0), sand(2, 1.0)].into();
        let mut d = ReviewDecision::new(BedId(2), ReviewState::Candidate, "");
        d.link = Some("SB\t2".to_string());
        s.review = vec![d];
        let problems = validate_section(&s);
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert_eq!(problems[0].location, "review[0].link");
    }

    #[test]
    fn iso_dates() {
        // Gregorian leap-year rule (common practice): 2000 leap, 1900 not.
        assert!(check_iso_date("2000-02-29").is_ok());
        assert!(check_iso_date("1900-02-29").is_err());
        assert!(check_iso_date("2026-13-01").is_err());
        assert!(check_iso_date("2026-4-01").is_err());
        assert!(check_iso_date("2026-04-31").is_err());
    }

    #[test]
    fn duplicate_section_names_ignoring_case() {
        let mut a = Section::new("Pell Butte");
        a.beds = vec![sand(1, 1.0)].into();
        let mut b = a.clone();
        b.name = "pell butte".into();
        let problems = validate_project(&Project::new(vec![a, b]));
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert_eq!(problems[0].location, "sections[1].name");
    }

    /// What an edit brought in, by definition: the whole project's problems after the edit that
    /// it did not have before.
    fn brought_in(before: &Project, after: &Project) -> Vec<Problem> {
        let was = validate_project(before);
        validate_project(after).into_iter().filter(|p| !was.contains(p)).collect()
    }

    fn long_project() -> Project {
        let mut s = Section::new("Corrie Wash");
        s.beds = (1..=400).map(|i| sand(i, 0.5)).collect();
        s.review = vec![ReviewDecision {
            bed: BedId(200),
            state: ReviewState::Accepted,
            note: String::new(),
            link: None,
        }];
        let mut other = Section::new("Halloway Bluff");
        other.beds = (1..=10).map(|i| sand(i, 1.0)).collect();
        Project::new(vec![s, other])
    }

    /// Every kind of edit the window makes, each checked against the whole-project definition.
    #[test]
    fn the_problems_an_edit_brings_in_are_found_without_rereading_the_beds_it_left() {
        let before = long_project();
        type Change = Box<dyn Fn(&mut Project)>;
        let edits: Vec<(&str, Change)> = vec![
            ("nothing", Box::new(|_| {})),
            ("a good thickness", Box::new(|p| p.sections[0].beds[7].thickness_m = 2.0)),
            ("a negative thickness", Box::new(|p| p.sections[0].beds[7].thickness_m = -1.0)),
            ("a bed inserted with a used id", Box::new(|p| p.sections[0].beds.insert(3, sand(250, 1.0)))),
            ("an id taken from a later bed", Box::new(|p| p.sections[0].beds[2].id = BedId(399))),
            ("an id taken from an earlier bed", Box::new(|p| p.sections[0].beds[398].id = BedId(3))),
            ("the reviewed bed removed", Box::new(|p| drop(p.sections[0].beds.remove(199)))),
            ("a review of a missing bed", Box::new(|p| p.sections[0].review[0].bed = BedId(9_999))),
            ("a bed pushed on top", Box::new(|p| p.sections[0].beds.push(sand(401, 1.0)))),
            (
                "a gravel without grain size",
                Box::new(|p| {
                    let b = &mut p.sections[0].beds[100];
                    b.lithology = Lithology::Conglomerate;
                    b.grain_base = None;
                }),
            ),
            ("a section renamed as the other", Box::new(|p| p.sections[1].name = "corrie wash".into())),
            ("the other section's bed", Box::new(|p| p.sections[1].beds[0].thickness_m = 0.0)),
            ("a section added", Box::new(|p| p.sections.push(Section::new("")))),
            ("a section removed", Box::new(|p| drop(p.sections.remove(0)))),
            (
                "every bed rewritten",
                Box::new(|p| p.sections[0].beds.iter_mut().for_each(|b| b.thickness_m = -2.0)),
            ),
        ];
        for (what, edit) in &edits {
            let mut after = before.clone();
            edit(&mut after);
            assert_eq!(new_problems(&before, &after), brought_in(&before, &after), "{what}");
        }
        // A problem the project already had is not one the edit brought in, and it is not read
        // again when the edit leaves its bed alone.
        let mut bad = before.clone();
        bad.sections[0].beds[50].thickness_m = -3.0;
        let mut after = bad.clone();
        after.sections[0].beds[60].thickness_m = 1.5;
        assert_eq!(new_problems(&bad, &after), vec![]);
        after.sections[0].beds[61].thickness_m = f64::NAN;
        let found = new_problems(&bad, &after);
        assert_eq!(found.len(), 1, "{found:?}");
        assert_eq!(found[0].location, "sections[0].beds[61].thickness_m");
        // The edit whose problems are listed is the one checked: a negative thickness names
        // the bed and field.
        let mut neg = before.clone();
        neg.sections[0].beds[7].thickness_m = -1.0;
        assert_eq!(new_problems(&before, &neg)[0].location, "sections[0].beds[7].thickness_m");
    }
}
