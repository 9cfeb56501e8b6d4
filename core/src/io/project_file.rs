//! The project file (`.aggrade`): versioned JSON, read with every problem reported by path and
//! line, migrated from older versions, and written as pretty, deterministic JSON.

use super::json_scan;
use super::migrate;
use super::problem::Problem;
use super::project_reader::{self, read_project, read_project_raw, FieldRead};
use super::validate::validate_project;
use crate::model::Project;
use serde_json::Value;

/// A project read from text, with warnings; or every problem found.
#[derive(Debug, Clone)]
pub struct ProjectRead {
    pub project: Project,
    /// Warnings (unknown fields, migration notes), with lines where known.
    pub warnings: Vec<Problem>,
}

/// Read project JSON text: limits, syntax, version and migration, fields, then validation.
/// Every problem carries the line its value starts on, where it can be found.
pub fn read_project_text(text: &str) -> Result<ProjectRead, Vec<Problem>> {
    // A byte-order mark (written by some Windows editors) is not JSON; skip it.
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let known = project_reader::known_fields();
    let unknown = json_scan::check_limits_and_fields(text, &known).map_err(|p| vec![p])?;
    // Fast path: a valid current-version file deserialises directly, without a JSON tree (about a
    // third of the time). Anything else takes the slow path below, which names every problem.
    if let Ok(project) = serde_json::from_str::<Project>(text) {
        if project.format_version == Project::CURRENT_VERSION && validate_project(&project).is_empty() {
            let warnings = unknown
                .into_iter()
                .map(|(path, line)| {
                    let role = if path.contains(".beds[") {
                        "bed"
                    } else if path.contains(".curves[") {
                        "curve"
                    } else if path.starts_with("sections[") {
                        "section"
                    } else {
                        "project"
                    };
                    let known = project_reader::known_list(role);
                    Problem::new(path, format!("unknown field, ignored (known fields: {known})"))
                        .at_line(line)
                })
                .collect();
            let mut warnings: Vec<Problem> = warnings;
            warnings.extend(retired_params(&project));
            return Ok(ProjectRead { project, warnings });
        }
    }
    // Anything else is read without a JSON tree of the whole file: first a syntax check that
    // gives the same message as the tree's parser, then the beds one by one.
    let syntax_problem = |e: serde_json::Error| {
        let what = match e.classify() {
            serde_json::error::Category::Eof => "the file ends too soon (truncated?)",
            serde_json::error::Category::Syntax => "not valid JSON",
            _ => "not readable JSON",
        };
        // serde_json's message ends with "at line L column C"; we give the line ourselves.
        let msg = e.to_string();
        let msg = msg.split(" at line ").next().unwrap_or(&msg).to_string();
        let hint = match text
            .lines()
            .nth(e.line().saturating_sub(1))
            .and_then(|l| l.get(e.column().saturating_sub(1)..))
        {
            Some(rest) if ["NaN", "Infinity", "-Infinity", "inf"].iter().any(|w| rest.starts_with(w)) => {
                "; JSON has no NaN or Infinity: write a finite number"
            }
            _ => "",
        };
        let column = char_column(text, e.line(), e.column());
        vec![Problem::new("", format!("{what}: {msg} (column {column}){hint}")).at_line(e.line())]
    };
    project_reader::check_json_syntax(text).map_err(syntax_problem)?;
    let mut warnings = Vec::new();
    let version = match project_reader::root_field(text, "format_version") {
        None => 0,
        Some(v) => match v.as_u64() {
            Some(n) if n <= u64::from(Project::CURRENT_VERSION) => n as u32,
            Some(n) => {
                return Err(with_lines(
                    text,
                    vec![Problem::new(
                        "format_version",
                        format!(
                            "{n} is newer than this build reads (0–{}); update Aggrade to open it",
                            Project::CURRENT_VERSION
                        ),
                    )],
                    Project::CURRENT_VERSION,
                ))
            }
            None => {
                return Err(with_lines(
                    text,
                    vec![Problem::new(
                        "format_version",
                        format!("must be a whole number 0–{}, got {v}", Project::CURRENT_VERSION),
                    )],
                    Project::CURRENT_VERSION,
                ))
            }
        },
    };
    let migrated = version < Project::CURRENT_VERSION;
    let mut problems = Vec::new();
    if version == 0 {
        warnings.push(Problem::new(
            "format_version",
            format!("read a version 0 file; saving writes version {}", Project::CURRENT_VERSION),
        ));
    }
    let FieldRead { project, problems: read_problems, warnings: read_warnings } =
        if migrated && project_reader::is_object(text) {
            // Older versions are migrated as a tree.
            let mut root: Value = serde_json::from_str(text).map_err(syntax_problem)?;
            if version == 0 {
                problems.extend(migrate::v0_to_v1(&mut root));
            }
            migrate::v1_to_v2(&mut root);
            read_project(&root)
        } else {
            read_project_raw(text, &project_reader::beds_with_unknown_fields(&unknown))
        };
    let salvaged = if project.is_none() && !read_problems.is_empty() {
        salvage_problems(text, version, &read_problems)
    } else {
        Vec::new()
    };
    problems.extend(read_problems);
    problems.extend(salvaged);
    warnings.extend(read_warnings);
    if let Some(project) = &project {
        problems.extend(validate_project(project));
    }
    match project {
        Some(project) if problems.is_empty() => {
            warnings.extend(retired_params(&project));
            Ok(ProjectRead { project, warnings: with_lines(text, warnings, version) })
        }
        _ => Err(with_lines(text, problems, version)),
    }
}

