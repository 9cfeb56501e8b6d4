//! Facies transitions up a section as an embedded Markov chain, tested against
//! quasi-independence.
//!
//! Method (Powers & Easterling 1982, J. Sed. Petrology 52; Davis 2002, ch. 4): consecutive beds
//! of the same state are merged first, so no state follows itself and the diagonal of the tally
//! matrix is structurally zero. Expected counts under quasi-independence are e_ij = a_i·b_j for
//! i ≠ j and e_ii = 0, with a and b fitted by iterative proportional fitting so that expected row
//! and column totals equal the observed ones. χ² = Σ_{i≠j} (o − e)²/e with (m − 1)² − m degrees of
//! freedom; G² = 2 Σ o ln(o/e) is reported beside it.
//!
//! Covered intervals break the chain: nobody saw what lies under the cover, so the beds below
//! and above are not counted as a transition (a choice, documented here; merging across a cover
//! would invent transitions that were never observed).
//!
//! States are lithologies ([`lithology_sequence`]) or lithofacies codes ([`facies_sequence`]:
//! the geologist's code, else the suggested one, else the lithology name; see `docs/facies.md`).

use super::gamma::chi_square_sf;
use super::AnalysisError;
use crate::model::{BedId, FaciesCode, Lithology, Section};
use crate::rules::facies::facies_of;
use serde::Serialize;
use std::collections::BTreeSet;

/// Parameters of the transition analysis.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct TransitionParams {
    /// Iterative proportional fitting stops when no expected row or column total differs from
    /// the observed one by more than this many counts.
    pub ipf_tolerance: f64,
    pub ipf_max_iterations: usize,
    /// A transition is listed as "more often than chance" when its standardised residual
    /// (o − e)/√e reaches this value (1.96 ≈ the two-sided 5 % normal point; common practice).
    pub min_standardised_residual: f64,
    /// … and when it was observed at least this many times …
    pub min_observed: u32,
    /// … and when observed − expected is at least this many counts.
    pub min_difference: f64,
}

impl Default for TransitionParams {
    fn default() -> Self {
        TransitionParams {
            ipf_tolerance: 1e-9,
            ipf_max_iterations: 10_000,
            min_standardised_residual: 1.96,
            min_observed: 2,
            min_difference: 1.0,
        }
    }
}

/// One transition that happens more often than quasi-independence predicts.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PreferredTransition {
    pub from: String,
    pub to: String,
    pub observed: u32,
    pub expected: f64,
    /// (o − e)/√e.
    pub standardised_residual: f64,
}

/// Result of the embedded-Markov-chain analysis.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TransitionAnalysis {
    /// State names, in row/column order (sorted).
    pub states: Vec<String>,
    /// Observed counts, `observed[from][to]`; the diagonal is zero.
    pub observed: Vec<Vec<u32>>,
    /// Expected counts under quasi-independence; the diagonal is zero.
    pub expected: Vec<Vec<f64>>,
    /// observed − expected.
    pub difference: Vec<Vec<f64>>,
    /// Total number of transitions.
    pub transitions: u32,
    pub chi_square: f64,
    /// Likelihood-ratio statistic G².
    pub g_square: f64,
    /// (m − 1)² − m.
    pub dof: i64,
    /// Upper-tail χ² probability; `None` when dof < 1 (fewer than three states).
    pub p_value: Option<f64>,
    pub iterations: usize,
    /// Off-diagonal cells with an expected count below 5: when many are, the χ² approximation
    /// is poor (Cochran's rule of thumb, at most 20 % of cells below 5; from memory).
    pub small_expected_cells: usize,
    /// Number of off-diagonal cells, m(m − 1).
    pub cells: usize,
    /// Transitions more frequent than chance, strongest first.
    pub preferred: Vec<PreferredTransition>,
}

