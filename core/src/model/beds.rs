//! A list whose items sit behind shared pointers, used for the beds of a section: a copy of a
//! section (an undo step, the copy a background worker reads) shares every bed it did not
//! change, so an edit of one bed in a section of 50,000 costs one bed, not 50,000.

use serde::{Deserialize, Deserializer, Serialize, Serializer};
use std::ops::{Index, IndexMut, Range, RangeBounds};
use std::sync::Arc;

/// A list, in order, of items behind shared pointers (the beds of a section are one, base
/// first). Reads like a list (`list[i]`, `list.iter()`, `list.len()`); writing an
/// item (`list[i].field = …`, `iter_mut`) copies that item first if another copy of the list
/// still shares it.
#[derive(Clone)]
pub struct SharedList<T>(Vec<Arc<T>>);

/// Iterator over the items, in order.
pub type Iter<'a, T> = std::iter::Map<std::slice::Iter<'a, Arc<T>>, fn(&'a Arc<T>) -> &'a T>;

fn deref_item<T>(b: &Arc<T>) -> &T {
    b
}

impl<T> Default for SharedList<T> {
    fn default() -> Self {
        SharedList(Vec::new())
    }
}

impl<T: Clone> SharedList<T> {
    /// No beds.
    pub fn new() -> Self {
        SharedList(Vec::new())
    }

    /// No beds, with room for `n`.
    pub fn with_capacity(n: usize) -> Self {
        SharedList(Vec::with_capacity(n))
    }

    pub fn len(&self) -> usize {
        self.0.len()
    }

    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }

    /// The beds, base first.
    pub fn iter(&self) -> Iter<'_, T> {
        self.0.iter().map(deref_item::<T> as fn(&Arc<T>) -> &T)
    }

    /// The beds with indices in `range` (`a..b`, `a..=b`, `a..`), base first.
    pub fn range(&self, range: impl RangeBounds<usize>) -> Iter<'_, T> {
        let bounds = (range.start_bound().cloned(), range.end_bound().cloned());
        self.0[bounds].iter().map(deref_item::<T> as fn(&Arc<T>) -> &T)
    }

    /// Every bed, writable (each shared bed is copied first).
    pub fn iter_mut(&mut self) -> impl DoubleEndedIterator<Item = &mut T> + ExactSizeIterator {
        self.0.iter_mut().map(Arc::make_mut)
    }

    pub fn get(&self, i: usize) -> Option<&T> {
        self.0.get(i).map(|b| &**b)
    }

    pub fn get_mut(&mut self, i: usize) -> Option<&mut T> {
        self.0.get_mut(i).map(Arc::make_mut)
    }

    pub fn first(&self) -> Option<&T> {
        self.get(0)
    }

    pub fn last(&self) -> Option<&T> {
        self.0.last().map(|b| &**b)
    }

    pub fn last_mut(&mut self) -> Option<&mut T> {
        self.0.last_mut().map(Arc::make_mut)
    }

    pub fn push(&mut self, bed: T) {
        self.0.push(Arc::new(bed));
    }

    pub fn insert(&mut self, i: usize, bed: T) {
        self.0.insert(i, Arc::new(bed));
    }

    /// Take out the bed at `i` (a copy if it is still shared).
    pub fn remove(&mut self, i: usize) -> T {
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
    pub fn retain(&mut self, mut keep: impl FnMut(&T) -> bool) {
        self.0.retain(|b| keep(b));
    }

    /// Take out the beds with indices in `range`.
    pub fn drain(&mut self, range: Range<usize>) -> Vec<T> {
        self.0.drain(range).map(Arc::unwrap_or_clone).collect()
    }

    /// Put `beds` in place of the beds with indices in `range`.
    pub fn splice(&mut self, range: Range<usize>, beds: impl IntoIterator<Item = T>) {
        self.0.splice(range, beds.into_iter().map(Arc::new));
    }

    /// The beds as a list of references (for rules that slice runs of beds).
    pub fn refs(&self) -> Vec<&T> {
        self.iter().collect()
    }

    /// A copy of every bed.
    pub fn to_vec(&self) -> Vec<T> {
        self.iter().cloned().collect()
    }

    /// Whether bed `i` here and bed `j` of `other` are one shared bed (so neither was changed
    /// since one was copied from the other).
    pub fn shares(&self, i: usize, other: &SharedList<T>, j: usize) -> bool {
        match (self.0.get(i), other.0.get(j)) {
            (Some(a), Some(b)) => Arc::ptr_eq(a, b),
            _ => false,
        }
    }

    /// The indices of the beds here that are not shared with `before`, found from both ends: an
    /// edit changes, inserts or removes one run of beds, so this is that run (empty when nothing
    /// changed). The run in `before` that it replaced is
    /// `start..before.len() - (self.len() - end)`.
    pub fn changed_since(&self, before: &SharedList<T>) -> Range<usize> {
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

impl<T: PartialEq> PartialEq for SharedList<T> {
    fn eq(&self, other: &Self) -> bool {
        self.0.len() == other.0.len() && self.0.iter().zip(&other.0).all(|(a, b)| Arc::ptr_eq(a, b) || a == b)
    }
}

impl<T: PartialEq> PartialEq<Vec<T>> for SharedList<T> {
    fn eq(&self, other: &Vec<T>) -> bool {
        self.0.len() == other.len() && self.0.iter().zip(other).all(|(a, b)| **a == *b)
    }
}

impl<T: std::fmt::Debug> std::fmt::Debug for SharedList<T> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_list().entries(self.0.iter().map(|b| &**b)).finish()
    }
}