/// The fields of a bed or a section that every file must have: a problem in one of them stops
/// the rest of the file being checked in the same run.
const REQUIRED: &[&str] = &["id", "thickness_m", "lithology", "name", "beds"];

/// When fields did not read, the rest of the file is still checked, so that one run names the
/// range problems too (a bioturbation index of 9 beside a bad Munsell string): each faulty field
/// of a section or bed is taken out of a copy of the file (a list, such as the paleocurrent
/// readings, goes whole), what remains is read and validated, and the problems found in fields
/// not already reported are returned. Nothing comes back when a required field was faulty or the
/// copy still does not read; the faulty fields themselves are always reported by the reader.
fn salvage_problems(text: &str, version: u32, read_problems: &[Problem]) -> Vec<Problem> {
    let Ok(mut root) = serde_json::from_str::<Value>(text) else { return Vec::new() };
    if version == 0 {
        migrate::v0_to_v1(&mut root);
    }
    if version < 2 {
        migrate::v1_to_v2(&mut root);
    }
    let mut taken: Vec<String> = Vec::new();
    for p in read_problems {
        let Some((owner, field)) = owning_field(&p.location) else { return Vec::new() };
        if REQUIRED.contains(&field.as_str()) {
            return Vec::new();
        }
        let Some(obj) = object_at(&mut root, &owner) else { return Vec::new() };
        obj.remove(&field);
        taken.push(if owner.is_empty() { field } else { format!("{owner}.{field}") });
    }
    let Ok(project) = serde_json::from_value::<Project>(root) else { return Vec::new() };
    let near =
        |a: &str, b: &str| a == b || a.starts_with(&format!("{b}.")) || a.starts_with(&format!("{b}["));
    validate_project(&project)
        .into_iter()
        .filter(|v| !taken.iter().any(|t| near(&v.location, t)))
        .filter(|v| !read_problems.iter().any(|r| near(&v.location, &r.location)))
        .collect()
}

/// The object holding the field a problem is in, and the field's name: for
/// `sections[0].beds[3].paleocurrents[1].azimuth_deg`, (`sections[0].beds[3]`, `paleocurrents`);
/// for `sections[1].coordinates.lat_deg`, (`sections[1]`, `coordinates`); for `rule_params`,
/// (``, `rule_params`). `None` for a path that names no field (a whole bed or section).
fn owning_field(path: &str) -> Option<(String, String)> {
    let parts: Vec<&str> = path.split('.').collect();
    // The owner is the deepest `sections[i]` or `beds[j]` step; the field follows it.
    let owner_len = parts
        .iter()
        .rposition(|p| {
            (p.starts_with("sections[") || p.starts_with("beds["))
                && p.ends_with(']')
                && !p[..p.len() - 1].contains(']')
        })
        .map_or(0, |i| i + 1);
    let field = parts.get(owner_len)?;
    let field = field.split('[').next().unwrap_or(field);
    if field.is_empty() {
        return None;
    }
    Some((parts[..owner_len].join("."), field.to_string()))
}