/// Observed transition counts from a sequence of states listed base first; `None` entries
/// (e.g. covered intervals) break the chain. Repeated states are merged before counting.
/// Returns the sorted state list and the count matrix; states that take part in no transition
/// are left out.
pub fn count_transitions<S: Ord + Clone>(sequence: &[Option<S>]) -> (Vec<S>, Vec<Vec<u32>>) {
    let mut pairs: Vec<(S, S)> = Vec::new();
    let mut previous: Option<&S> = None;
    for item in sequence {
        match item {
            None => previous = None,
            Some(state) => {
                if let Some(p) = previous {
                    if p != state {
                        pairs.push((p.clone(), state.clone()));
                    }
                }
                previous = Some(state);
            }
        }
    }
    let states: Vec<S> =
        pairs.iter().flat_map(|(a, b)| [a.clone(), b.clone()]).collect::<BTreeSet<_>>().into_iter().collect();
    let mut counts = vec![vec![0u32; states.len()]; states.len()];
    for (a, b) in &pairs {
        // Both are in `states` by construction.
        if let (Ok(i), Ok(j)) = (states.binary_search(a), states.binary_search(b)) {
            counts[i][j] += 1;
        }
    }
    (states, counts)
}

/// The lithology of each bed, covered intervals as `None` (chain breaks).
pub fn lithology_sequence(section: &Section) -> Vec<Option<Lithology>> {
    section.beds.iter().map(|b| (b.lithology != Lithology::Covered).then_some(b.lithology)).collect()
}

/// The facies state of each bed: its lithofacies code in force (the geologist's, else the
/// suggested one); a bed with no code at all is counted under its lithology name ("tuff"), so no
/// observed bed is dropped and no transition invented; covered intervals are `None` (chain
/// breaks).
pub fn facies_sequence(section: &Section) -> Vec<Option<&'static str>> {
    section
        .beds
        .iter()
        .map(|b| {
            if b.is_covered() {
                None
            } else {
                Some(facies_of(b).map_or(b.lithology.name(), |(code, _)| code.code()))
            }
        })
        .collect()
}

/// How one bed entered the facies state set.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BedFaciesState {
    pub bed_id: BedId,
    /// The lithofacies code in force, `None` for a covered interval or a bed with no code.
    pub facies: Option<FaciesCode>,
    /// True when the code is only suggested (not yet confirmed by the geologist).
    pub suggested: bool,
    /// The state counted: the code, the lithology name of an uncoded bed, `None` if covered.
    pub state: Option<&'static str>,
}

/// The facies state set of a section: the states used and where each bed's code came from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FaciesStateSet {
    /// Every state some bed takes, sorted (codes, and lithology names of uncoded beds).
    pub states: Vec<&'static str>,
    /// Beds whose code is only suggested: candidates the geologist has not confirmed.
    pub suggested: usize,
    /// Beds whose code the geologist gave.
    pub confirmed: usize,
    /// Exposed beds with no code (counted under their lithology name).
    pub uncoded: usize,
    pub beds: Vec<BedFaciesState>,
}

/// The facies state set of a section (see [`facies_sequence`]).
pub fn facies_state_set(section: &Section) -> FaciesStateSet {
    let beds: Vec<BedFaciesState> = section
        .beds
        .iter()
        .zip(facies_sequence(section))
        .map(|(b, state)| {
            let f = facies_of(b);
            BedFaciesState {
                bed_id: b.id,
                facies: f.map(|(c, _)| c),
                suggested: f.is_some_and(|(_, s)| s),
                state,
            }
        })
        .collect();
    let states: BTreeSet<&'static str> = beds.iter().filter_map(|b| b.state).collect();
    FaciesStateSet {
        states: states.into_iter().collect(),
        suggested: beds.iter().filter(|b| b.facies.is_some() && b.suggested).count(),
        confirmed: beds.iter().filter(|b| b.facies.is_some() && !b.suggested).count(),
        uncoded: beds.iter().filter(|b| b.facies.is_none() && b.state.is_some()).count(),
        beds,
    }
}

