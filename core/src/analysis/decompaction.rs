//! Decompaction.
