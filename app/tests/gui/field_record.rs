//! The whole field record entered in the real window (egui_kittest, driven by label and
//! keyboard): the inspector's Munsell colour, soil horizon, lag composition, samples, fossils and
//! facies code; the Section details dialog's bedding, traverse and GPS fixes; the bed table's
//! optional columns typed with Tab and remembered. Each value reaches the document, one undo
//! takes it back, and bad input is refused with a visible message and no change.

use super::harness::{app_with, harness_of};
use aggrade::gui::{AggradeApp, Tab};
use aggrade_core::model::{BedId, FaciesCode, Munsell};
use egui::accesskit::Role;
use egui::{Event, Key, Modifiers};
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::Path;

/// The window on the demo project with the Bed tab showing.
fn inspector(data_dir: &Path) -> Harness<'static, AggradeApp> {
    let mut h = harness_of(app_with(None, data_dir, Vec::new()));
    h.run();
    h.state_mut().tab = Tab::Inspector;
    h.run();
    h
}

fn select(h: &mut Harness<'static, AggradeApp>, id: BedId) {
    h.state_mut().doc.selected_bed = Some(id);
    h.run();
    h.run();
}

fn bed(h: &Harness<'static, AggradeApp>, id: BedId) -> aggrade_core::model::Bed {
    h.state().doc.section().beds.iter().find(|b| b.id == id).expect("bed still there").clone()
}

fn field<'a>(h: &'a Harness<'static, AggradeApp>, label: &'a str) -> Option<egui_kittest::Node<'a>> {
    h.query_by(|n| {
        matches!(n.role(), Role::TextInput | Role::MultilineTextInput) && n.label().as_deref() == Some(label)
    })
}

/// Open a collapsed group of the inspector so that `label`'s field shows.
fn open_group(h: &mut Harness<'static, AggradeApp>, group: &str, label: &str) {
    if field(h, label).is_none() {
        h.get_by_label(group).scroll_to_me();
        h.run();
        h.get_by_label(group).click();
        h.run();
        h.run();
    }
    assert!(field(h, label).is_some(), "no field {label:?} under {group:?}");
}

/// Replace a field's text by typing, then press `key` (Enter, Tab) and let the window settle.
fn type_into(h: &mut Harness<'static, AggradeApp>, label: &str, text: &str, key: Key) {
    field(h, label).unwrap_or_else(|| panic!("no field {label:?}")).scroll_to_me();
    h.run();
    field(h, label).unwrap_or_else(|| panic!("no field {label:?}")).focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.run();
    h.get_by(|n| n.is_focused()).type_text(text);
    h.run();
    h.key_press(key);
    h.run();
    h.run();
}

fn undo(h: &mut Harness<'static, AggradeApp>) {
    h.key_press_modifiers(Modifiers::COMMAND, Key::Z);
    h.run();
    h.run();
}

fn shown_containing(h: &Harness<'static, AggradeApp>, part: &str) -> bool {
    h.query_all_by(|n| {
        n.label().is_some_and(|l| l.contains(part)) || n.value().is_some_and(|v| v.contains(part))
    })
    .next()
    .is_some()
}

/// Whether a field is framed in the colour of a text that does not read.
fn framed_invalid(h: &Harness<'static, AggradeApp>) -> bool {
    h.output().shapes.iter().any(|c| {
        matches!(&c.shape, egui::Shape::Rect(r) if r.stroke.color == aggrade::gui::test_hooks::INVALID && r.stroke.width > 0.0)
    })
}

/// A sandstone bed of the demo without a Munsell colour.
fn a_sandstone(h: &Harness<'static, AggradeApp>) -> BedId {
    h.state()
        .doc
        .section()
        .beds
        .iter()
        .find(|b| b.lithology == aggrade_core::model::Lithology::Sandstone && b.munsell.is_none())
        .expect("a sandstone")
        .id
}

