//! Architecture guard: the core library must never depend on a GUI toolkit.

use std::process::Command;

/// Crates that would mean a GUI toolkit has crept into `aggrade-core`'s dependency tree.
const GUI_CRATES: &[&str] = &["egui", "eframe", "egui_plot", "winit", "wgpu", "glow", "rfd", "epaint"];

/// Crate names in `cargo tree` output for one package of the workspace.
fn dependency_names(package: &str) -> Vec<String> {
    let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".to_string());
    let out = Command::new(cargo)
        .args(["tree", "-p", package, "-e", "normal", "--prefix", "none", "--offline"])
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("cargo tree runs");
    assert!(out.status.success(), "cargo tree failed: {}", String::from_utf8_lossy(&out.stderr));
    String::from_utf8_lossy(&out.stdout)
        .lines()
        .filter_map(|l| l.split_whitespace().next().map(str::to_string))
        .collect()
}

#[test]
fn core_has_no_gui_dependency() {
    let names = dependency_names("aggrade-core");
    // The tree must list the core crate and a known dependency, or this check proves nothing.
    assert!(names.iter().any(|n| n == "aggrade-core") && names.iter().any(|n| n == "serde"), "{names:?}");
    let found: Vec<&&str> = GUI_CRATES.iter().filter(|g| names.iter().any(|n| n == *g)).collect();
    assert!(found.is_empty(), "aggrade-core depends on GUI crates {found:?}");
}

#[test]
fn the_same_query_finds_egui_in_the_app() {
    // Control for the guard above: the query must be able to see a GUI crate where there is one.
    let names = dependency_names("aggrade");
    assert!(names.iter().any(|n| n == "egui"), "egui not found in the app's tree");
}

/// Files in a gathered test folder that its `main.rs` does not declare as a module. With
/// `autotests = false` Cargo no longer builds each file on its own, so an undeclared file would
/// silently never run.
fn undeclared_test_files(folder: &std::path::Path) -> Vec<String> {
    let main = std::fs::read_to_string(folder.join("main.rs")).expect("main.rs of a gathered test folder");
    let declared: Vec<&str> = main
        .lines()
        .filter_map(|l| l.trim().strip_prefix("mod ").and_then(|m| m.strip_suffix(';')))
        .collect();
    let mut missing: Vec<String> = std::fs::read_dir(folder)
        .expect("test folder lists")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "rs"))
        .filter_map(|p| p.file_stem().map(|s| s.to_string_lossy().into_owned()))
        .filter(|stem| stem != "main" && !declared.contains(&stem.as_str()))
        .collect();
    missing.sort();
    missing
}

#[test]
fn every_reference_check_file_is_gathered_into_the_test_binary() {
    let folder = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests");
    assert!(folder.join("rules_reference.rs").exists(), "the folder scanned is not the tests folder");
    let missing = undeclared_test_files(&folder);
    assert!(
        missing.is_empty(),
        "test files not declared in tests/tests/main.rs (they would never run): {missing:?}"
    );
}

#[test]
fn an_undeclared_test_file_is_found() {
    // Control for the check above: a folder whose main.rs misses one file must be reported.
    let dir = tempfile::tempdir().expect("temporary folder");
    std::fs::write(dir.path().join("main.rs"), "mod listed;\n").expect("write main.rs");
    std::fs::write(dir.path().join("listed.rs"), "").expect("write listed.rs");
    std::fs::write(dir.path().join("forgotten.rs"), "").expect("write forgotten.rs");
    assert_eq!(undeclared_test_files(dir.path()), vec!["forgotten".to_string()]);
}