/// The JSON object at a path of `sections[i]` and `beds[j]` steps.
fn object_at<'a>(root: &'a mut Value, path: &str) -> Option<&'a mut serde_json::Map<String, Value>> {
    let mut at = root;
    if !path.is_empty() {
        for step in path.split('.') {
            let (key, index) = step.strip_suffix(']')?.split_once('[')?;
            at = at.get_mut(key)?.get_mut(index.parse::<usize>().ok()?)?;
        }
    }
    at.as_object_mut()
}

/// Warnings for rule-parameter names this version no longer reads.
fn retired_params(project: &Project) -> Vec<Problem> {
    crate::rules::RuleParams::from_fields(&project.rule_params)
        .map(|read| read.warnings.into_iter().map(|w| Problem::new("rule_params", w)).collect())
        .unwrap_or_default()
}

/// The column in characters (as an editor shows it) of byte column `byte_column` (1-based, as
/// the JSON parser counts) on line `line` (1-based) of `text`. A byte inside a character counts
/// as that character.
fn char_column(text: &str, line: usize, byte_column: usize) -> usize {
    let Some(line_text) = text.split('\n').nth(line.saturating_sub(1)) else { return byte_column };
    let byte = byte_column.saturating_sub(1);
    line_text.char_indices().take_while(|(i, c)| i + c.len_utf8() <= byte).count() + 1
}

/// A current path as spelt in a file of an older version, when it differs.
fn older_path(path: &str, version: u32) -> Option<String> {
    if version >= Project::CURRENT_VERSION {
        return None;
    }
    let v1 = migrate::v1_path(path);
    if version >= 1 {
        return v1;
    }
    let v1 = v1.unwrap_or_else(|| path.to_string());
    v0_path(&v1)
}

/// Attach line numbers to problems located by JSON path, in a file of version `from_version`.
fn with_lines(text: &str, mut problems: Vec<Problem>, from_version: u32) -> Vec<Problem> {
    let wanted: Vec<String> = problems
        .iter()
        .filter(|p| p.line.is_none() && !p.location.is_empty())
        .flat_map(|p| {
            let mut paths = vec![p.location.clone()];
            paths.extend(older_path(&p.location, from_version));
            paths
        })
        .collect();
    let refs: Vec<&str> = wanted.iter().map(String::as_str).collect();
    let lines = json_scan::lines_of(text, &refs);
    for p in problems.iter_mut().filter(|p| p.line.is_none()) {
        let older = older_path(&p.location, from_version);
        // Prefer the exact field under its older name over the current path's nearest ancestor.
        let exact = |path: &str| lines.get(path).copied();
        p.line = older.as_deref().and_then(exact).or_else(|| exact(&p.location));
    }
    for p in problems.iter_mut().filter(|p| p.line.is_none() && p.location.is_empty()) {
        p.line = Some(1); // The root value.
    }
    // File order reads best.
    problems.sort_by_key(|p| p.line);
    problems
}

/// The v0 path of a v1 path whose last field was renamed (`…beds[3].thickness_m` → `…thickness`).
fn v0_path(path: &str) -> Option<String> {
    let (head, last) = match path.rfind('.') {
        Some(i) => (&path[..=i], &path[i + 1..]),
        None => ("", path),
    };
    // Strip an index on the last field (`paleocurrents_deg[2]`).
    let (field, index) = match last.find('[') {
        Some(i) => (&last[..i], &last[i..]),
        None => (last, ""),
    };
    migrate::v0_field_name(field).map(|v0| format!("{head}{v0}{index}"))
}