#[test]
fn munsell_colour_reads_as_typed_and_a_bad_notation_is_refused_with_a_message_and_no_change() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    let id = a_sandstone(&h);
    select(&mut h, id);
    open_group(&mut h, "Colour", "Munsell colour");
    let revision = h.state().doc.revision;

    // Not a notation (Munsell: hue value/chroma): kept as typed, marked, the bed unchanged.
    type_into(&mut h, "Munsell colour", "brownish 5/", Key::Enter);
    assert_eq!(bed(&h, id).munsell, None);
    assert_eq!(h.state().doc.revision, revision, "nothing was applied");
    assert!(shown_containing(&h, "is not a Munsell notation"), "the message is shown under the field");
    assert!(framed_invalid(&h), "the field is framed in red");
    assert_eq!(field(&h, "Munsell colour").and_then(|n| n.value()).as_deref(), Some("brownish 5/"));
    // The text that does not read goes into the window's backup.
    assert!(h.state().has_unstored_text());

    type_into(&mut h, "Munsell colour", "10yr 5/4", Key::Enter);
    assert_eq!(bed(&h, id).munsell, Munsell::parse("10YR 5/4").ok());
    assert!(!shown_containing(&h, "is not a Munsell notation"));
    assert_eq!(field(&h, "Munsell colour").and_then(|n| n.value()).as_deref(), Some("10YR 5/4"));
    undo(&mut h);
    assert_eq!(bed(&h, id).munsell, None, "one undo takes the colour back");
}

#[test]
fn lag_soil_horizon_samples_and_fossils_are_typed_into_the_inspector_and_undone() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    let id = a_sandstone(&h);
    select(&mut h, id);
    let before = bed(&h, id);

    // Words from any language survive (the lag of a section logged abroad).
    let lag = "galets d'argile, quartzite — Río Seco, Øvre";
    field(&h, "Lag composition").expect("lag field").focus();
    h.run();
    h.get_by(|n| n.is_focused()).type_text(lag);
    h.run();
    h.key_press(Key::Tab);
    h.run();
    assert_eq!(bed(&h, id).lag_composition, lag);

    // A soil horizon after the Soil Survey Staff's designations.
    open_group(&mut h, "Paleosol", "Soil horizon");
    type_into(&mut h, "Soil horizon", "bk", Key::Enter);
    assert_eq!(bed(&h, id).soil_horizon, None, "a lower-case master letter is no designation");
    assert!(shown_containing(&h, "is not a soil-horizon designation"));
    type_into(&mut h, "Soil horizon", "Bk2", Key::Enter);
    assert_eq!(bed(&h, id).soil_horizon.as_ref().map(|s| s.as_str()), Some("Bk2"));

    // A trace fossil typed, Enter adds it to the list.
    open_group(&mut h, "Fossils & bioturbation", "Trace fossils");
    type_into(&mut h, "Trace fossils", "Skolithos", Key::Enter);
    assert_eq!(bed(&h, id).trace_fossils, ["Skolithos"]);
    assert_eq!(field(&h, "Trace fossils").and_then(|n| n.value()).as_deref(), Some(""), "empty for the next");

    // A sample added, its height typed in the display unit (metres here).
    if h.query_by_label("Add sample").is_none() {
        h.get_by_label("Samples & photos").scroll_to_me();
        h.run();
        h.get_by_label("Samples & photos").click();
        h.run();
    }
    h.get_by_label("Add sample").scroll_to_me();
    h.run();
    let n = bed(&h, id).samples.len();
    h.get_by_label("Add sample").click();
    h.run();
    h.run();
    let samples = bed(&h, id).samples;
    assert_eq!(samples.len(), n + 1);
    assert!(!samples[n].id.is_empty(), "a new sample is numbered");
    let height = format!("Sample {} height in bed", n + 1);
    type_into(&mut h, &height, "1000", Key::Enter);
    assert_eq!(bed(&h, id).samples[n].height_in_bed_m, None, "above the bed's top: refused");
    assert!(shown_containing(&h, "above the bed's base"), "the height's message is shown");
    type_into(&mut h, &height, "0.3", Key::Enter);
    assert_eq!(bed(&h, id).samples[n].height_in_bed_m, Some(0.3));

    // Every step is one undo step: back to the bed as it was.
    for _ in 0..5 {
        undo(&mut h);
    }
    assert_eq!(bed(&h, id), before);
}

