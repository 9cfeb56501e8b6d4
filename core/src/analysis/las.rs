//! LAS 2.0 well-log reader.