impl<T> Index<usize> for SharedList<T> {
    type Output = T;
    fn index(&self, i: usize) -> &T {
        &self.0[i]
    }
}

impl<T: Clone> IndexMut<usize> for SharedList<T> {
    fn index_mut(&mut self, i: usize) -> &mut T {
        Arc::make_mut(&mut self.0[i])
    }
}

impl<T> From<Vec<T>> for SharedList<T> {
    fn from(beds: Vec<T>) -> Self {
        SharedList(beds.into_iter().map(Arc::new).collect())
    }
}

impl<T, const N: usize> From<[T; N]> for SharedList<T> {
    fn from(beds: [T; N]) -> Self {
        SharedList(beds.into_iter().map(Arc::new).collect())
    }
}

impl<T> FromIterator<T> for SharedList<T> {
    fn from_iter<I: IntoIterator<Item = T>>(iter: I) -> Self {
        SharedList(iter.into_iter().map(Arc::new).collect())
    }
}

impl<T> Extend<T> for SharedList<T> {
    fn extend<I: IntoIterator<Item = T>>(&mut self, iter: I) {
        self.0.extend(iter.into_iter().map(Arc::new));
    }
}

impl<'a, T: Clone> IntoIterator for &'a SharedList<T> {
    type Item = &'a T;
    type IntoIter = Iter<'a, T>;
    fn into_iter(self) -> Iter<'a, T> {
        self.iter()
    }
}

impl<'a, T: Clone> IntoIterator for &'a mut SharedList<T> {
    type Item = &'a mut T;
    type IntoIter = std::iter::Map<std::slice::IterMut<'a, Arc<T>>, fn(&'a mut Arc<T>) -> &'a mut T>;
    fn into_iter(self) -> Self::IntoIter {
        self.0.iter_mut().map(Arc::make_mut as fn(&'a mut Arc<T>) -> &'a mut T)
    }
}

impl<T: Clone> IntoIterator for SharedList<T> {
    type Item = T;
    type IntoIter = std::iter::Map<std::vec::IntoIter<Arc<T>>, fn(Arc<T>) -> T>;
    fn into_iter(self) -> Self::IntoIter {
        self.0.into_iter().map(Arc::unwrap_or_clone as fn(Arc<T>) -> T)
    }
}

impl<T: Serialize> Serialize for SharedList<T> {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_seq(self.0.iter().map(|b| &**b))
    }
}

impl<'de, T: Deserialize<'de>> Deserialize<'de> for SharedList<T> {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        Vec::<T>::deserialize(deserializer).map(SharedList::from)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A stand-in for a bed: an id and a thickness.
    #[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
    struct Layer {
        id: u64,
        thickness_m: f64,
        notes: String,
    }

    fn layer(id: u64, thickness_m: f64) -> Layer {
        Layer { id, thickness_m, notes: String::new() }
    }

    fn beds(n: u64) -> SharedList<Layer> {
        (1..=n).map(|i| layer(i, 1.0)).collect()
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
        inserted.insert(2, layer(9, 1.0));
        assert_eq!(inserted.changed_since(&a), 2..3);
        let mut removed = a.clone();
        removed.remove(4);
        assert_eq!(removed.changed_since(&a), 4..4, "nothing of the new list is unshared");
        let mut top = a.clone();
        top.push(layer(9, 1.0));
        assert_eq!(top.changed_since(&a), 6..7);
        assert_eq!(beds(3).changed_since(&a), 0..3, "unrelated lists share nothing");
        let mut split = a.clone();
        split[1].thickness_m = 0.5;
        split.insert(2, layer(9, 0.5));
        assert_eq!(split.changed_since(&a), 1..3);
    }

    #[test]
    fn equality_and_serde_read_the_beds_not_the_pointers() {
        let a = beds(3);
        let b = beds(3);
        assert_eq!(a, b);
        assert_eq!(a, a.to_vec());
        let json = serde_json::to_string(&a).expect("written");
        let back: SharedList<Layer> = serde_json::from_str(&json).expect("read");
        assert_eq!(back, a);
        assert_eq!(json, serde_json::to_string(&a.to_vec()).expect("written"), "written as a plain list");
    }
}