#[test]
fn a_suggested_facies_code_is_marked_confirmed_with_one_click_and_cleared_again() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    let (id, suggested) = h
        .state()
        .doc
        .section()
        .beds
        .iter()
        .find_map(|b| {
            let s = aggrade_core::rules::facies::suggest(b)?;
            (b.facies.is_none()).then_some((b.id, s))
        })
        .expect("a demo bed with a suggested code of its own");
    select(&mut h, id);
    assert!(shown_containing(&h, &format!("{suggested} (suggested)")), "the picker shows the suggestion");
    assert!(shown_containing(&h, "a candidate for your review"), "said to be an interpretation");
    h.get_by_label("Confirm").click();
    h.run();
    h.run();
    assert_eq!(bed(&h, id).facies, Some(suggested));
    assert!(!shown_containing(&h, "(suggested)"));
    h.get_by_label("Clear (use suggestion)").click();
    h.run();
    h.run();
    assert_eq!(bed(&h, id).facies, None);
    undo(&mut h);
    assert_eq!(bed(&h, id).facies, Some(suggested), "undo brings the confirmed code back");
    undo(&mut h);
    assert_eq!(bed(&h, id).facies, None);
}

/// Type into a field of the Section details dialog.
fn type_dialog(h: &mut Harness<'static, AggradeApp>, label: &str, text: &str) {
    field(h, label).unwrap_or_else(|| panic!("no field {label:?}")).focus();
    h.run();
    h.key_press_modifiers(Modifiers::COMMAND, Key::A);
    h.run();
    h.get_by(|n| n.is_focused()).type_text(text);
    h.run();
}

#[test]
fn bedding_as_strike_and_dip_traverse_and_a_gps_fix_are_applied_as_one_undo_step() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    let total = h.state().doc.section().total_thickness_m();
    let before = h.state().doc.section().clone();
    h.key_press_modifiers(Modifiers::COMMAND | Modifiers::SHIFT, Key::D);
    h.run();
    h.run();
    assert!(h.state().section_details_open());
    type_dialog(&mut h, "Thickness uncertainty ± (m)", "0.05");
    h.get_by_label("strike / dip (right-hand rule)").click();
    h.run();
    type_dialog(&mut h, "Strike (°, right-hand rule)", "300");
    type_dialog(&mut h, "Bedding dip (°)", "20");
    type_dialog(&mut h, "Traverse bearing (°)", "120");
    type_dialog(&mut h, "Ground slope (°)", "-8");
    h.get_by_label("Add GPS fix").click();
    h.run();
    let k = before.fixes.len() + 1;
    let (lat, lon, note) =
        (format!("Fix {k} latitude"), format!("Fix {k} longitude"), format!("Fix {k} note"));
    // Off the globe first (WGS84 latitude lies within ±90°): marked, nothing stored.
    type_dialog(&mut h, &lat, "-95");
    type_dialog(&mut h, &lon, "133.7208");
    h.get_by_label("Apply").click();
    h.run();
    h.run();
    assert!(h.state().section_details_open(), "a fix that does not read keeps the dialog open");
    assert!(shown_containing(&h, &format!("GPS fix {k}, latitude")), "the fix's problem is shown");
    assert_eq!(h.state().doc.section(), &before, "nothing was stored");
    type_dialog(&mut h, &lat, "-24.6105");
    type_dialog(&mut h, &note, "cairn — top of the Río wall");
    h.get_by_label("Apply").click();
    h.run();
    h.run();
    assert!(!h.state().section_details_open());
    let s = h.state().doc.section().clone();
    // Right-hand rule: dip direction = strike + 90° (common practice).
    let b = s.bedding.expect("bedding stored");
    assert_eq!((b.dip_deg, b.dip_direction_deg), (20.0, 30.0));
    let t = s.traverse.expect("traverse stored");
    assert_eq!((t.bearing_deg, t.slope_deg), (120.0, -8.0));
    assert_eq!(s.thickness_uncertainty_m, Some(0.05));
    assert_eq!(s.fixes.len(), before.fixes.len() + 1);
    let f = s.fixes.last().expect("the new fix");
    assert_eq!((f.height_m, f.lat_deg, f.lon_deg), (total, -24.6105, 133.7208), "a new fix is at the top");
    assert_eq!(f.note, "cairn — top of the Río wall");
    undo(&mut h);
    assert_eq!(h.state().doc.section(), &before, "one undo takes the whole setting back");
}

