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

/// Source text with comments, string and character literals blanked out (kept as spaces, so
/// that braces and paths are only those of the code).
fn code_only(src: &str) -> String {
    let c: Vec<char> = src.chars().collect();
    let mut out = String::with_capacity(src.len());
    let mut i = 0;
    while i < c.len() {
        let next = c.get(i + 1).copied();
        if c[i] == '/' && next == Some('/') {
            while i < c.len() && c[i] != '\n' {
                i += 1;
            }
        } else if c[i] == '/' && next == Some('*') {
            let mut depth = 0;
            while i < c.len() {
                if c[i] == '/' && c.get(i + 1) == Some(&'*') {
                    depth += 1;
                    i += 2;
                } else if c[i] == '*' && c.get(i + 1) == Some(&'/') {
                    depth -= 1;
                    i += 2;
                    if depth == 0 {
                        break;
                    }
                } else {
                    i += 1;
                }
            }
            out.push(' ');
        } else if c[i] == 'r' && (next == Some('"') || next == Some('#')) && !prev_is_ident(&c, i) {
            // Raw string r"…" or r#"…"#: ends at a quote followed by as many hashes.
            let mut j = i + 1;
            let mut hashes = 0;
            while c.get(j) == Some(&'#') {
                hashes += 1;
                j += 1;
            }
            if c.get(j) != Some(&'"') {
                out.push(c[i]);
                i += 1;
                continue;
            }
            j += 1;
            while j < c.len() {
                if c[j] == '"' && (0..hashes).all(|k| c.get(j + 1 + k) == Some(&'#')) {
                    j += 1 + hashes;
                    break;
                }
                j += 1;
            }
            i = j;
            out.push_str("\"\"");
        } else if c[i] == '"' {
            i += 1;
            while i < c.len() && c[i] != '"' {
                i += if c[i] == '\\' { 2 } else { 1 };
            }
            i += 1;
            out.push_str("\"\"");
        } else if c[i] == '\'' {
            // A character literal ('x', '\n', '\u{7f}') or a lifetime ('a).
            if next == Some('\\') {
                let mut j = i + 2;
                while j < c.len() && c[j] != '\'' {
                    j += 1;
                }
                i = j + 1;
                out.push_str("' '");
            } else if c.get(i + 2) == Some(&'\'') {
                i += 3;
                out.push_str("' '");
            } else {
                out.push(c[i]);
                i += 1;
            }
        } else {
            out.push(c[i]);
            i += 1;
        }
    }
    out
}

fn prev_is_ident(c: &[char], i: usize) -> bool {
    i > 0 && (c[i - 1].is_alphanumeric() || c[i - 1] == '_')
}

/// Code without `#[cfg(test)] mod NAME { … }` blocks (unit tests may reach anywhere).
fn without_test_modules(code: &str) -> String {
    let mut out = String::new();
    let mut rest = code;
    while let Some(at) = rest.find("#[cfg(test)]") {
        out.push_str(&rest[..at]);
        let after = &rest[at + "#[cfg(test)]".len()..];
        let trimmed = after.trim_start();
        let is_mod = trimmed.strip_prefix("mod ").and_then(|m| {
            let name_end = m.find(|ch: char| !(ch.is_alphanumeric() || ch == '_'))?;
            m[name_end..].trim_start().starts_with('{').then_some(())
        });
        if is_mod.is_none() {
            out.push_str("#[cfg(test)]");
            rest = after;
            continue;
        }
        let open = after.find('{').expect("checked above");
        let mut depth = 0usize;
        let mut end = after.len();
        for (k, ch) in after[open..].char_indices() {
            match ch {
                '{' => depth += 1,
                '}' => {
                    depth -= 1;
                    if depth == 0 {
                        end = open + k + 1;
                        break;
                    }
                }
                _ => {}
            }
        }
        rest = &after[end..];
    }
    out.push_str(rest);
    out
}

/// The module path of a source file under `src/` (`lib.rs` → [], `a/mod.rs` and `a.rs` → [a]).
fn module_of(rel: &std::path::Path) -> Vec<String> {
    let mut parts: Vec<String> = rel.iter().map(|p| p.to_string_lossy().into_owned()).collect();
    let last = parts.pop().unwrap_or_default();
    let stem = last.trim_end_matches(".rs");
    if stem != "mod" && stem != "lib" && stem != "main" {
        parts.push(stem.to_string());
    }
    parts
}

