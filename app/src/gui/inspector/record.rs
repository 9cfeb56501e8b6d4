//! The field record of a bed beyond its rock, as the inspector shows it: what each value means
//! (bioturbation index, facies codes), the short vocabularies offered for fossils, the photo
//! files and the suggested facies code.

#[cfg(test)]
use aggrade_core::model::Photo;
use aggrade_core::model::{Bed, BeddingAttitude, FaciesCode, Sample, Section, Traverse};
use std::path::{Path, PathBuf};

/// The bioturbation index grades (Taylor & Goldring 1993, Table 1: the share of the original
/// fabric reworked by burrowing), as the hover text of each grade.
pub const BIOTURBATION_GRADES: [&str; 7] = [
    "0 — no bioturbation (0%)",
    "1 — sparse: bedding distinct, few discrete traces or escape structures (1–4%)",
    "2 — low: bedding distinct, low trace density, escape structures often common (5–30%)",
    "3 — moderate: bedding boundaries sharp, traces discrete, overlap rare (31–60%)",
    "4 — high: bedding boundaries indistinct, high trace density, overlap common (61–90%)",
    "5 — intense: bedding completely disturbed (just visible), limited reworking, later burrows discrete (91–99%)",
    "6 — complete: total biogenic homogenisation of the sediment by repeated overprinting (100%)",
];

/// Trace fossils common in river deposits and their floodplains, offered in the inspector
/// (the list stays open: any name may be typed).
pub const TRACE_FOSSILS: &[&str] = &[
    "Skolithos",
    "Planolites",
    "Palaeophycus",
    "Scoyenia",
    "Taenidium",
    "Beaconites",
    "Cruziana",
    "Arenicolites",
];

/// Body fossils common in river deposits, offered in the inspector (any name may be typed).
pub const BODY_FOSSILS: &[&str] = &[
    "plant fragments",
    "wood",
    "leaf impressions",
    "unionid bivalves",
    "gastropods",
    "ostracods",
    "vertebrate bone",
    "fish scales",
];

/// The facies code the rules suggest for a bed (an interpretation: a candidate for the
/// geologist's review).
pub fn suggested_facies(bed: &Bed) -> Option<FaciesCode> {
    aggrade_core::rules::facies::suggest(bed)
}

/// The true thickness of a bed from the distance taped along the ground across it, when the
/// section has both a traverse and a bedding attitude; otherwise what is missing, in words.
pub fn true_thickness(slope_distance_m: f64, section: &Section) -> Result<f64, String> {
    match (section.traverse, section.bedding) {
        (Some(t), Some(b)) => thickness_from(slope_distance_m, &t, &b),
        (None, None) => {
            Err("the section has no traverse (bearing and slope of the ground) and no bedding attitude: \
             give them in Section details (Ctrl+Shift+D) to work out the true thickness"
                .into())
        }
        (None, Some(_)) => {
            Err("the section has no traverse (bearing and slope of the ground): give it in Section details \
             (Ctrl+Shift+D) to work out the true thickness"
                .into())
        }
        (Some(_), None) => {
            Err("the section has no bedding attitude: give it in Section details (Ctrl+Shift+D) to work out \
             the true thickness"
                .into())
        }
    }
}

fn thickness_from(slope_distance_m: f64, t: &Traverse, b: &BeddingAttitude) -> Result<f64, String> {
    aggrade_core::analysis::attitude::true_thickness_m(slope_distance_m, t, b).map_err(|e| e.to_string())
}

/// A photo's image file as a path: absolute as written, or relative to the project file's folder
/// (to the working folder for a project never saved).
pub fn photo_path(file: &str, project_file: Option<&Path>) -> PathBuf {
    let p = Path::new(file.trim());
    if p.is_absolute() {
        return p.to_path_buf();
    }
    match project_file.and_then(Path::parent) {
        Some(dir) if !dir.as_os_str().is_empty() => dir.join(p),
        _ => p.to_path_buf(),
    }
}

/// Open an image with the system's viewer; a file that is not there is said so.
pub fn open_photo(path: &Path) -> Result<(), String> {
    if !path.is_file() {
        return Err(format!("There is no image file at {}", path.display()));
    }
    crate::gui::files::open_with_system(path)
        .map_err(|e| format!("The system viewer could not be started for {}: {e}", path.display()))
}

/// The id a new sample gets: the section's highest numbered id with its number one up ("CW-12"
/// after "CW-11"), or "S-1" in a section with none.
pub fn next_sample_id(section: &Section) -> String {
    next_id(section.beds.iter().flat_map(|b| b.samples.iter()).map(|s| s.id.as_str()), "S-1")
}

/// The reference a new photo gets: the section's highest numbered reference one up ("IMG_2078"
/// after "IMG_2077"), or "photo 1" in a section with none.
pub fn next_photo_reference(section: &Section) -> String {
    next_id(section.beds.iter().flat_map(|b| b.photos.iter()).map(|p| p.reference.as_str()), "photo 1")
}