/// The project as pretty JSON (two-space indent, fields in declaration order, newline at end):
/// the same project always gives the same bytes.
pub fn project_to_json(project: &Project) -> Result<String, serde_json::Error> {
    let mut text = serde_json::to_string_pretty(project)?;
    text.push('\n');
    Ok(text)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn problems_carry_lines() {
        let text = r#"{
  "format_version": 1,
  "sections": [
    {
      "name": "Halloway Bluff",
      "beds": [
        {"id": 1, "thickness_m": 1.5, "lithology": "sandstone", "grain_base": "fine sand", "grain_top": "fine sand"},
        {"id": 2, "thickness_m": -1.2, "lithology": "mudstone", "grain_base": "silt", "grain_top": "silt"}
      ]
    }
  ]
}"#;
        let problems = read_project_text(text).expect_err("negative thickness refused");
        assert_eq!(problems.len(), 1);
        assert_eq!(problems[0].line, Some(8));
        assert_eq!(problems[0].location, "sections[0].beds[1].thickness_m");
        assert!(problems[0].message.contains("-1.2"), "{}", problems[0]);
    }

    #[test]
    fn truncated_json_names_the_line() {
        let problems =
            read_project_text("{\n \"format_version\": 1,\n \"sections\": [\n").expect_err("refused");
        assert_eq!(problems.len(), 1);
        assert!(problems[0].message.contains("ends too soon"), "{}", problems[0]);
        assert!(problems[0].line.is_some());
    }

    #[test]
    fn a_faulty_field_does_not_hide_range_problems_elsewhere() {
        // A Munsell string that does not read (a type problem) and a bioturbation index of 9 and
        // a bedding dip of 120° (range problems) are all named in one run.
        let text = r#"{
  "format_version": 2,
  "sections": [
    {
      "name": "A",
      "bedding": {"dip_deg": 120.0, "dip_direction_deg": 10.0},
      "beds": [
        {"id": 1, "thickness_m": 2.0, "lithology": "mudstone", "munsell": "5YR4-4"},
        {"id": 2, "thickness_m": 1.0, "lithology": "sandstone", "bioturbation_index": 9,
         "paleocurrents": [{"azimuth_deg": "NE"}]}
      ]
    }
  ]
}"#;
        let problems = read_project_text(text).expect_err("refused");
        let at: Vec<&str> = problems.iter().map(|p| p.location.as_str()).collect();
        assert!(at.contains(&"sections[0].beds[0].munsell"), "{problems:?}");
        assert!(at.iter().any(|l| l.starts_with("sections[0].beds[1].paleocurrents[0]")), "{problems:?}");
        assert!(at.contains(&"sections[0].beds[1].bioturbation_index"), "{problems:?}");
        assert!(at.iter().any(|l| l.starts_with("sections[0].bedding")), "{problems:?}");
        assert!(problems.iter().all(|p| p.line.is_some()), "every problem has its line: {problems:?}");
        // A faulty required field stops there: only what the reader found.
        let bad_thickness = text.replace("\"thickness_m\": 2.0", "\"thickness_m\": \"two\"");
        let problems = read_project_text(&bad_thickness).expect_err("refused");
        assert!(!problems.iter().any(|p| p.location.ends_with("bioturbation_index")), "{problems:?}");
        assert_eq!(
            owning_field("sections[0].beds[3].paleocurrents[1].azimuth_deg"),
            Some(("sections[0].beds[3]".to_string(), "paleocurrents".to_string()))
        );
        assert_eq!(
            owning_field("sections[1].coordinates.lat_deg"),
            Some(("sections[1]".into(), "coordinates".into()))
        );
        assert_eq!(owning_field("rule_params"), Some((String::new(), "rule_params".into())));
    }

    #[test]
    fn newer_versions_are_refused() {
        let problems = read_project_text(r#"{"format_version": 7, "sections": []}"#).expect_err("refused");
        assert!(problems[0].message.contains("newer"), "{}", problems[0]);
    }

    #[test]
    fn v0_problem_lines_point_at_v0_fields() {
        let text = "{\"sections\": [{\"name\": \"A\", \"beds\": [\n{\"lithology\": \"sandstone\",\n \"grain\": \"fine sand\",\n \"thickness\": -3}]}]}";
        let problems = read_project_text(text).expect_err("refused");
        assert_eq!(problems.len(), 1, "{problems:?}");
        assert_eq!(problems[0].location, "sections[0].beds[0].thickness_m");
        assert_eq!(problems[0].line, Some(4));
    }
}
