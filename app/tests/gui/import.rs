//! File ▸ Import… in the window (egui_kittest, headless): a table whose headers the importer does
//! not know is shown column by column with its refused cells marked; the geologist maps the
//! columns, imports, and the project gains the section; the mapping is saved and used again for
//! the next table with the same headers.

use super::harness::{app_with, fixture, harness_of};
use aggrade::gui::test_hooks::SAVED_MAPPING_FILE;
use aggrade::gui::AggradeApp;
use aggrade_core::io::import::Field;
use aggrade_core::model::Lithology;
use egui::accesskit::Role;
use egui_kittest::kittest::Queryable;
use egui_kittest::Harness;
use std::path::{Path, PathBuf};

fn harness(data_dir: &Path, answers: Vec<Option<PathBuf>>) -> Harness<'static, AggradeApp> {
    harness_of(app_with(Some(fixture("analysis/kestrel_bluff.aggrade")), data_dir, answers))
}

fn open_import(h: &mut Harness<'static, AggradeApp>) {
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("Import…").click();
    h.run();
}

/// Choose the field of the column whose header is `header`.
fn map_column(h: &mut Harness<'static, AggradeApp>, header: &str, field: &str) {
    h.get_by_role_and_label(Role::ComboBox, header).click();
    h.run();
    h.get_all_by_label(field).last().expect("field in the list").click();
    h.run();
}

const TABLE: &str = "Dicke (m);Gestein;Korn\n1,2;sst;fs\n0,4;mdst;si\n2;granite;\n";

#[test]
fn an_unknown_table_is_mapped_previewed_and_imported() {
    let data = tempfile::tempdir().expect("temp dir");
    let input = data.path().join("Hangprofil.csv");
    std::fs::write(&input, TABLE).expect("write table");
    let fixed = data.path().join("Hangprofil 2.csv");
    std::fs::write(&fixed, TABLE.replace("granite", "cgl;pbl")).expect("write table");
    let mut h = harness(data.path(), vec![Some(input.clone()), Some(fixed.clone())]);
    h.run();
    let sections_before = h.state().doc.project.sections.len();

    open_import(&mut h);
    // The headers are shown; nothing is mapped yet, so Import is not offered.
    h.get_by_label_contains("delimiter ';', decimal comma");
    map_column(&mut h, "Dicke (m)", "thickness");
    map_column(&mut h, "Gestein", "lithology");
    map_column(&mut h, "Korn", "grain");
    // The rows as they will be read: 1,2 → 1.2 m; "sst" → sandstone; the granite row is marked.
    h.get_by_label("1.2 m");
    h.get_by_label("0.4 m");
    h.get_by_label("✗ granite");
    h.get_by_label("Import").click();
    h.run();
    // Refused: the message names the file, the line and the column; nothing was added.
    h.get_by_label_contains("line 4: column \"Gestein\": \"granite\" is not a known lithology");
    assert_eq!(h.state().doc.project.sections.len(), sections_before);
    h.get_by_label("Cancel").click();
    h.run();

    // The mapping was kept: the next table with the same headers opens with it.
    open_import(&mut h);
    h.get_by_label("Import").click();
    h.run();
    let doc = &h.state().doc;
    assert_eq!(doc.project.sections.len(), sections_before + 1);
    let s = doc.project.sections.last().expect("new section");
    assert_eq!(s.name, "Hangprofil 2");
    assert_eq!(s.beds.len(), 3);
    assert_eq!(s.beds[0].thickness_m, 1.2);
    assert_eq!(s.beds[2].lithology, Lithology::Conglomerate);
    assert!(h.state().status.starts_with("Imported Hangprofil 2 (3 beds)"), "{}", h.state().status);
    let saved = std::fs::read_to_string(data.path().join(SAVED_MAPPING_FILE)).expect("mapping saved");
    let saved = aggrade_core::io::import::mapping_from_json(&saved).expect("a mapping");
    assert_eq!(saved.column_of(Field::Thickness), Some(0));
    assert_eq!(saved.column_of(Field::Grain), Some(2));
}