/// Expand the path tree starting at `s` (`a::b::{c, d::{e, f}}`, `a::b`, `a::*`) into paths.
/// Returns the paths and how many characters were read.
fn expand_path_tree(s: &[char]) -> (Vec<Vec<String>>, usize) {
    let mut i = 0;
    let mut prefix: Vec<String> = Vec::new();
    loop {
        while i < s.len() && s[i].is_whitespace() {
            i += 1;
        }
        if i < s.len() && s[i] == '{' {
            i += 1;
            let mut paths = Vec::new();
            loop {
                while i < s.len() && (s[i].is_whitespace() || s[i] == ',') {
                    i += 1;
                }
                if i >= s.len() || s[i] == '}' {
                    i += 1;
                    break;
                }
                let (inner, used) = expand_path_tree(&s[i..]);
                i += used.max(1);
                for p in inner {
                    paths.push(prefix.iter().cloned().chain(p).collect());
                }
            }
            if paths.is_empty() {
                paths.push(prefix);
            }
            return (paths, i);
        }
        let start = i;
        while i < s.len() && (s[i].is_alphanumeric() || s[i] == '_' || s[i] == '*') {
            i += 1;
        }
        if i == start {
            return (vec![prefix], i);
        }
        prefix.push(s[start..i].iter().collect());
        let mut j = i;
        while j < s.len() && s[j].is_whitespace() {
            j += 1;
        }
        if s.get(j) == Some(&':') && s.get(j + 1) == Some(&':') {
            i = j + 2;
        } else {
            return (vec![prefix], i);
        }
    }
}

/// Paths to modules of the same crate named in one file's code: `crate::…` and `super::…`
/// (in `use` trees and in code), each with whether it sits in a `pub use`.
fn crate_paths(code: &str) -> Vec<(Vec<String>, bool)> {
    let c: Vec<char> = code.chars().collect();
    let mut found = Vec::new();
    let mut i = 0;
    while i < c.len() {
        let starts = |w: &str| w.chars().enumerate().all(|(k, ch)| c.get(i + k) == Some(&ch));
        let boundary = i == 0 || !(c[i - 1].is_alphanumeric() || c[i - 1] == '_' || c[i - 1] == ':');
        if boundary && (starts("crate::") || starts("super::")) {
            // A `pub use` statement starts with `pub` and `use` before this path.
            let line_start = code_char_line_start(&c, i);
            let head: String = c[line_start..i].iter().collect();
            let head = head.trim();
            let pub_use = head.starts_with("pub") && head.ends_with("use");
            let (paths, used) = expand_path_tree(&c[i..]);
            for p in paths {
                found.push((p, pub_use));
            }
            i += used.max(1);
        } else {
            i += 1;
        }
    }
    found
}

/// Start of the statement holding position `i` (after the last `;`, `{` or `}` before it).
fn code_char_line_start(c: &[char], i: usize) -> usize {
    c[..i].iter().rposition(|&ch| ch == ';' || ch == '{' || ch == '}').map(|p| p + 1).unwrap_or(0)
}

/// The file-level dependency graph of one crate's sources: `files` maps a path under `src/` to
/// its text; edges go to the file of the deepest module each `crate::`/`super::` path names.
/// A parent's `mod x;` and its `pub use` of its own children are not edges; `#[cfg(test)]`
/// modules are skipped.
fn module_graph(
    files: &std::collections::BTreeMap<std::path::PathBuf, String>,
) -> Vec<(String, Vec<String>)> {
    use std::collections::{BTreeMap, BTreeSet};
    let modules: BTreeMap<Vec<String>, String> =
        files.keys().map(|p| (module_of(p), p.to_string_lossy().into_owned())).collect();
    let mut graph = Vec::new();
    for (path, text) in files {
        let here = module_of(path);
        let is_mod_root = path.ends_with("mod.rs") || path.ends_with("lib.rs") || path.ends_with("main.rs");
        // `super` in a.rs or a/mod.rs is the parent of module a.
        let parent: Vec<String> = here[..here.len().saturating_sub(1)].to_vec();
        let _ = is_mod_root;
        let mut targets = BTreeSet::new();
        for (segments, pub_use) in crate_paths(&without_test_modules(&code_only(text))) {
            let mut module: Vec<String> = Vec::new();
            let mut rest = segments.as_slice();
            if rest.first().map(String::as_str) == Some("crate") {
                rest = &rest[1..];
            } else {
                module = parent.clone();
                rest = &rest[1..];
                while rest.first().map(String::as_str) == Some("super") {
                    module.pop();
                    rest = &rest[1..];
                }
            }
            for s in rest {
                let mut deeper = module.clone();
                deeper.push(s.clone());
                if !modules.contains_key(&deeper) {
                    break;
                }
                module = deeper;
            }
            let own_child = module.len() > here.len() && module.starts_with(&here);
            if pub_use && own_child {
                continue;
            }
            if let Some(file) = modules.get(&module) {
                if file != &path.to_string_lossy() {
                    targets.insert(file.clone());
                }
            }
        }
        graph.push((path.to_string_lossy().into_owned(), targets.into_iter().collect()));
    }
    graph
}