/// Type text one character per frame (a key's press, its text, its release), as a window
/// system reports typing.
fn keys(h: &mut Harness<'static, AggradeApp>, text: &str) {
    for c in text.chars() {
        let key = Key::from_name(&c.to_uppercase().to_string());
        let event = |pressed| {
            key.map(|key| Event::Key {
                key,
                physical_key: None,
                pressed,
                repeat: false,
                modifiers: Modifiers::NONE,
            })
        };
        h.input_mut()
            .events
            .extend(event(true).into_iter().chain([Event::Text(c.to_string())]).chain(event(false)));
        h.step();
    }
}

fn press(h: &mut Harness<'static, AggradeApp>, key: Key, times: usize) {
    for _ in 0..times {
        h.key_press(key);
        h.step();
    }
}

#[test]
fn optional_columns_are_chosen_remembered_and_typed_in_the_entry_row_with_tab() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    h.get_by_label("Columns…").click();
    h.run();
    h.get_by_label("Facies code (suggested ones marked ?)").click();
    h.run();
    h.get_by_label("Munsell colour").click();
    h.run();
    h.key_press(Key::Escape);
    h.run();
    let kept = std::fs::read_to_string(data.path().join("table_columns.json")).expect("the choice is kept");
    assert!(kept.contains("facies") && kept.contains("munsell") && !kept.contains("photos"), "{kept}");

    // Another window on the same data folder shows the same columns, with their headings.
    let mut h = harness_of(app_with(None, data.path(), Vec::new()));
    h.run();
    h.run();
    let n = h.state().doc.section().beds.len();
    // A digit starts a new bed; Tab runs through the 13 cells, then the shown columns' cells:
    // thickness, (lithology), grain, then 10 Tabs to the notes and one more to the facies.
    keys(&mut h, "0.8");
    press(&mut h, Key::Tab, 2);
    keys(&mut h, "m");
    press(&mut h, Key::Tab, 11);
    keys(&mut h, "Sp");
    press(&mut h, Key::Tab, 1);
    keys(&mut h, "5YR 4/6");
    press(&mut h, Key::Enter, 1);
    h.run();
    let beds = &h.state().doc.section().beds;
    assert_eq!(beds.len(), n + 1, "the bed was added on top");
    let top = beds.last().expect("top bed");
    assert_eq!(top.thickness_m, 0.8);
    assert_eq!(top.facies, Some(FaciesCode::Sp));
    assert_eq!(top.munsell, Munsell::parse("5YR 4/6").ok());
    undo(&mut h);
    assert_eq!(h.state().doc.section().beds.len(), n);
}

