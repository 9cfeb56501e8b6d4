//! `RuleParams`: every threshold and weight the interpretation rules use, with its default and
//! where that default comes from.

use crate::model::{PaleosolDevelopment, WentworthClass};
use serde::{Deserialize, Serialize};

/// Thresholds and weights of the interpretation rules. Every field has a default (see
/// [`RuleParams::default`]); a partial JSON object fills the rest from the defaults.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct RuleParams {
    /// Fines thinner than this (summed over consecutive fine beds) inside a channel storey are a
    /// mud drape and do not end the storey or split the body. Default 0.5 m: common practice
    /// (drapes on bar and dune foresets are centimetres to decimetres thick).
    pub drape_limit_m: f64,
    /// Thickness that counts as "enough" for a channel in the channel-or-splay decision table
    /// below: a sand run at least this thick has one sign of a channel, a thinner one one sign of
    /// a splay. Default 1.0 m: common practice ("roughly < 1 m"); Burns et al. 2017 report splay
    /// sands of ~2.1 m near the channel thinning to ~0.8 m, so thickness alone cannot tell a
    /// proximal splay from a channel: it is one sign among several.
    ///
    /// **Channel or splay** (Miall 1985, 1996 elements CH and CS/LS; Bridge 2003): a run of sand
    /// and gravel beds resting on fines is read from these signs, one point each —
    ///
    /// | channel sign | splay or sheet-sand sign |
    /// | --- | --- |
    /// | erosional base (or erosional relief logged) | sharp or gradational base |
    /// | basal lag (gravel or basal-lag bed thinner than `lag_limit_m`, or a basal-lag structure) | — |
    /// | trough or planar cross-bedding | ripple cross-lamination or horizontal lamination with no cross-bedding, accretion, imbrication, lag or mud clasts |
    /// | lateral- or downstream-accretion surfaces | — |
    /// | fining-upward profile | coarsening-upward profile |
    /// | at least `splay_limit_m` thick | thinner than `splay_limit_m` |
    /// | — | coarsest grain no coarser than `splay_max_grain` |
    ///
    /// More channel signs than splay signs make a channel storey; more splay signs a splay (or
    /// sheet) sand; a tie goes by thickness alone (the first-generation rule, kept as the tie-break
    /// for sparse logs). The geologist's rank of a bed base (storey surface, body base) overrides it.
    pub splay_limit_m: f64,
    /// Coarsest grain a splay sand usually reaches: a run no coarser than this has one splay sign.
    /// Default fine sand: Burns et al. 2017 (splay sands' coarsest grain lower fine sand).
    pub splay_max_grain: WentworthClass,
    /// A basal lag — a gravel bed, or a bed logged with a basal-lag structure — thinner than this
    /// is the floor of the storey above it: an erosional base resting on it starts no new storey.
    /// Default 0.5 m: common practice (channel-floor lags of Miall 1996's facies Gh/Gmm are
    /// centimetres to a few decimetres thick; from memory).
    pub lag_limit_m: f64,
    /// Inside a storey, an erosional-based sand thinner than this (up to the next storey surface,
    /// drapes included) is a scour or set boundary (a lower-rank surface of Miall 1985, 1996), not
    /// a new storey. Default 1.0 m: common practice; storeys record a channel's bankfull depth,
    /// which is metres in most rivers (Bridge 2003), while cross-set and coset boundaries are
    /// decimetres apart.
    pub min_storey_m: f64,
    /// A paleosol profile — consecutive beds with soil development, paleosol features or a
    /// carbonate stage (its horizons, Retallack 2001; Kraus 1999) — counts when its maturity is at
    /// least this; its fines are then `paleosol` elements, its top (once) a candidate boundary, and
    /// it ends the channel body below it, on fines or on a sandstone top alike. Default weak:
    /// common practice (any recorded soil development marks a paleosol).
    pub paleosol_min_development: PaleosolDevelopment,
    /// A profile with a carbonate horizon of at least this stage (Machette 1985, after Gile et
    /// al. 1966; 1–6 for I–VI) is at least strongly developed. Default 3 (stage III, a
    /// carbonate-plugged horizon): Retallack 2001's development scale puts strong profiles with
    /// thick calcic horizons (from memory).
    pub strong_carbonate_stage: u8,
    /// A profile with a carbonate horizon of at least this stage is very strongly developed.
    /// Default 4 (stage IV, laminar caps): Retallack 2001 (from memory).
    pub very_strong_carbonate_stage: u8,
    /// A profile with a diagnostic subsurface horizon — a Bt logged with clay coatings (argillic),
    /// a Bk of carbonate stage II or more (calcic) or a Bss (vertic) — is at least this developed.
    /// Default moderate: Retallack 2001's development scale calls a profile moderately developed
    /// once its subsurface clayey or calcareous (stage II) horizon qualifies as argillic or calcic
    /// (from memory).
    pub diagnostic_horizon_development: PaleosolDevelopment,
    /// B horizons (beds designated B…) at least this thick in all make a profile that is already
    /// at least moderately developed strong ("especially thick" subsurface horizons, Retallack
    /// 2001). Default 1.0 m: our choice; Retallack gives no figure, and the B horizons of modern
    /// soils are mostly decimetres to about a metre thick (common practice).
    pub thick_b_horizon_m: f64,
    /// B horizons at least this thick in all make such a profile very strong ("unusually thick",
    /// Retallack 2001). Default 2.0 m: our choice, as above.
    pub very_thick_b_horizon_m: f64,
    /// Height of the moving window of the proportion curve, metres. Default 10 m: common practice
    /// (several storey thicknesses).
    pub window_m: f64,
    /// Spacing of the points of the proportion curve, metres. Default 0.5 m: common practice.
    pub curve_step_m: f64,
    /// Erosional relief larger than this counts as *incision* evidence even where no storey
    /// thickness is at hand to compare it with. Default 3 m: common practice (deeper than the
    /// scours of most single channels; from memory, after Gibling 2006's compilation of channel
    /// and valley dimensions).
    pub relief_limit_m: f64,
    /// Erosional relief larger than this many times the thickest storey of the body the surface
    /// cuts into (or, cutting into fines, of its own body) counts as *incision*: a valley is
    /// deeper than the channels that filled it (Gibling 2006; Holbrook 2001). Default 1.0:
    /// common practice (relief beyond one channel's depth).
    pub incision_relief_ratio: f64,
    /// Height of the stretch below a channel-body base whose channel fills it is compared with
    /// (for a *basinward facies shift*), metres. Default 10 m: common practice (several storey
    /// thicknesses, as the curve window).
    pub boundary_window_m: f64,
    /// The channel fill above a base counts as markedly coarser than the fills below when its
    /// grain (the thickness-weighted median class of its sand and gravel beds, basal lags left
    /// out) exceeds that of every channel fill in the window below by at least this many
    /// Wentworth classes. Default 2 classes (e.g. medium to very coarse sand): common
    /// practice (one class is within the spread of one river's deposits).
    pub facies_shift_min_classes: usize,
    /// Weight of *incision* in a candidate's score (which only orders candidates within a
    /// strength class; see `docs/interpretation-rules.md`). Default 0.3: our choice.
    pub weight_incision: f64,
    /// Weight of a *basinward facies shift*. Default 0.25: our choice.
    pub weight_facies_shift: f64,
    /// Weight of a base *on or truncating a mature paleosol profile*. Default 0.25: our choice.
    pub weight_on_mature_paleosol: f64,
    /// Weight of an *interfluve paleosol* (a mature profile capping floodplain fines, no channel
    /// on it; Kraus 1999; McCarthy & Plint 1998). Default 0.3: our choice.
    pub weight_interfluve_paleosol: f64,
    /// A stretch is called low accommodation when its bodies are multi-storey and its
    /// channel-body proportion is at least this. Default 0.5: Allen 1978 (connectedness rises
    /// sharply above ~50 % channel deposits; from memory).
    pub low_min_proportion: f64,
    /// A stretch is called high accommodation when its bodies are single-storey and its
    /// proportion is at most this. Default 0.3: Larue & Hovadik 2006 (connectivity falls steeply
    /// below ~30 % net-to-gross, i.e. bodies become isolated).
    pub high_max_proportion: f64,
    /// A high-accommodation call needs at least this many isolated bodies in a row. Default 2:
    /// common practice (one isolated body may be a local avulsion).
    pub high_min_isolated_bodies: usize,
    /// A channel-body proportion within this of the low or the high threshold gives no sign
    /// either way: the stretch says "near the threshold" rather than flipping on 0.01. Default
    /// 0.05: common practice (a few metres of sand in a typical stretch).
    pub regime_margin: f64,
    /// A stretch more than this fraction covered is undetermined. Default 0.5: common practice.
    pub max_covered_fraction: f64,
    /// Grain-size change (phi) between the base and the top of a body or storey needed to call it
    /// fining- or coarsening-upward; less is blocky. Default 1 phi (one Wentworth sand class):
    /// common practice.
    pub profile_min_phi_change: f64,
    /// A body whose coarsest grain is at least this class counts as coarse-grained, evidence for
    /// a braided-like style. Default very coarse sand: common practice (gravelly or very coarse
    /// sandy channel fills).
    pub braided_min_coarsest: WentworthClass,
    /// Mud drapes making up less than this share of a body's thickness count as "little mud",
    /// evidence for a braided-like style. Default 0.05: common practice.
    pub little_mud_max_fraction: f64,
    /// A style hint needs at least this many evidence items, and more than the other style.
    /// Default 2: common practice.
    pub style_min_evidence: usize,
}