/// Strongly connected components with more than one file (Tarjan's algorithm, Tarjan 1972).
fn module_cycles(graph: &[(String, Vec<String>)]) -> Vec<Vec<String>> {
    struct Tarjan<'a> {
        edges: Vec<Vec<usize>>,
        names: &'a [(String, Vec<String>)],
        index: Vec<Option<usize>>,
        low: Vec<usize>,
        on_stack: Vec<bool>,
        stack: Vec<usize>,
        next: usize,
        found: Vec<Vec<String>>,
    }
    impl Tarjan<'_> {
        fn visit(&mut self, v: usize) {
            self.index[v] = Some(self.next);
            self.low[v] = self.next;
            self.next += 1;
            self.stack.push(v);
            self.on_stack[v] = true;
            for w in self.edges[v].clone() {
                match self.index[w] {
                    None => {
                        self.visit(w);
                        self.low[v] = self.low[v].min(self.low[w]);
                    }
                    Some(iw) if self.on_stack[w] => self.low[v] = self.low[v].min(iw),
                    Some(_) => {}
                }
            }
            if Some(self.low[v]) == self.index[v] {
                let mut scc = Vec::new();
                while let Some(w) = self.stack.pop() {
                    self.on_stack[w] = false;
                    scc.push(self.names[w].0.clone());
                    if w == v {
                        break;
                    }
                }
                if scc.len() > 1 {
                    scc.sort();
                    self.found.push(scc);
                }
            }
        }
    }
    let position = |name: &str| graph.iter().position(|(n, _)| n == name);
    let edges = graph.iter().map(|(_, to)| to.iter().filter_map(|t| position(t)).collect()).collect();
    let n = graph.len();
    let mut t = Tarjan {
        edges,
        names: graph,
        index: vec![None; n],
        low: vec![0; n],
        on_stack: vec![false; n],
        stack: Vec::new(),
        next: 0,
        found: Vec::new(),
    };
    for v in 0..n {
        if t.index[v].is_none() {
            t.visit(v);
        }
    }
    t.found.sort();
    t.found
}

/// Every `.rs` file under a crate's `src/`, keyed by its path relative to `src/`.
fn crate_sources(krate: &str) -> std::collections::BTreeMap<std::path::PathBuf, String> {
    fn walk(
        dir: &std::path::Path,
        root: &std::path::Path,
        out: &mut std::collections::BTreeMap<std::path::PathBuf, String>,
    ) {
        let mut entries: Vec<_> = std::fs::read_dir(dir).expect("source folder reads").flatten().collect();
        entries.sort_by_key(|e| e.path());
        for e in entries {
            let p = e.path();
            if p.is_dir() {
                walk(&p, root, out);
            } else if p.extension().is_some_and(|x| x == "rs") {
                let text = std::fs::read_to_string(&p).expect("source file reads");
                out.insert(p.strip_prefix(root).expect("under root").to_path_buf(), text);
            }
        }
    }
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("..").join(krate).join("src");
    let mut out = std::collections::BTreeMap::new();
    walk(&root, &root, &mut out);
    out
}

fn assert_no_module_cycles(krate: &str) {
    let files = crate_sources(krate);
    let graph = module_graph(&files);
    // The graph must hold the crate's files and some edges, or the check proves nothing.
    assert!(graph.len() > 5, "{krate}: only {} files found", graph.len());
    assert!(graph.iter().any(|(_, to)| !to.is_empty()), "{krate}: no edges found");
    let cycles = module_cycles(&graph);
    assert!(
        cycles.is_empty(),
        "{krate}/src has module cycles (files that import each other, directly or around a circle):\n{}",
        cycles.iter().map(|c| c.join(" ⇄ ")).collect::<Vec<_>>().join("\n")
    );
}