/// The highest numbered of `ids` with its number one up, or `first`.
fn next_id<'a>(ids: impl Iterator<Item = &'a str>, first: &str) -> String {
    let mut best: Option<(String, u64, usize)> = None;
    for id in ids {
        if let Some((prefix, n, width)) = numbered(id) {
            if best.as_ref().is_none_or(|(_, m, _)| n >= *m) {
                best = Some((prefix.to_string(), n, width));
            }
        }
    }
    match best {
        Some((prefix, n, width)) => format!("{prefix}{:0width$}", n + 1),
        None => first.into(),
    }
}

/// An id's text before its trailing number, the number and how many digits it was written with.
fn numbered(id: &str) -> Option<(&str, u64, usize)> {
    let id = id.trim();
    let digits = id.chars().rev().take_while(char::is_ascii_digit).count();
    if digits == 0 || digits > 18 {
        return None;
    }
    let (prefix, number) = id.split_at(id.len() - digits);
    Some((prefix, number.parse().ok()?, digits))
}

/// A sample's one-line description for hover texts ("CW-3, thin section, 0.4 m above the base").
pub fn sample_words(s: &Sample, unit: aggrade_core::model::LengthUnit) -> String {
    let mut parts = vec![if s.id.trim().is_empty() { "(no id)".to_string() } else { s.id.clone() }];
    if let Some(k) = s.kind {
        parts.push(k.name().to_string());
    }
    if let Some(h) = s.height_in_bed_m {
        parts.push(format!("{} above the bed's base", unit.length(h)));
    }
    parts.join(", ")
}

/// The name added to a list of fossils: trimmed; an empty name or one already listed (any case)
/// adds nothing.
pub fn add_name(list: &mut Vec<String>, name: &str) -> bool {
    let n = name.trim();
    if n.is_empty() || list.iter().any(|x| x.eq_ignore_ascii_case(n)) {
        return false;
    }
    list.push(n.to_string());
    true
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{BedId, LengthUnit, Lithology};

    #[test]
    fn the_bioturbation_grades_are_taylor_and_goldrings_seven() {
        // Taylor & Goldring (1993), Table 1: grades 0–6 by the share of the fabric reworked.
        assert_eq!(BIOTURBATION_GRADES.len(), 7);
        for (i, g) in BIOTURBATION_GRADES.iter().enumerate() {
            assert!(g.starts_with(&format!("{i} — ")), "{g}");
        }
        assert!(BIOTURBATION_GRADES[6].contains("100%") && BIOTURBATION_GRADES[0].contains("(0%)"));
    }

    #[test]
    fn a_new_sample_continues_the_sections_numbering() {
        let mut s = Section::new("t");
        assert_eq!(next_sample_id(&s), "S-1");
        let mut a = Bed::new(BedId(1), 1.0, Lithology::Mudstone, None);
        a.samples = vec![Sample::labelled("CW-09"), Sample::labelled("CW-11"), Sample::labelled("loose")];
        let mut b = a.clone();
        b.samples = vec![Sample::labelled("CW-10")];
        s.beds = vec![a, b].into();
        assert_eq!(next_sample_id(&s), "CW-12");
        s.beds[1].samples = vec![Sample::labelled("CW-099")];
        assert_eq!(next_sample_id(&s), "CW-100", "the width grows when it must");
        assert_eq!(next_photo_reference(&s), "photo 1");
        s.beds[0].photos = vec![Photo { reference: "IMG_2077".into(), file: None }];
        assert_eq!(next_photo_reference(&s), "IMG_2078");
    }

    #[test]
    fn fossil_names_are_added_once_whatever_their_case() {
        let mut l = vec!["Skolithos".to_string()];
        assert!(!add_name(&mut l, " skolithos "));
        assert!(!add_name(&mut l, "  "));
        assert!(add_name(&mut l, "Chondrites ? "));
        assert_eq!(l, ["Skolithos", "Chondrites ?"]);
    }

    #[test]
    fn photo_files_are_found_beside_the_project() {
        let p = photo_path("img/IMG_2041.jpg", Some(Path::new("/data/logs/sedge.aggrade")));
        assert_eq!(p, Path::new("/data/logs/img/IMG_2041.jpg"));
        let abs = if cfg!(windows) { "C:\\x\\a.jpg" } else { "/x/a.jpg" };
        assert_eq!(photo_path(abs, Some(Path::new("/data/s.aggrade"))), Path::new(abs));
        assert_eq!(photo_path("a.jpg", None), Path::new("a.jpg"));
        let e = open_photo(Path::new("/no/such/photo-río.jpg")).expect_err("missing");
        assert!(e.contains("no image file") && e.contains("photo-río.jpg"), "{e}");
        let mut s = Sample::labelled("CW-3");
        s.height_in_bed_m = Some(0.4);
        assert_eq!(sample_words(&s, LengthUnit::Metre), "CW-3, 0.40 m above the bed's base");
    }
}