/// Expected counts under quasi-independence (e_ii = 0) by iterative proportional fitting.
/// Returns the matrix and the number of iterations used.
pub fn quasi_independence_expected(
    observed: &[Vec<u32>],
    params: &TransitionParams,
) -> Result<(Vec<Vec<f64>>, usize), AnalysisError> {
    let m = observed.len();
    let rows: Vec<f64> = observed.iter().map(|r| r.iter().map(|&v| f64::from(v)).sum()).collect();
    let cols: Vec<f64> = (0..m).map(|j| observed.iter().map(|r| f64::from(r[j])).sum()).collect();
    let mut a = vec![1.0; m];
    let mut b = vec![1.0; m];
    for iteration in 1..=params.ipf_max_iterations {
        // Row step: fit row totals given b.
        for i in 0..m {
            let s: f64 = (0..m).filter(|&j| j != i).map(|j| b[j]).sum();
            a[i] = if s > 0.0 { rows[i] / s } else { 0.0 };
        }
        // Column step: fit column totals given a.
        for j in 0..m {
            let s: f64 = (0..m).filter(|&i| i != j).map(|i| a[i]).sum();
            b[j] = if s > 0.0 { cols[j] / s } else { 0.0 };
        }
        // Column totals now fit exactly; the row totals measure convergence.
        let worst = (0..m)
            .map(|i| ((0..m).filter(|&j| j != i).map(|j| a[i] * b[j]).sum::<f64>() - rows[i]).abs())
            .fold(0.0, f64::max);
        if worst <= params.ipf_tolerance {
            let e =
                (0..m).map(|i| (0..m).map(|j| if i == j { 0.0 } else { a[i] * b[j] }).collect()).collect();
            return Ok((e, iteration));
        }
    }
    // Tables with a finite fit converge in tens of iterations; running out means the fit lies
    // on the boundary (some a_i·b_j → 0), which happens with sparse tables.
    Err(AnalysisError::SparseTable { what: "the transition table".into() })
}

/// Run the analysis on an observed count matrix with named states.
///
/// ```
/// use aggrade_core::analysis::markov::{analyse_counts, TransitionParams};
/// let states = vec!["mud".to_string(), "sand".to_string(), "coal".to_string()];
/// let observed = vec![vec![0, 6, 4], vec![7, 0, 2], vec![3, 3, 0]];
/// let r = analyse_counts(states, observed, &TransitionParams::default()).unwrap();
/// assert_eq!(r.dof, 1); // (3 − 1)² − 3
/// assert_eq!(r.expected[0][0], 0.0); // no self-transitions
/// ```
pub fn analyse_counts(
    states: Vec<String>,
    observed: Vec<Vec<u32>>,
    params: &TransitionParams,
) -> Result<TransitionAnalysis, AnalysisError> {
    let m = states.len();
    if m < 2 {
        return Err(AnalysisError::TooFewValues {
            what: "facies transition analysis (states)".into(),
            needed: 2,
            got: m,
        });
    }
    if observed.len() != m || observed.iter().any(|r| r.len() != m) {
        return Err(AnalysisError::OutOfRange {
            field: "transition count matrix".into(),
            value: observed.len() as f64,
            valid: format!("the matrix must be {m} × {m}, one row and column per state"),
        });
    }
    let (expected, iterations) = quasi_independence_expected(&observed, params)?;
    let mut chi_square = 0.0;
    let mut g_square = 0.0;
    let mut difference = vec![vec![0.0; m]; m];
    let mut preferred = Vec::new();
    for i in 0..m {
        for j in 0..m {
            if i == j {
                continue;
            }
            let o = f64::from(observed[i][j]);
            let e = expected[i][j];
            difference[i][j] = o - e;
            // A zero expected count only occurs where the whole row or column is empty, so the
            // observed count there is zero too and the cell carries no information.
            if e > 0.0 {
                chi_square += (o - e).powi(2) / e;
                let residual = (o - e) / e.sqrt();
                if residual >= params.min_standardised_residual
                    && observed[i][j] >= params.min_observed
                    && o - e >= params.min_difference
                {
                    preferred.push(PreferredTransition {
                        from: states[i].clone(),
                        to: states[j].clone(),
                        observed: observed[i][j],
                        expected: e,
                        standardised_residual: residual,
                    });
                }
            }
            if o > 0.0 && e > 0.0 {
                g_square += 2.0 * o * (o / e).ln();
            }
        }
    }
    preferred.sort_by(|x, y| {
        y.standardised_residual
            .total_cmp(&x.standardised_residual)
            .then_with(|| x.from.cmp(&y.from))
            .then_with(|| x.to.cmp(&y.to))
    });
    let mi = m as i64;
    let dof = (mi - 1) * (mi - 1) - mi;
    let p_value = if dof >= 1 { Some(chi_square_sf(chi_square, dof as f64)?) } else { None };
    let transitions = observed.iter().flatten().sum();
    let small_expected_cells = (0..m)
        .flat_map(|i| (0..m).map(move |j| (i, j)))
        .filter(|&(i, j)| i != j && expected[i][j] < 5.0)
        .count();
    Ok(TransitionAnalysis {
        small_expected_cells,
        cells: m * (m - 1),
        states,
        observed,
        expected,
        difference,
        transitions,
        chi_square,
        g_square,
        dof,
        p_value,
        iterations,
        preferred,
    })
}

