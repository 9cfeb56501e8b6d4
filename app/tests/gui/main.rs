//! The window's tests, in one binary (each links egui and wgpu once): the real window driven
//! headlessly with egui_kittest, the document model, backups and recovery.

mod harness;

mod background;
mod base_rank;
mod body_widths;
mod column_help;
mod curves;
mod document_model;
mod editing;
mod field_record;
mod fields;
mod import;
mod keyboard_log;
mod record_tables;
mod recovery;
mod rules;
mod section_details;
mod section_setting;
mod trace;
mod views;