#[test]
fn core_modules_form_no_cycle() {
    assert_no_module_cycles("core");
}

#[test]
fn app_modules_form_no_cycle() {
    assert_no_module_cycles("app");
}

#[test]
fn the_cycle_check_finds_a_circle_in_a_small_tree() {
    // Control for the two checks above, on a synthetic crate.
    let tree = |files: &[(&str, &str)]| -> std::collections::BTreeMap<std::path::PathBuf, String> {
        files.iter().map(|(p, t)| (std::path::PathBuf::from(p), t.to_string())).collect()
    };
    let circle = tree(&[
        ("lib.rs", "mod a; mod b; pub use a::Thing;"),
        ("a/mod.rs", "mod deep; pub use crate::a::deep::Deep; pub struct Thing;"),
        ("a/deep.rs", "use crate::b::{other::Helper, Bee};\npub struct Deep;"),
        ("b/mod.rs", "pub mod other; pub struct Bee;"),
        // A qualified path in code, not in a `use`: b/other → a/mod.
        ("b/other.rs", "pub struct Helper; fn f() -> super::super::a::Thing { crate::a::Thing }"),
        ("c.rs", "// use crate::a::Thing; in a comment is no edge\nconst S: &str = \"crate::b::Bee\";\n#[cfg(test)]\nmod tests { use crate::a::deep::Deep; }"),
    ]);
    let graph = module_graph(&circle);
    let edges_of = |f: &str| graph.iter().find(|(n, _)| n == f).map(|(_, t)| t.clone()).unwrap_or_default();
    assert_eq!(edges_of("a/deep.rs"), ["b/mod.rs", "b/other.rs"]);
    assert_eq!(edges_of("b/other.rs"), ["a/mod.rs"]);
    // `pub use` of its own child is no edge; comments, strings and test modules give none.
    assert!(edges_of("a/mod.rs").is_empty(), "{:?}", edges_of("a/mod.rs"));
    assert!(edges_of("c.rs").is_empty(), "{:?}", edges_of("c.rs"));
    assert!(module_cycles(&graph).is_empty(), "a/mod.rs re-exporting its child is no cycle");

    // a/mod.rs now uses b/other's helper in its own code: a/mod → b/other → a/mod.
    let mut closed = circle.clone();
    closed
        .insert("a/mod.rs".into(), "mod deep; pub struct Thing; fn g() { crate::b::other::Helper; }".into());
    let cycles = module_cycles(&module_graph(&closed));
    assert_eq!(cycles, [vec!["a/mod.rs".to_string(), "b/other.rs".to_string()]]);

    // And a three-file circle through `super::` uses.
    let three = tree(&[
        ("lib.rs", "mod x; mod y; mod z;"),
        ("x.rs", "use super::y::Y; pub struct X;"),
        ("y.rs", "use super::{z::Z}; pub struct Y;"),
        ("z.rs", "use crate::x; pub struct Z;"),
    ]);
    assert_eq!(
        module_cycles(&module_graph(&three)),
        [vec!["x.rs".to_string(), "y.rs".to_string(), "z.rs".to_string()]]
    );
}

/// Files in a gathered test folder that its `main.rs` does not declare as a module. With
/// `autotests = false` Cargo no longer builds each file on its own, so an undeclared file would
/// silently never run.
fn undeclared_test_files(folder: &std::path::Path) -> Vec<String> {
    let main = std::fs::read_to_string(folder.join("main.rs")).expect("main.rs of a gathered test folder");
    let declared: Vec<&str> = main
        .lines()
        .filter_map(|l| {
            l.trim().trim_start_matches("pub ").strip_prefix("mod ").and_then(|m| m.strip_suffix(';'))
        })
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
fn every_test_file_is_gathered_into_its_test_binary() {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let folders = ["tests/tests", "app/tests/cli", "app/tests/gui"];
    for folder in folders {
        let folder = root.join(folder);
        assert!(folder.join("main.rs").exists(), "{} has no main.rs", folder.display());
        let missing = undeclared_test_files(&folder);
        assert!(
            missing.is_empty(),
            "test files not declared in {}/main.rs (they would never run): {missing:?}",
            folder.display()
        );
    }
    // No test file may sit loose in app/tests either: with autotests off it would never run.
    let loose: Vec<_> = std::fs::read_dir(root.join("app/tests"))
        .expect("app/tests lists")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "rs"))
        .collect();
    assert!(loose.is_empty(), "test files outside a gathered folder never run: {loose:?}");
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