impl Default for RuleParams {
    fn default() -> Self {
        RuleParams {
            drape_limit_m: 0.5,
            splay_limit_m: 1.0,
            splay_max_grain: WentworthClass::FineSand,
            lag_limit_m: 0.5,
            min_storey_m: 1.0,
            paleosol_min_development: PaleosolDevelopment::Weak,
            strong_carbonate_stage: 3,
            very_strong_carbonate_stage: 4,
            diagnostic_horizon_development: PaleosolDevelopment::Moderate,
            thick_b_horizon_m: 1.0,
            very_thick_b_horizon_m: 2.0,
            window_m: 10.0,
            curve_step_m: 0.5,
            relief_limit_m: 3.0,
            incision_relief_ratio: 1.0,
            boundary_window_m: 10.0,
            facies_shift_min_classes: 2,
            weight_incision: 0.3,
            weight_facies_shift: 0.25,
            weight_on_mature_paleosol: 0.25,
            weight_interfluve_paleosol: 0.3,
            low_min_proportion: 0.5,
            high_max_proportion: 0.3,
            high_min_isolated_bodies: 2,
            regime_margin: 0.05,
            max_covered_fraction: 0.5,
            profile_min_phi_change: 1.0,
            braided_min_coarsest: WentworthClass::VeryCoarseSand,
            little_mud_max_fraction: 0.05,
            style_min_evidence: 2,
        }
    }
}

