//! Helpers shared by several reference checks: LAS files compared with lasio, small
//! workbooks written by the tests themselves, Python reference computations.

pub mod lasio_compare;
pub mod oracle;
pub mod sheets;