/// Transition analysis of a sequence of states (base first, `None` breaks the chain).
pub fn analyse_sequence<S: Ord + Clone + ToString>(
    sequence: &[Option<S>],
    params: &TransitionParams,
) -> Result<TransitionAnalysis, AnalysisError> {
    let (states, counts) = count_transitions(sequence);
    analyse_counts(states.iter().map(ToString::to_string).collect(), counts, params)
}

/// Lithology transitions of a whole section.
pub fn analyse_section(
    section: &Section,
    params: &TransitionParams,
) -> Result<TransitionAnalysis, AnalysisError> {
    let seq: Vec<Option<&'static str>> =
        lithology_sequence(section).into_iter().map(|l| l.map(Lithology::name)).collect();
    analyse_sequence(&seq, params)
}

/// Lithofacies transitions of a whole section (states from [`facies_sequence`]).
pub fn analyse_section_facies(
    section: &Section,
    params: &TransitionParams,
) -> Result<TransitionAnalysis, AnalysisError> {
    analyse_sequence(&facies_sequence(section), params)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Davis (2002), Statistics and Data Analysis in Geology, ch. 4 (rows from, columns to, A–E).
    fn davis() -> Vec<Vec<u32>> {
        vec![
            vec![0, 13, 36, 19, 52],
            vec![29, 0, 5, 4, 0],
            vec![35, 2, 0, 45, 12],
            vec![29, 1, 44, 0, 3],
            vec![26, 23, 9, 9, 0],
        ]
    }

    #[test]
    fn davis_worked_example() {
        let states = ["A", "B", "C", "D", "E"].map(String::from).to_vec();
        let r = analyse_counts(states, davis(), &TransitionParams::default()).expect("valid");
        // Computed from the transition counts of Davis 2002, Statistics and Data Analysis in Geology,
        // 3rd ed., chapter 5 (embedded Markov chain example; chapter from memory): χ² = 173.61, G² = 159.33, df = 11,
        // e_AB = 15.03, e_AE = 28.02.
        assert!((r.chi_square - 173.61).abs() < 0.005, "{}", r.chi_square);
        assert!((r.g_square - 159.33).abs() < 0.005, "{}", r.g_square);
        assert_eq!(r.dof, 11);
        assert!((r.expected[0][1] - 15.03).abs() < 0.005, "{}", r.expected[0][1]);
        assert!((r.expected[0][4] - 28.02).abs() < 0.005, "{}", r.expected[0][4]);
        // Margins reproduce the observed ones (the defining property of the fit).
        for i in 0..5 {
            let ro: f64 = davis()[i].iter().map(|&v| f64::from(v)).sum();
            let re: f64 = r.expected[i].iter().sum();
            assert!((ro - re).abs() < 1e-6);
            assert_eq!(r.expected[i][i], 0.0);
        }
        // A → E is observed 52 times against 28.02 expected: (52 − 28.02)/√28.02 ≈ 4.5.
        assert!(r.preferred.iter().any(|t| t.from == "A" && t.to == "E"), "{:?}", r.preferred);
        assert!(r.preferred.windows(2).all(|w| w[0].standardised_residual >= w[1].standardised_residual));
        assert!(r.preferred.iter().all(|t| t.standardised_residual >= 1.96));
        assert!(r.preferred.iter().all(|t| f64::from(t.observed) - t.expected >= 1.0));
        // A stricter difference threshold keeps only the larger excesses.
        let strict = TransitionParams { min_difference: 15.0, ..Default::default() };
        let states = ["A", "B", "C", "D", "E"].map(String::from).to_vec();
        let s = analyse_counts(states, davis(), &strict).expect("valid");
        assert!(s.preferred.len() < r.preferred.len());
        assert!(s.preferred.iter().any(|t| t.from == "A" && t.to == "E"), "52 − 28.02 ≈ 24 ≥ 15");
        assert!(r.p_value.expect("dof 11") < 1e-20);
    }

    #[test]
    fn repeats_merge_and_covers_break_the_chain() {
        let seq = [Some("sand"), Some("sand"), Some("mud"), None, Some("sand"), Some("mud"), Some("coal")];
        let (states, c) = count_transitions(&seq);
        assert_eq!(states, vec!["coal", "mud", "sand"]);
        // sand→mud twice, mud→coal once; no mud→sand across the cover.
        assert_eq!(c, vec![vec![0, 0, 0], vec![1, 0, 0], vec![0, 2, 0]]);
    }

    #[test]
    fn two_states_have_no_degrees_of_freedom() {
        let r = analyse_sequence(&[Some("a"), Some("b"), Some("a")], &TransitionParams::default())
            .expect("valid");
        assert_eq!(r.dof, -1);
        assert_eq!(r.p_value, None);
        assert!(analyse_sequence::<&str>(&[Some("a")], &TransitionParams::default()).is_err());
    }

    #[test]
    fn a_table_with_no_finite_fit_is_reported_as_sparse() {
        // c → s → m once each: fitting the margins forces e_cm = 0 and e_cs = 1 with a_c = 0,
        // which no finite a, b give.
        let r = analyse_sequence(&[Some("c"), Some("s"), Some("m")], &TransitionParams::default());
        assert!(matches!(r, Err(AnalysisError::SparseTable { .. })), "{r:?}");
        // Davis's table is dense: all 20 expected counts are above 5.
        let states = ["A", "B", "C", "D", "E"].map(String::from).to_vec();
        let d = analyse_counts(states, davis(), &TransitionParams::default()).expect("valid");
        assert_eq!((d.cells, d.small_expected_cells), (20, 0), "{:?}", d.expected);
    }

    #[test]
    fn facies_states_use_the_code_in_force_and_keep_uncoded_beds() {
        use crate::model::{Bed, GrainSize, Structure, WentworthClass};
        let mut s = Section::new("Facies");
        let mut add = |lith: Lithology, structure: Option<Structure>, code: Option<FaciesCode>| {
            let id = s.next_bed_id();
            let mut b = Bed::new(id, 1.0, lith, Some(GrainSize::Class(WentworthClass::MediumSand)));
            b.structures.extend(structure);
            b.facies = code;
            s.beds.push(b);
        };
        add(Lithology::Sandstone, Some(Structure::TroughCrossBedding), None); // St, suggested
        add(Lithology::Sandstone, Some(Structure::TroughCrossBedding), Some(FaciesCode::Sp)); // changed
        add(Lithology::Covered, None, None);
        add(Lithology::Tuff, None, None); // no code: its lithology
        add(Lithology::Sandstone, Some(Structure::RippleCrossLamination), Some(FaciesCode::Sr)); // confirmed
        assert_eq!(facies_sequence(&s), vec![Some("St"), Some("Sp"), None, Some("tuff"), Some("Sr")]);
        let set = facies_state_set(&s);
        assert_eq!(set.states, vec!["Sp", "Sr", "St", "tuff"]);
        assert_eq!((set.suggested, set.confirmed, set.uncoded), (1, 2, 1));
        assert!(set.beds[0].suggested && !set.beds[1].suggested && !set.beds[3].suggested);
        assert_eq!(set.beds[2].state, None);
    }
}
