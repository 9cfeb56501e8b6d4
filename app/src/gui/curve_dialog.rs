//! The "Attach measured curve" window: after a LAS 2.0 file is picked, choose the curve, how its
//! index runs and the offset that puts it on the section's heights, with a preview of the fit.

use aggrade_core::analysis::las::{read_las, IndexDirection, IndexToSection, LasError, LasFile};
use aggrade_core::model::{MeasuredCurve, Section};
use std::path::{Path, PathBuf};

/// What happened in the window this frame.
pub enum Outcome {
    Open,
    Closed,
    /// Attach this curve (the window has closed).
    Attach(MeasuredCurve),
}

/// Window state for one picked LAS file.
#[derive(Debug)]
pub struct CurveDialog {
    path: PathBuf,
    las: LasFile,
    /// Mnemonic of the chosen curve.
    pub mnemonic: String,
    /// Offset as typed (metres): the LAS index value at the section's base.
    pub offset_text: String,
    /// The index is depth increasing downward.
    pub depth_down: bool,
}

/// Why a LAS file gives no curve to attach, or a curve cannot be placed as set.
#[derive(Debug, thiserror::Error)]
pub enum CurveError {
    /// The reader's own message (file and line).
    #[error(transparent)]
    Las(#[from] LasError),
    /// The file holds only its depth index.
    #[error("{}: the file has no curve besides its depth index", .0.display())]
    NoCurve(PathBuf),
    /// The offset typed does not read (the message names the field).
    #[error("{0}")]
    Offset(String),
}

impl CurveDialog {
    /// Read the LAS file; the error is the reader's own message (file and line), ready for a dialog.
    pub fn open(path: &Path) -> Result<Self, CurveError> {
        let las = read_las(path)?;
        let Some(first) = las.curve_mnemonics().first().map(|m| m.to_string()) else {
            return Err(CurveError::NoCurve(path.to_path_buf()));
        };
        Ok(CurveDialog {
            path: path.to_path_buf(),
            las,
            mnemonic: first,
            offset_text: "0".into(),
            depth_down: false,
        })
    }

    /// The offset as typed, read whole.
    fn offset_m(&self) -> Result<f64, CurveError> {
        self.offset_text.trim().parse::<f64>().ok().filter(|v| v.is_finite()).ok_or_else(|| {
            CurveError::Offset(format!(
                "Offset (m): {:?} is not a number of metres (e.g. 0, 12.5, -3)",
                self.offset_text
            ))
        })
    }

    /// The curve as it would be attached, or why not.
    pub fn curve(&self) -> Result<MeasuredCurve, CurveError> {
        let zero_m = self.offset_m()?;
        let direction =
            if self.depth_down { IndexDirection::DepthBelowDatum } else { IndexDirection::HeightAboveDatum };
        self.las
            .measured_curve(
                &self.mnemonic,
                &IndexToSection { direction, zero_m },
                &self.path.display().to_string(),
            )
            .map_err(CurveError::from)
    }

    /// Draw the window.
    pub fn ui(&mut self, ctx: &egui::Context, section: &Section) -> Outcome {
        let mut outcome = Outcome::Open;
        let mut open = true;
        let top_m = section.total_thickness_m();
        egui::Window::new("Attach measured curve").open(&mut open).collapsible(false).resizable(false).show(
            ctx,
            |ui| {
                let name =
                    self.path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
                ui.label(format!("From {name}, to section {:?} (0–{top_m:.2} m)", section.name));
                for w in &self.las.warnings {
                    ui.label(egui::RichText::new(w).small().color(super::theme::WARN));
                }
                egui::Grid::new("curve_fields").num_columns(2).spacing([10.0, 6.0]).show(ui, |ui| {
                    let label = ui.label("Curve");
                    let items: Vec<(String, String)> = self
                        .las
                        .curve_items
                        .iter()
                        .skip(1)
                        .map(|i| {
                            let unit =
                                if i.unit.is_empty() { String::new() } else { format!(" ({})", i.unit) };
                            (i.mnemonic.clone(), format!("{}{unit} {}", i.mnemonic, i.description))
                        })
                        .collect();
                    egui::ComboBox::from_id_salt("curve_mnemonic")
                        .selected_text(self.mnemonic.clone())
                        .show_ui(ui, |ui| {
                            for (m, text) in items {
                                ui.selectable_value(&mut self.mnemonic, m, text);
                            }
                        })
                        .response
                        .labelled_by(label.id);
                    ui.end_row();
                    ui.label("Index runs");
                    ui.horizontal(|ui| {
                        if ui
                            .radio(!self.depth_down, "up (height)")
                            .on_hover_text("height = index − offset")
                            .clicked()
                        {
                            self.depth_down = false;
                        }
                        if ui
                            .radio(self.depth_down, "down (depth)")
                            .on_hover_text("height = offset − depth; depth 0 at the section top by default")
                            .clicked()
                            && !self.depth_down
                        {
                            self.depth_down = true;
                            if self.offset_text.trim() == "0" {
                                self.offset_text = format!("{top_m}");
                            }
                        }
                    });
                    ui.end_row();
                    let lab = ui.label("Offset (m)").id;
                    let r = ui
                        .add(egui::TextEdit::singleline(&mut self.offset_text).char_limit(64))
                        .labelled_by(lab)
                        .on_hover_text("The LAS index value that lies at the section's base");
                    // Read whole when Attach is pressed; until then a text that is no number is
                    // kept as typed, framed, and its problem shown below (Attach is disabled).
                    if self.offset_m().is_err() {
                        super::field::mark_invalid(ui, r.rect);
                    }
                    ui.end_row();
                });
                let preview = self.curve();
                match &preview {
                    Ok(c) => {
                        let (lo, hi) = c.height_range_m().unwrap_or((0.0, 0.0));
                        let inside = c.samples.iter().filter(|(h, _)| *h >= 0.0 && *h <= top_m).count();
                        ui.label(format!(
                            "{} samples at heights {lo:.2}–{hi:.2} m; {inside} within the section",
                            c.samples.len()
                        ));
                        if inside == 0 {
                            ui.label(
                                egui::RichText::new(
                                    "No sample lies within the section: check the offset and direction.",
                                )
                                .color(super::theme::WARN),
                            );
                        }
                    }
                    Err(e) => {
                        ui.label(egui::RichText::new(e.to_string()).color(super::theme::WARN));
                    }
                }
                ui.horizontal(|ui| {
                    if ui
                        .add_enabled(preview.is_ok(), egui::Button::new("Attach"))
                        .on_hover_text("Keep this curve with the section and draw it beside the column")
                        .clicked()
                    {
                        if let Ok(c) = preview {
                            outcome = Outcome::Attach(c);
                        }
                    }
                    if ui.button("Cancel").on_hover_text("Close without attaching").clicked() {
                        outcome = Outcome::Closed;
                    }
                });
            },
        );
        if !open {
            return Outcome::Closed;
        }
        outcome
    }
}