#[test]
fn a_slope_distance_gives_the_true_thickness_once_the_section_has_a_traverse_and_bedding() {
    use aggrade::gui::Edit;
    use aggrade_core::model::{BeddingAttitude, Traverse};
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    // No traverse and no bedding: the distance is kept, the thickness stays, and the window says
    // what is missing.
    h.state_mut().apply(Edit::SetSectionSetting {
        method: None,
        thickness_uncertainty_m: None,
        bedding: None,
        traverse: None,
        fixes: Vec::new(),
    });
    let id = a_sandstone(&h);
    select(&mut h, id);
    let t0 = bed(&h, id).thickness_m;
    type_into(&mut h, "Slope distance", "3", Key::Enter);
    assert_eq!((bed(&h, id).slope_distance_m, bed(&h, id).thickness_m), (Some(3.0), t0));
    assert!(shown_containing(&h, "no traverse"), "what is missing is said");
    // Flat ground walked straight down the dip direction of beds dipping 30°: the true
    // thickness is s·sin 30° (Compton 1985, apparent and true thickness).
    h.state_mut().apply(Edit::SetSectionSetting {
        method: None,
        thickness_uncertainty_m: None,
        bedding: Some(BeddingAttitude { dip_deg: 30.0, dip_direction_deg: 90.0 }),
        traverse: Some(Traverse { bearing_deg: 90.0, slope_deg: 0.0 }),
        fixes: Vec::new(),
    });
    h.run();
    type_into(&mut h, "Slope distance", "4", Key::Enter);
    let b = bed(&h, id);
    assert_eq!(b.slope_distance_m, Some(4.0));
    assert!(
        (b.thickness_m - 2.0).abs() < 1e-9,
        "4 m along the ground across beds dipping 30°: {}",
        b.thickness_m
    );
    assert!(shown_containing(&h, "True thickness from it: 2.00 m"));
    undo(&mut h);
    assert_eq!((bed(&h, id).slope_distance_m, bed(&h, id).thickness_m), (Some(3.0), t0));
}

#[test]
fn a_photo_whose_file_is_not_there_says_so_when_asked_to_open() {
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    let id = a_sandstone(&h);
    select(&mut h, id);
    if h.query_by_label("Add photo").is_none() {
        h.get_by_label("Samples & photos").scroll_to_me();
        h.run();
        h.get_by_label("Samples & photos").click();
        h.run();
    }
    let n = bed(&h, id).photos.len();
    h.get_by_label("Add photo").scroll_to_me();
    h.run();
    h.get_by_label("Add photo").click();
    h.run();
    h.run();
    assert_eq!(bed(&h, id).photos.len(), n + 1);
    let (reference, file) = (format!("Photo {} reference", n + 1), format!("Photo {} file", n + 1));
    type_into(&mut h, &reference, "IMG_2041", Key::Tab);
    type_into(&mut h, &file, "fotos/afloramiento_sur.jpg", Key::Tab);
    let p = &bed(&h, id).photos[n];
    assert_eq!((p.reference.as_str(), p.file.as_deref()), ("IMG_2041", Some("fotos/afloramiento_sur.jpg")));
    h.get_all_by_label("Open").last().expect("the photo's Open button").click();
    h.run();
    h.run();
    assert!(shown_containing(&h, "There is no image file at"), "a missing file is said, not opened");
    assert!(shown_containing(&h, "afloramiento_sur.jpg"));
}

#[test]
fn a_code_naming_another_rock_is_flagged_under_the_picker_as_check_flags_it() {
    // The first letter of a lithofacies code names its rock (Miall 1978, 1996): a gravel code on
    // a mudstone is flagged in the inspector with the words `aggrade check` prints; a sand code
    // on a sandstone is not.
    let data = tempfile::tempdir().expect("temp dir");
    let mut h = inspector(data.path());
    let mud = h
        .state()
        .doc
        .section()
        .beds
        .iter()
        .find(|b| b.lithology == aggrade_core::model::Lithology::Mudstone && b.facies.is_none())
        .expect("a mudstone")
        .clone();
    let mut wrong = mud.clone();
    wrong.facies = Some(FaciesCode::Gcm);
    h.state_mut()
        .doc
        .apply(aggrade::gui::Edit::ReplaceBed { bed: wrong })
        .expect("stored: the code is the geologist's call");
    select(&mut h, mud.id);
    assert!(shown_containing(&h, "does not fit the rock logged, mudstone"), "the mismatch is flagged");
    let sand = a_sandstone(&h);
    let mut right = bed(&h, sand);
    right.facies = Some(FaciesCode::St);
    h.state_mut().doc.apply(aggrade::gui::Edit::ReplaceBed { bed: right }).expect("stored");
    select(&mut h, sand);
    assert!(!shown_containing(&h, "does not fit the rock logged"), "St on a sandstone fits");
}
