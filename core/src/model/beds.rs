//! The beds of a section, base first, each behind a shared pointer: a copy of a section (an undo
//! step, the copy a background worker reads) shares every bed it did not change, so an edit of
//! one bed in a section of 50,000 costs one bed, not 50,000.

use super::section::Bed;
use serde::{Deserialize, Deserializer, Serialize, Serializer};
use std::ops::{Index, IndexMut, Range, RangeBounds};
use std::sync::Arc;

/// The beds of a section, base first. Reads like a list of beds (`beds[i]`, `beds.iter()`,
/// `beds.len()`); writing a bed (`beds[i].thickness_m = …`, `iter_mut`) copies that bed first if
/// another copy of the section still shares it.
#[derive(Clone, Default)]
pub struct Beds(Vec<Arc<Bed>>);

/// Iterator over the beds, base first.
pub type Iter<'a> = std::iter::Map<std::slice::Iter<'a, Arc<Bed>>, fn(&'a Arc<Bed>) -> &'a Bed>;

fn deref_bed(b: &Arc<Bed>) -> &Bed {
    b
}

impl Beds {
    /// No beds.
    pub fn new() -> Self {
        Beds(Vec::new())
    }

    /// No beds, with room for `n`.
    pub fn with_capacity(n: usize) -> Self {
        Beds(Vec::with_capacity(n))
    }

    pub fn len(&self) -> usize {
        self.0.len()
    }

    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }

    /// The beds, base first.
    pub fn iter(&self) -> Iter<'_> {
        self.0.iter().map(deref_bed as fn(&Arc<Bed>) -> &Bed)
    }

    /// The beds with indices in `range` (`a..b`, `a..=b`, `a..`), base first.
    pub fn range(&self, range: impl RangeBounds<usize>) -> Iter<'_> {
        let bounds = (range.start_bound().cloned(), range.end_bound().cloned());
        self.0[bounds].iter().map(deref_bed as fn(&Arc<Bed>) -> &Bed)
    }

    /// Every bed, writable (each shared bed is copied first).
    pub fn iter_mut(&mut self) -> impl DoubleEndedIterator<Item = &mut Bed> + ExactSizeIterator {
        self.0.iter_mut().map(Arc::make_mut)
    }

    pub fn get(&self, i: usize) -> Option<&Bed> {
        self.0.get(i).map(|b| &**b)
    }

    pub fn get_mut(&mut self, i: usize) -> Option<&mut Bed> {
        self.0.get_mut(i).map(Arc::make_mut)
    }

    pub fn first(&self) -> Option<&Bed> {
        self.get(0)
    }

    pub fn last(&self) -> Option<&Bed> {
        self.0.last().map(|b| &**b)
    }

    pub fn last_mut(&mut self) -> Option<&mut Bed> {
        self.0.last_mut().map(Arc::make_mut)
    }

    pub fn push(&mut self, bed: Bed) {
        self.0.push(Arc::new(bed));
    }

    pub fn insert(&mut self, i: usize, bed: Bed) {
        self.0.insert(i, Arc::new(bed));
    }

    /// Take out the bed at `i` (a copy if it is still shared).
    pub fn remove(&mut self, i: usize) -> Bed {
        Arc::unwrap_or_clone(self.0.remove(i))
    }

    pub fn truncate(&mut self, n: usize) {
        self.0.truncate(n);
    }

    pub fn clear(&mut self) {
        self.0.clear();
    }

    pub fn swap(&mut self, a: usize, b: usize) {
        self.0.swap(a, b);
    }

    pub fn reverse(&mut self) {
        self.0.reverse();
    }

    /// Keep the beds for which `keep` holds.
    pub fn retain(&mut self, mut keep: impl FnMut(&Bed) -> bool) {
        self.0.retain(|b| keep(b));
    }

    /// Take out the beds with indices in `range`.
    pub fn drain(&mut self, range: Range<usize>) -> Vec<Bed> {
        self.0.drain(range).map(Arc::unwrap_or_clone).collect()
    }

    /// Put `beds` in place of the beds with indices in `range`.
    pub fn splice(&mut self, range: Range<usize>, beds: impl IntoIterator<Item = Bed>) {
        self.0.splice(range, beds.into_iter().map(Arc::new));
    }

    /// The beds as a list of references (for rules that slice runs of beds).
    pub fn refs(&self) -> Vec<&Bed> {
        self.iter().collect()
    }

    /// A copy of every bed.
    pub fn to_vec(&self) -> Vec<Bed> {
        self.iter().cloned().collect()
    }

    /// Whether bed `i` here and bed `j` of `other` are one shared bed (so neither was changed
    /// since one was copied from the other).
    pub fn shares(&self, i: usize, other: &Beds, j: usize) -> bool {
        match (self.0.get(i), other.0.get(j)) {
            (Some(a), Some(b)) => Arc::ptr_eq(a, b),
            _ => false,
        }
    }

    /// The indices of the beds here that are not shared with `before`, found from both ends: an
    /// edit changes, inserts or removes one run of beds, so this is that run (empty when nothing
    /// changed). The run in `before` that it replaced is
    /// `start..before.len() - (self.len() - end)`.
    pub fn changed_since(&self, before: &Beds) -> Range<usize> {
        let shared_from_base = self.0.iter().zip(&before.0).take_while(|(a, b)| Arc::ptr_eq(a, b)).count();
        let room = self.len().min(before.len()) - shared_from_base;
        let shared_from_top = self
            .0
            .iter()
            .rev()
            .zip(before.0.iter().rev())
            .take(room)
            .take_while(|(a, b)| Arc::ptr_eq(a, b))
            .count();
        shared_from_base..self.len() - shared_from_top
    }
}