/// Most curve points produced, whatever the section height and step (keeps memory bounded).
pub const MAX_CURVE_POINTS: usize = 1_000_000;

impl RuleParams {
    /// Every problem with the parameters, as "field: got value; valid is …" sentences.
    pub fn problems(&self) -> Vec<String> {
        let mut out = Vec::new();
        let positive = [
            ("drape_limit_m", self.drape_limit_m),
            ("splay_limit_m", self.splay_limit_m),
            ("lag_limit_m", self.lag_limit_m),
            ("window_m", self.window_m),
            ("curve_step_m", self.curve_step_m),
            ("boundary_window_m", self.boundary_window_m),
            ("thick_b_horizon_m", self.thick_b_horizon_m),
            ("very_thick_b_horizon_m", self.very_thick_b_horizon_m),
        ];
        for (name, v) in positive {
            if !(v.is_finite() && v > 0.0) {
                out.push(format!("{name}: got {v}; valid is a number of metres > 0"));
            }
        }
        let non_negative = [
            ("relief_limit_m", self.relief_limit_m),
            ("min_storey_m", self.min_storey_m),
            ("profile_min_phi_change", self.profile_min_phi_change),
            ("incision_relief_ratio", self.incision_relief_ratio),
            ("weight_incision", self.weight_incision),
            ("weight_facies_shift", self.weight_facies_shift),
            ("weight_on_mature_paleosol", self.weight_on_mature_paleosol),
            ("weight_interfluve_paleosol", self.weight_interfluve_paleosol),
        ];
        for (name, v) in non_negative {
            if !(v.is_finite() && v >= 0.0) {
                out.push(format!("{name}: got {v}; valid is a number ≥ 0"));
            }
        }
        let fractions = [
            ("regime_margin", self.regime_margin),
            ("low_min_proportion", self.low_min_proportion),
            ("high_max_proportion", self.high_max_proportion),
            ("max_covered_fraction", self.max_covered_fraction),
            ("little_mud_max_fraction", self.little_mud_max_fraction),
        ];
        for (name, v) in fractions {
            if !(v.is_finite() && (0.0..=1.0).contains(&v)) {
                out.push(format!("{name}: got {v}; valid is a number from 0 to 1"));
            }
        }
        for (name, v) in [
            ("strong_carbonate_stage", self.strong_carbonate_stage),
            ("very_strong_carbonate_stage", self.very_strong_carbonate_stage),
        ] {
            if !(1..=6).contains(&v) {
                out.push(format!("{name}: got {v}; valid is a carbonate stage from 1 to 6 (I–VI)"));
            }
        }
        if self.very_thick_b_horizon_m < self.thick_b_horizon_m {
            out.push(format!(
                "very_thick_b_horizon_m: got {}; valid is a thickness at least thick_b_horizon_m ({})",
                self.very_thick_b_horizon_m, self.thick_b_horizon_m
            ));
        }
        out
    }
}

