//! The interpretation and column layout the window draws from: the core's rules and layout,
//! named in one place so the panels do not each reach into the core.

pub use aggrade_core::layout::{column_strip_window, ColumnStrip as Strip, LayoutOptions};
pub use aggrade_core::rules::{interpret, interpret_with, RuleParams};

use aggrade_core::model::Project;

/// The rule parameters the window runs with: the project's own. When the project holds faulty
/// ones (only a project built in code can: the file readers and the edits refuse them) the
/// defaults are used and `problem` says so, for the window to show.
#[derive(Debug, Clone, PartialEq)]
pub struct ProjectRules {
    pub params: RuleParams,
    /// Why the project's parameters were not used, in words; `None` when they were.
    pub problem: Option<String>,
}

/// The parameters of `project` (see [`ProjectRules`]).
pub fn project_rules(project: &Project) -> ProjectRules {
    match RuleParams::of_project(project) {
        Ok(params) => ProjectRules { params, problem: None },
        Err(faults) => ProjectRules {
            params: RuleParams::default(),
            problem: Some(format!(
                "The project's rule parameters are faulty, so the default rules are used: {}",
                faults.join("; ")
            )),
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_projects_parameters_are_used_and_faulty_ones_are_named_not_hidden() {
        let mut p = Project::new(Vec::new());
        assert_eq!(project_rules(&p), ProjectRules { params: RuleParams::default(), problem: None });
        p.rule_params.insert("window_m".into(), serde_json::json!(20.0));
        let r = project_rules(&p);
        assert_eq!(r.params.window_m, 20.0);
        assert_eq!(r.problem, None);
        p.rule_params.insert("window_m".into(), serde_json::json!(-1.0));
        let r = project_rules(&p);
        assert_eq!(r.params, RuleParams::default(), "faulty: the defaults");
        let why = r.problem.expect("a faulty set is reported");
        assert!(why.contains("window_m: got -1"), "{why}");
    }
}