impl PartialEq for Beds {
    fn eq(&self, other: &Self) -> bool {
        self.len() == other.len() && self.0.iter().zip(&other.0).all(|(a, b)| Arc::ptr_eq(a, b) || a == b)
    }
}

impl PartialEq<Vec<Bed>> for Beds {
    fn eq(&self, other: &Vec<Bed>) -> bool {
        self.len() == other.len() && self.iter().zip(other).all(|(a, b)| a == b)
    }
}

impl std::fmt::Debug for Beds {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_list().entries(self.iter()).finish()
    }
}

impl Index<usize> for Beds {
    type Output = Bed;
    fn index(&self, i: usize) -> &Bed {
        &self.0[i]
    }
}

impl IndexMut<usize> for Beds {
    fn index_mut(&mut self, i: usize) -> &mut Bed {
        Arc::make_mut(&mut self.0[i])
    }
}

impl From<Vec<Bed>> for Beds {
    fn from(beds: Vec<Bed>) -> Self {
        Beds(beds.into_iter().map(Arc::new).collect())
    }
}

impl<const N: usize> From<[Bed; N]> for Beds {
    fn from(beds: [Bed; N]) -> Self {
        Beds(beds.into_iter().map(Arc::new).collect())
    }
}

impl FromIterator<Bed> for Beds {
    fn from_iter<I: IntoIterator<Item = Bed>>(iter: I) -> Self {
        Beds(iter.into_iter().map(Arc::new).collect())
    }
}

impl Extend<Bed> for Beds {
    fn extend<I: IntoIterator<Item = Bed>>(&mut self, iter: I) {
        self.0.extend(iter.into_iter().map(Arc::new));
    }
}

impl<'a> IntoIterator for &'a Beds {
    type Item = &'a Bed;
    type IntoIter = Iter<'a>;
    fn into_iter(self) -> Iter<'a> {
        self.iter()
    }
}

impl<'a> IntoIterator for &'a mut Beds {
    type Item = &'a mut Bed;
    type IntoIter = std::iter::Map<std::slice::IterMut<'a, Arc<Bed>>, fn(&'a mut Arc<Bed>) -> &'a mut Bed>;
    fn into_iter(self) -> Self::IntoIter {
        self.0.iter_mut().map(Arc::make_mut as fn(&'a mut Arc<Bed>) -> &'a mut Bed)
    }
}

impl IntoIterator for Beds {
    type Item = Bed;
    type IntoIter = std::iter::Map<std::vec::IntoIter<Arc<Bed>>, fn(Arc<Bed>) -> Bed>;
    fn into_iter(self) -> Self::IntoIter {
        self.0.into_iter().map(Arc::unwrap_or_clone as fn(Arc<Bed>) -> Bed)
    }
}

impl Serialize for Beds {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_seq(self.iter())
    }
}

impl<'de> Deserialize<'de> for Beds {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        Vec::<Bed>::deserialize(deserializer).map(Beds::from)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{BedId, Lithology};

    fn beds(n: u64) -> Beds {
        (1..=n).map(|i| Bed::new(BedId(i), 1.0, Lithology::Mudstone, None)).collect()
    }

    #[test]
    fn a_copy_shares_every_bed_until_one_is_written() {
        let a = beds(5);
        let mut b = a.clone();
        assert!((0..5).all(|i| b.shares(i, &a, i)));
        b[2].thickness_m = 2.0;
        assert!(!b.shares(2, &a, 2), "the written bed is a copy");
        assert!((0..5).filter(|&i| i != 2).all(|i| b.shares(i, &a, i)), "the others stay shared");
        assert_eq!(a[2].thickness_m, 1.0, "the original is unchanged");
        assert_eq!(b[2].thickness_m, 2.0);
    }

    #[test]
    fn the_changed_run_is_found_from_both_ends() {
        let a = beds(6);
        assert!(a.clone().changed_since(&a).is_empty(), "nothing changed");
        let mut one = a.clone();
        one[3].notes = "x".into();
        assert_eq!(one.changed_since(&a), 3..4);
        let mut inserted = a.clone();
        inserted.insert(2, Bed::new(BedId(9), 1.0, Lithology::Mudstone, None));
        assert_eq!(inserted.changed_since(&a), 2..3);
        let mut removed = a.clone();
        removed.remove(4);
        assert_eq!(removed.changed_since(&a), 4..4, "nothing of the new list is unshared");
        let mut top = a.clone();
        top.push(Bed::new(BedId(9), 1.0, Lithology::Mudstone, None));
        assert_eq!(top.changed_since(&a), 6..7);
        assert_eq!(beds(3).changed_since(&a), 0..3, "unrelated lists share nothing");
        let mut split = a.clone();
        split[1].thickness_m = 0.5;
        split.insert(2, Bed::new(BedId(9), 0.5, Lithology::Mudstone, None));
        assert_eq!(split.changed_since(&a), 1..3);
    }

    #[test]
    fn equality_and_serde_read_the_beds_not_the_pointers() {
        let a = beds(3);
        let b = beds(3);
        assert_eq!(a, b);
        assert_eq!(a, a.to_vec());
        let json = serde_json::to_string(&a).expect("written");
        let back: Beds = serde_json::from_str(&json).expect("read");
        assert_eq!(back, a);
        assert_eq!(json, serde_json::to_string(&a.to_vec()).expect("written"), "written as a plain list");
    }
}
