//! Holder crate for the cross-crate and reference-check tests in `tests/tests/`.