/// Parameter names earlier versions used and this one no longer reads (the boundary evidence was
/// rebuilt from independent items; slickensides with carbonate nodules no longer raise a
/// paleosol's maturity, so `vertic_calcic_raises` has nothing to switch). A partial object
/// naming them is read with a warning, not refused, so older project and parameter files still
/// open.
pub const RETIRED: &[&str] = &[
    "boundary_interval_min_score",
    "grain_jump_min_classes",
    "proportion_jump_min",
    "weight_multistory_base",
    "weight_grain_jump",
    "weight_relief",
    "weight_on_strong_paleosol",
    "weight_proportion_jump",
    "vertic_calcic_raises",
];

/// A partial parameter object read: the full set and the warnings (retired names ignored).
#[derive(Debug, Clone, PartialEq)]
pub struct PartialRead {
    pub params: RuleParams,
    pub warnings: Vec<String>,
}

impl RuleParams {
    /// Read a partial JSON object (the rest from the defaults), naming every field at fault:
    /// unknown names, values of the wrong type, and values out of range ([`RuleParams::problems`]).
    /// Retired names are skipped with a warning.
    pub fn from_partial(value: &serde_json::Value) -> Result<PartialRead, Vec<String>> {
        match value.as_object() {
            Some(fields) => RuleParams::from_fields(fields),
            None => Err(vec![format!(
                "rule parameters: got {}; valid is a JSON object such as {{\"window_m\": 20}}",
                short_json(value)
            )]),
        }
    }

    /// [`RuleParams::from_partial`] of an object's fields, as a project stores them
    /// (`Project::rule_params`).
    pub fn from_fields(
        fields: &serde_json::Map<String, serde_json::Value>,
    ) -> Result<PartialRead, Vec<String>> {
        let mut kept = serde_json::Map::new();
        let mut warnings = Vec::new();
        let mut problems = Vec::new();
        for (name, v) in fields {
            if RETIRED.contains(&name.as_str()) {
                warnings.push(format!("{name}: no longer used by the rules; ignored"));
                continue;
            }
            let one = serde_json::Value::Object([(name.clone(), v.clone())].into_iter().collect());
            match serde_json::from_value::<RuleParams>(one) {
                Ok(_) => {
                    kept.insert(name.clone(), v.clone());
                }
                Err(e) if e.to_string().starts_with("unknown field") => {
                    problems.push(match nearest_name(name) {
                        Some(near) => format!("{name}: not a rule parameter; did you mean {near}?"),
                        None => format!(
                            "{name}: not a rule parameter (see docs/interpretation-rules.md for the names)"
                        ),
                    })
                }
                Err(e) => problems.push(format!("{name}: got {}; {e}", short_json(v))),
            }
        }
        if !problems.is_empty() {
            return Err(problems);
        }
        let params: RuleParams = serde_json::from_value(serde_json::Value::Object(kept))
            .map_err(|e| vec![format!("rule parameters: {e}")])?;
        let out_of_range = params.problems();
        if !out_of_range.is_empty() {
            return Err(out_of_range);
        }
        Ok(PartialRead { params, warnings })
    }

    /// The parameters a project holds (`rule_params`, a partial object; the defaults where it
    /// holds none). The project readers refuse faulty ones, so an error here means a project
    /// built in code with bad values; it names them.
    pub fn of_project(project: &crate::model::Project) -> Result<RuleParams, Vec<String>> {
        RuleParams::from_fields(&project.rule_params).map(|r| r.params)
    }

    /// The fields that differ from the defaults, as a partial JSON object (what a project file
    /// stores): empty for the default rules.
    pub fn changed(&self) -> serde_json::Map<String, serde_json::Value> {
        let (Ok(serde_json::Value::Object(mine)), Ok(serde_json::Value::Object(defaults))) =
            (serde_json::to_value(self), serde_json::to_value(RuleParams::default()))
        else {
            return serde_json::Map::new();
        };
        mine.into_iter().filter(|(k, v)| defaults.get(k) != Some(v)).collect()
    }

