//! `--params FILE`, shared by every command that runs the rules: the project's own parameters
//! (`rule_params`), then the file's fields on top for this run only.

use aggrade_core::model::Project;
use aggrade_core::rules::RuleParams;
use anyhow::{anyhow, bail, Context};
use std::path::{Path, PathBuf};

/// The rule-parameter option of a command.
#[derive(Debug, Clone, Default, clap::Args)]
pub struct RulesArgs {
    /// Rule parameters for this run as a JSON object, laid over the project's own (its
    /// `rule_params`; the defaults for a CSV); fields left out keep those values.
    #[arg(long, value_name = "FILE")]
    pub params: Option<PathBuf>,
}

impl RulesArgs {
    /// The parameters to run with: the project's, then `--params`. Warnings (retired names) go to
    /// standard error; every fault is named with its file and field.
    pub fn resolve(&self, project: &Project, file: &Path) -> anyhow::Result<RuleParams> {
        let from_project = RuleParams::from_fields(&project.rule_params)
            .map_err(|faults| anyhow!("{}: rule_params: {}", file.display(), faults.join("; ")))?;
        for w in &from_project.warnings {
            eprintln!("aggrade: warning: {}: rule_params.{w}", file.display());
        }
        let Some(path) = &self.params else {
            return Ok(from_project.params);
        };
        let text =
            std::fs::read_to_string(path).with_context(|| format!("{}: cannot read", path.display()))?;
        let value: serde_json::Value = serde_json::from_str(&text).map_err(|e| {
            anyhow!(
                "{}: line {}, column {}: {e}; valid is a JSON object of rule parameters",
                path.display(),
                e.line(),
                e.column()
            )
        })?;
        let Some(over) = value.as_object() else {
            bail!("{}: valid is a JSON object of rule parameters, e.g. {{\"window_m\": 20}}", path.display());
        };
        // The file's own faults first, named against the file.
        let own = RuleParams::from_fields(over)
            .map_err(|faults| anyhow!("{}: {}", path.display(), faults.join("; ")))?;
        for w in &own.warnings {
            eprintln!("aggrade: warning: {}: {w}", path.display());
        }
        let mut fields = project.rule_params.clone();
        fields.extend(over.iter().map(|(k, v)| (k.clone(), v.clone())));
        RuleParams::from_fields(&fields).map(|r| r.params).map_err(|faults| {
            anyhow!(
                "{} laid over the rule_params of {}: {}",
                path.display(),
                file.display(),
                faults.join("; ")
            )
        })
    }
}
