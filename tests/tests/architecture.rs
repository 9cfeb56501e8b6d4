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