    /// Which rules produced a result, in words for a printout's footer: "default rules", or
    /// "rules changed from the defaults: window_m = 20, lag_limit_m = 0.3".
    pub fn summary(&self) -> String {
        let changed = self.changed();
        if changed.is_empty() {
            return "default rules".to_string();
        }
        let items: Vec<String> = changed.iter().map(|(k, v)| format!("{k} = {}", short_json(v))).collect();
        format!("rules changed from the defaults: {}", items.join(", "))
    }
}

/// The parameter name closest to a misspelt one (at most 3 edits away), for messages.
fn nearest_name(name: &str) -> Option<String> {
    let serde_json::Value::Object(all) = serde_json::to_value(RuleParams::default()).ok()? else {
        return None;
    };
    let distance = |a: &str, b: &str| {
        // Levenshtein distance, one row at a time.
        let b: Vec<char> = b.chars().collect();
        let mut row: Vec<usize> = (0..=b.len()).collect();
        for (i, ca) in a.chars().enumerate() {
            let mut prev = row[0];
            row[0] = i + 1;
            for (j, cb) in b.iter().enumerate() {
                let cur = row[j + 1];
                row[j + 1] = (prev + usize::from(ca != *cb)).min(row[j] + 1).min(cur + 1);
                prev = cur;
            }
        }
        row[b.len()]
    };
    all.keys().map(|k| (distance(name, k), k)).filter(|(d, _)| *d <= 3).min().map(|(_, k)| k.clone())
}

/// A JSON value in at most 40 characters, for messages.
fn short_json(v: &serde_json::Value) -> String {
    let text = match v {
        serde_json::Value::String(s) => s.clone(),
        other => other.to_string(),
    };
    if text.chars().count() > 40 {
        format!("{}…", text.chars().take(40).collect::<String>())
    } else {
        text
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn defaults_are_valid_and_partial_json_fills_from_defaults() {
        assert!(RuleParams::default().problems().is_empty());
        let p: RuleParams = serde_json::from_str(r#"{"window_m": 20.0}"#).expect("partial params parse");
        assert_eq!(p.window_m, 20.0);
        assert_eq!(p.drape_limit_m, RuleParams::default().drape_limit_m);
    }

    #[test]
    fn partial_objects_name_their_faults_and_skip_retired_names() {
        let read = RuleParams::from_partial(&serde_json::json!({"window_m": 20, "weight_grain_jump": 0.3}))
            .expect("reads");
        assert_eq!(read.params.window_m, 20.0);
        assert_eq!(read.warnings, ["weight_grain_jump: no longer used by the rules; ignored"]);
        let errs = RuleParams::from_partial(
            &serde_json::json!({"windw_m": 20, "lag_limit_m": "x", "drape_limit_m": -1}),
        )
        .expect_err("refused");
        assert_eq!(errs.len(), 2, "{errs:?}");
        assert!(errs[0].starts_with("lag_limit_m: got x;"), "{errs:?}");
        assert_eq!(errs[1], "windw_m: not a rule parameter; did you mean window_m?");
        let errs = RuleParams::from_partial(&serde_json::json!({"drape_limit_m": -1})).expect_err("range");
        assert!(errs[0].starts_with("drape_limit_m: got -1"), "{errs:?}");
        assert!(RuleParams::from_partial(&serde_json::json!([1])).is_err());
    }

    #[test]
    fn changed_fields_round_trip_and_summarise() {
        let p = RuleParams { window_m: 20.0, lag_limit_m: 0.3, ..RuleParams::default() };
        let changed = p.changed();
        assert_eq!(changed.len(), 2);
        let back = RuleParams::from_partial(&serde_json::Value::Object(changed)).expect("reads").params;
        assert_eq!(back, p);
        assert_eq!(RuleParams::default().summary(), "default rules");
        assert_eq!(p.summary(), "rules changed from the defaults: lag_limit_m = 0.3, window_m = 20.0");
    }

    #[test]
    fn bad_values_are_named() {
        let p = RuleParams { curve_step_m: 0.0, low_min_proportion: 1.5, ..RuleParams::default() };
        let problems = p.problems();
        assert_eq!(problems.len(), 2, "{problems:?}");
        assert!(problems[0].starts_with("curve_step_m: got 0"), "{problems:?}");
        assert!(problems[1].starts_with("low_min_proportion: got 1.5"), "{problems:?}");
    }
}
