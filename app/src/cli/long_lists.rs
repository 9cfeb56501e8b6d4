//! Long lists on the terminal: a list of more than [`LONGEST_IN_FULL`] entries (the channel
//! bodies or interval proportions of a section of thousands of beds) is shown by its first and
//! last few entries and a line that counts the rest and says where the full list goes, so the
//! text report stays readable however long the section is.

/// The longest list printed in full.
pub const LONGEST_IN_FULL: usize = 20;
/// Entries shown at each end of a longer list.
pub const SHOWN_AT_EACH_END: usize = 5;

/// True when entry `k` (0-based) of a list of `n` is printed.
pub fn shown(k: usize, n: usize) -> bool {
    n <= LONGEST_IN_FULL || k < SHOWN_AT_EACH_END || k >= n - SHOWN_AT_EACH_END
}

/// The line standing for the entries left out, to be written just before entry `k`: `Some` only
/// at the first entry left out of a long list. `what` names the entries ("channel bodies"),
/// `full` says where every one of them goes ("--json").
pub fn gap_line(k: usize, n: usize, what: &str, full: &str) -> Option<String> {
    (n > LONGEST_IN_FULL && k == SHOWN_AT_EACH_END).then(|| {
        let left_out = n - 2 * SHOWN_AT_EACH_END;
        format!(
            "  … {left_out} more {what} not shown (first {SHOWN_AT_EACH_END} and last {SHOWN_AT_EACH_END} of {n} above and below); all of them: {full}"
        )
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn short_lists_in_full_long_ones_by_their_ends() {
        assert!((0..20).all(|k| shown(k, 20)));
        assert_eq!(gap_line(5, 20, "bodies", "--json"), None);
        let kept: Vec<usize> = (0..1000).filter(|&k| shown(k, 1000)).collect();
        assert_eq!(kept, vec![0, 1, 2, 3, 4, 995, 996, 997, 998, 999]);
        let gaps: Vec<String> = (0..1000).filter_map(|k| gap_line(k, 1000, "bodies", "--json")).collect();
        assert_eq!(gaps.len(), 1);
        assert!(
            gaps[0].contains("990 more bodies") && gaps[0].contains("of 1000") && gaps[0].ends_with("--json")
        );
        // 21 entries: 11 left out, one line says so.
        assert_eq!((0..21).filter(|&k| shown(k, 21)).count(), 10);
    }
}
