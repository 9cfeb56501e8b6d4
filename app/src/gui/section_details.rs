//! The Section details dialog: every descriptive field of a section in one window (name,
//! locality, who logged it and when, coordinates, display unit, place on the correlation panel,
//! notes). Nothing is stored while typing; Apply reads every field as a whole, and a field that
//! does not read stays as typed, framed in red with its message, while nothing is stored. The
//! changes applied together are one undo step. The reading rules are pure functions, tested here.

use super::document::Edit;
use super::field::{mark_invalid, INVALID};
use super::theme;
use aggrade_core::io::limits::{MAX_PANEL_POSITION_M, MAX_STRING_CHARS};
use aggrade_core::model::{LatLon, LengthUnit, Section};

/// The fields of the dialog, in the order Tab visits them.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Field {
    Name,
    Locality,
    LoggedBy,
    DateLogged,
    Latitude,
    Longitude,
    PanelPosition,
    Notes,
}

impl Field {
    /// Every field with a text, in order.
    pub const ALL: [Field; 8] = [
        Field::Name,
        Field::Locality,
        Field::LoggedBy,
        Field::DateLogged,
        Field::Latitude,
        Field::Longitude,
        Field::PanelPosition,
        Field::Notes,
    ];

    /// The label beside the field (also its name for screen readers and tests).
    pub fn label(self) -> &'static str {
        match self {
            Field::Name => "Section name",
            Field::Locality => "Locality",
            Field::LoggedBy => "Logged by",
            Field::DateLogged => "Date logged",
            Field::Latitude => "Latitude (°)",
            Field::Longitude => "Longitude (°)",
            Field::PanelPosition => "Panel position",
            Field::Notes => "Section notes",
        }
    }

    fn hint(self) -> &'static str {
        match self {
            Field::Name => "e.g. Corrie Wash",
            Field::Locality => "where it was measured",
            Field::LoggedBy => "who measured it",
            Field::DateLogged => "YYYY-MM-DD",
            Field::Latitude => "e.g. -24.6132 or 24.6132 S",
            Field::Longitude => "e.g. 133.7208 or 133.7208 E",
            Field::PanelPosition => "distance along the line",
            Field::Notes => "notes on the section",
        }
    }

    fn tip(self) -> &'static str {
        match self {
            Field::Name => "The section's name: unique in the project",
            Field::Locality => "Where the section was measured",
            Field::LoggedBy => "Who measured the section",
            Field::DateLogged => "The day the section was logged, as YYYY-MM-DD (ISO 8601); empty if unknown",
            Field::Latitude => {
                "WGS84 latitude of the section base in decimal degrees, -90 to 90 (south negative, or end with S)"
            }
            Field::Longitude => {
                "WGS84 longitude of the section base in decimal degrees, -180 to 180 (west negative, or end with W)"
            }
            Field::PanelPosition => {
                "Distance of the section along the correlation line, in the display unit; empty to place it by its order"
            }
            Field::Notes => "Notes on the section",
        }
    }

    fn index(self) -> usize {
        Field::ALL.iter().position(|f| *f == self).unwrap_or(0)
    }
}

/// The values a section's details read to, ready to store.
#[derive(Debug, Clone, PartialEq)]
pub struct Details {
    pub name: String,
    pub locality: String,
    pub logged_by: String,
    pub date_logged: Option<String>,
    pub coordinates: Option<LatLon>,
    pub display_unit: LengthUnit,
    pub panel_position_m: Option<f64>,
    pub notes: String,
}

impl Details {
    /// The details a section holds now.
    pub fn of(s: &Section) -> Self {
        Details {
            name: s.name.clone(),
            locality: s.locality.clone(),
            logged_by: s.logged_by.clone(),
            date_logged: s.date_logged.clone(),
            coordinates: s.coordinates,
            display_unit: s.display_unit,
            panel_position_m: s.panel_position_m,
            notes: s.notes.clone(),
        }
    }

    /// The edits that turn `before` into these details (none when nothing changed); applied in
    /// one gesture they are one undo step.
    pub fn edits_from(&self, before: &Details) -> Vec<Edit> {
        let mut out = Vec::new();
        if (&self.name, &self.locality, &self.logged_by, &self.notes)
            != (&before.name, &before.locality, &before.logged_by, &before.notes)
        {
            out.push(Edit::SetSectionInfo {
                name: self.name.clone(),
                locality: self.locality.clone(),
                logged_by: self.logged_by.clone(),
                notes: self.notes.clone(),
            });
        }
        if (&self.date_logged, self.coordinates, self.panel_position_m)
            != (&before.date_logged, before.coordinates, before.panel_position_m)
        {
            out.push(Edit::SetSectionPlace {
                coordinates: self.coordinates,
                date_logged: self.date_logged.clone(),
                panel_position_m: self.panel_position_m,
            });
        }
        if self.display_unit != before.display_unit {
            out.push(Edit::SetDisplayUnit { unit: self.display_unit });
        }
        out
    }
}

/// A number as a person types it: a decimal point or a single decimal comma.
fn number(text: &str) -> Option<f64> {
    let t = text.trim();
    let t = if !t.contains('.') && t.matches(',').count() == 1 { t.replace(',', ".") } else { t.to_string() };
    t.parse::<f64>().ok().filter(|v| v.is_finite())
}

/// A number written without needless digits (what the field shows for a stored value).
fn plain(v: f64, decimals: usize) -> String {
    let s = format!("{v:.decimals$}");
    let s = if s.contains('.') { s.trim_end_matches('0').trim_end_matches('.').to_string() } else { s };
    if s == "-0" {
        "0".into()
    } else {
        s
    }
}

/// Read a section name: not blank, within the length limit, not another section's name.
pub fn read_name(text: &str, other_names: &[&str]) -> Result<String, String> {
    let name = text.trim();
    if name.is_empty() {
        return Err("a section needs a name".into());
    }
    if name.chars().count() > MAX_STRING_CHARS {
        return Err(format!("at most {MAX_STRING_CHARS} characters"));
    }
    if other_names.contains(&name) {
        return Err(format!("another section of this project is already named {name:?}"));
    }
    Ok(name.to_string())
}

/// Read the date logged: empty for unknown, else a real calendar day written YYYY-MM-DD.
pub fn read_date(text: &str) -> Result<Option<String>, String> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(None);
    }
    aggrade_core::io::check_iso_date(t)
        .map(|()| Some(t.to_string()))
        .map_err(|why| format!("{why}, got {t:?} (e.g. 2026-07-14)"))
}

/// Read one coordinate in decimal degrees within ±`limit`; a hemisphere letter (`pos` or `neg`,
/// before or after the number) may stand for the sign, and a degree sign is allowed. Empty is
/// `None`.
fn read_degrees(text: &str, what: &str, limit: f64, pos: char, neg: char) -> Result<Option<f64>, String> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(None);
    }
    let mut body = t.replace('°', " ");
    let mut sign = 1.0;
    let upper = body.trim().to_ascii_uppercase();
    for (letter, s) in [(pos, 1.0), (neg, -1.0)] {
        if let Some(rest) = upper.strip_suffix(letter).or_else(|| upper.strip_prefix(letter)) {
            body = rest.to_string();
            sign = s;
            break;
        }
    }
    let v = number(&body).ok_or_else(|| {
        format!("{t:?} is not a {what} in decimal degrees; write e.g. -24.6132 or 24.6132 {neg}")
    })?;
    if sign < 0.0 && v < 0.0 {
        return Err(format!("{t:?} has both a minus sign and {neg}; write one of them"));
    }
    let v = sign * v;
    if v.abs() > limit {
        return Err(format!("a {what} must lie between -{limit} and {limit} degrees, got {}", plain(v, 6)));
    }
    Ok(Some(v))
}

/// Read latitude and longitude: both empty is no coordinates; one alone is refused (the field
/// left empty gets the message).
pub fn read_coordinates(lat: &str, lon: &str) -> Result<Option<LatLon>, (Field, String)> {
    let lat_v = read_degrees(lat, "latitude", 90.0, 'N', 'S').map_err(|e| (Field::Latitude, e))?;
    let lon_v = read_degrees(lon, "longitude", 180.0, 'E', 'W').map_err(|e| (Field::Longitude, e))?;
    match (lat_v, lon_v) {
        (Some(lat_deg), Some(lon_deg)) => Ok(Some(LatLon { lat_deg, lon_deg })),
        (None, None) => Ok(None),
        (Some(_), None) => Err((Field::Longitude, "give the longitude too, or clear the latitude".into())),
        (None, Some(_)) => Err((Field::Latitude, "give the latitude too, or clear the longitude".into())),
    }
}

/// Read the panel position typed in `unit`, returned in metres; empty is `None`.
pub fn read_panel_position(text: &str, unit: LengthUnit) -> Result<Option<f64>, String> {
    let t = text.trim();
    let sym = unit.name();
    if t.is_empty() {
        return Ok(None);
    }
    let t = t.strip_suffix(sym).unwrap_or(t);
    let v = number(t)
        .ok_or_else(|| format!("{:?} is not a distance; write a number of {sym}, e.g. 1250", text.trim()))?;
    let m = unit.to_metres(v);
    if m.abs() > MAX_PANEL_POSITION_M {
        let most = plain(unit.from_metres(MAX_PANEL_POSITION_M), 2);
        return Err(format!("a panel position must lie within ±{most} {sym}, got {} {sym}", plain(v, 3)));
    }
    Ok(Some(m))
}

/// What the dialog asks the window to do after a frame.
#[derive(Debug, Clone, PartialEq)]
pub enum Outcome {
    Open,
    /// Cancelled (or applied with nothing changed).
    Closed,
    /// Apply these edits to section `section` as one undo step; on success the dialog closes,
    /// on refusal [`SectionDetails::refused`] shows why and it stays open.
    Apply {
        section: usize,
        edits: Vec<Edit>,
    },
}

/// The dialog's state: the texts as typed, the unit chosen, and the problems found at Apply.
#[derive(Debug, Clone)]
pub struct SectionDetails {
    /// The section (index in the project) the dialog was opened on.
    pub section: usize,
    before: Details,
    texts: [String; 8],
    unit: LengthUnit,
    problems: [Option<String>; 8],
    /// Why the document refused the edits, or why the dialog cannot close yet.
    note: Option<String>,
    focus: Option<Field>,
}

impl SectionDetails {
    /// The dialog on section `index` of the project, filled from what it holds.
    pub fn open(section: &Section, index: usize) -> Self {
        let before = Details::of(section);
        let unit = before.display_unit;
        let (lat, lon) = match before.coordinates {
            Some(c) => (plain(c.lat_deg, 6), plain(c.lon_deg, 6)),
            None => (String::new(), String::new()),
        };
        let texts = [
            before.name.clone(),
            before.locality.clone(),
            before.logged_by.clone(),
            before.date_logged.clone().unwrap_or_default(),
            lat,
            lon,
            before.panel_position_m.map(|m| plain(unit.from_metres(m), 3)).unwrap_or_default(),
            before.notes.clone(),
        ];
        SectionDetails {
            section: index,
            before,
            texts,
            unit,
            problems: Default::default(),
            note: None,
            focus: Some(Field::Name),
        }
    }

    /// The text typed in a field.
    pub fn text(&self, f: Field) -> &str {
        &self.texts[f.index()]
    }

    /// Type into a field (what the window's text box does).
    #[cfg(test)]
    pub fn set_text(&mut self, f: Field, text: impl Into<String>) {
        self.texts[f.index()] = text.into();
    }

    /// Choose the display unit; a panel position that reads is converted, so that it stays the
    /// same distance.
    pub fn set_unit(&mut self, unit: LengthUnit) {
        let i = Field::PanelPosition.index();
        if let Ok(Some(m)) = read_panel_position(&self.texts[i], self.unit) {
            self.texts[i] = plain(unit.from_metres(m), 3);
        }
        self.unit = unit;
    }

    /// The problem marked on a field (after Apply).
    #[cfg(test)]
    pub fn problem(&self, f: Field) -> Option<&str> {
        self.problems[f.index()].as_deref()
    }

    /// Has anything been typed or chosen that differs from the section as opened?
    pub fn is_changed(&self) -> bool {
        let fresh = SectionDetails::open_from(&self.before, self.section);
        fresh.texts != self.texts || fresh.unit != self.unit
    }

    fn open_from(before: &Details, index: usize) -> Self {
        let mut s = Section::new(before.name.clone());
        s.locality = before.locality.clone();
        s.logged_by = before.logged_by.clone();
        s.date_logged = before.date_logged.clone();
        s.coordinates = before.coordinates;
        s.display_unit = before.display_unit;
        s.panel_position_m = before.panel_position_m;
        s.notes = before.notes.clone();
        SectionDetails::open(&s, index)
    }

    /// The typed texts that differ from the section, one line each ("Latitude (°) \"south\""),
    /// for the window's backup and the question asked before closing.
    pub fn unstored_lines(&self) -> Vec<String> {
        let fresh = SectionDetails::open_from(&self.before, self.section);
        let mut out: Vec<String> = Field::ALL
            .iter()
            .filter(|f| fresh.texts[f.index()] != self.texts[f.index()])
            .map(|f| format!("Section details of {}: {} {:?}", self.before.name, f.label(), self.text(*f)))
            .collect();
        if fresh.unit != self.unit {
            out.push(format!("Section details of {}: display unit {}", self.before.name, self.unit.name()));
        }
        out
    }

    /// Read every field. All read: the details; otherwise each field that does not read is
    /// marked with its problem and nothing is returned.
    pub fn read(&mut self, other_names: &[&str]) -> Option<Details> {
        self.problems = Default::default();
        self.note = None;
        let t = |f: Field| self.texts[f.index()].as_str();
        let mut problems: Vec<(Field, String)> = Vec::new();
        let name = read_name(t(Field::Name), other_names).map_err(|e| problems.push((Field::Name, e))).ok();
        let date = read_date(t(Field::DateLogged)).map_err(|e| problems.push((Field::DateLogged, e))).ok();
        let coordinates =
            read_coordinates(t(Field::Latitude), t(Field::Longitude)).map_err(|e| problems.push(e)).ok();
        let panel = read_panel_position(t(Field::PanelPosition), self.unit)
            .map_err(|e| problems.push((Field::PanelPosition, e)))
            .ok();
        for f in [Field::Locality, Field::LoggedBy, Field::Notes] {
            if t(f).chars().count() > MAX_STRING_CHARS {
                problems.push((f, format!("at most {MAX_STRING_CHARS} characters")));
            }
        }
        let first = problems.first().map(|(f, _)| *f);
        for (f, why) in problems {
            self.problems[f.index()] = Some(why);
        }
        if let Some(f) = first {
            self.focus = Some(f);
            return None;
        }
        // A number left as it was shown keeps its stored value exactly (the field shows it
        // rounded).
        let shown = SectionDetails::open_from(&self.before, self.section).texts;
        let untouched = |f: Field| shown[f.index()] == self.texts[f.index()];
        let coordinates = if untouched(Field::Latitude) && untouched(Field::Longitude) {
            self.before.coordinates
        } else {
            coordinates?
        };
        let panel = if untouched(Field::PanelPosition) && self.unit == self.before.display_unit {
            self.before.panel_position_m
        } else {
            panel?
        };
        Some(Details {
            name: name?,
            locality: t(Field::Locality).to_string(),
            logged_by: t(Field::LoggedBy).to_string(),
            date_logged: date?,
            coordinates,
            display_unit: self.unit,
            panel_position_m: panel,
            notes: t(Field::Notes).to_string(),
        })
    }

    /// Read every field and, when all read, the edits to apply (see [`Outcome::Apply`]).
    pub fn apply(&mut self, other_names: &[&str]) -> Outcome {
        match self.read(other_names) {
            None => Outcome::Open,
            Some(d) => {
                let edits = d.edits_from(&self.before);
                if edits.is_empty() {
                    Outcome::Closed
                } else {
                    Outcome::Apply { section: self.section, edits }
                }
            }
        }
    }

    /// The document refused the edits: say why, keep everything as typed.
    pub fn refused(&mut self, why: String) {
        self.note = Some(format!("Nothing was changed: {why}"));
    }

    /// Draw the dialog. `other_names` are the names of the project's other sections.
    pub fn ui(&mut self, ctx: &egui::Context, other_names: &[&str]) -> Outcome {
        let mut outcome = Outcome::Open;
        let modal = egui::Modal::new(egui::Id::unique("section_details")).show(ctx, |ui| {
            ui.set_max_width(620.0);
            ui.heading(format!("Section details: {}", self.before.name));
            ui.label(
                egui::RichText::new(
                    "Nothing is stored until Apply; a value that does not read is marked and kept as typed.",
                )
                .small()
                .color(theme::TEXT_DIM),
            );
            ui.add_space(6.0);
            egui::Grid::new("section_details_grid").num_columns(2).spacing([12.0, 6.0]).show(ui, |ui| {
                for f in Field::ALL.into_iter().filter(|f| *f != Field::Notes) {
                    if f == Field::PanelPosition {
                        self.unit_row(ui);
                    }
                    let label = ui.label(self.label(f)).id;
                    self.field(ui, f, label);
                    ui.end_row();
                }
            });
            // The notes below, across the dialog: a long text has room.
            ui.add_space(2.0);
            let label = ui.label(self.label(Field::Notes)).id;
            self.field(ui, Field::Notes, label);
            ui.add_space(4.0);
            ui.label(
                egui::RichText::new(
                    "Beds are edited in the bed table and the Bed tab, review decisions in the Review tab, \
                     curves and the traced sheet from the Section menu.",
                )
                .small()
                .color(theme::TEXT_DIM),
            );
            if let Some(note) = &self.note {
                problem_line(ui, note, 600.0);
            }
            ui.add_space(6.0);
            ui.horizontal(|ui| {
                let apply = ui
                    .button("Apply")
                    .on_hover_text("Store every field (Ctrl+Enter); one undo step takes it all back")
                    .clicked();
                let ctrl_enter = ui.input_mut(|i| i.consume_key(egui::Modifiers::COMMAND, egui::Key::Enter));
                if apply || ctrl_enter {
                    outcome = self.apply(other_names);
                }
                if ui.button("Cancel").on_hover_text("Close without storing what was typed here").clicked() {
                    outcome = Outcome::Closed;
                }
            });
        });
        if modal.should_close() && outcome == Outcome::Open {
            if self.is_changed() {
                // Escape or a click beside the dialog never drops what was typed.
                self.note = Some("Apply to store what was typed, or Cancel to drop it.".into());
            } else {
                outcome = Outcome::Closed;
            }
        }
        outcome
    }

    /// The label of a field (the panel position's names the unit it is typed in).
    fn label(&self, f: Field) -> String {
        match f {
            Field::PanelPosition => format!("{} ({})", f.label(), self.unit.name()),
            _ => f.label().to_string(),
        }
    }

    /// A field's text box, named by its label, framed in red with its problem under it while
    /// it does not read.
    fn field(&mut self, ui: &mut egui::Ui, f: Field, label_id: egui::Id) {
        let label = self.label(f);
        ui.vertical(|ui| {
            let text = &mut self.texts[f.index()];
            let (edit, width) = if f == Field::Notes {
                (egui::TextEdit::multiline(text).desired_rows(4), ui.available_width().max(560.0))
            } else {
                (egui::TextEdit::singleline(text), 420.0)
            };
            let resp = ui.add(edit.hint_text(f.hint()).desired_width(width).char_limit(MAX_STRING_CHARS));
            let resp = resp.labelled_by(label_id).on_hover_text(f.tip());
            if self.focus == Some(f) {
                resp.request_focus();
                self.focus = None;
            }
            if let Some(p) = &self.problems[f.index()] {
                mark_invalid(ui, resp.rect);
                problem_line(ui, &format!("{label}: {p}"), resp.rect.width());
            }
        });
    }

    fn unit_row(&mut self, ui: &mut egui::Ui) {
        ui.label("Display unit");
        ui.horizontal(|ui| {
            for u in LengthUnit::ALL {
                if ui
                    .selectable_label(self.unit == *u, u.name())
                    .on_hover_text("Heights and thicknesses of this section are shown and typed in this unit")
                    .clicked()
                {
                    self.set_unit(*u);
                }
            }
        });
        ui.end_row();
    }
}

/// A problem under a field, in the colour of text that does not read, wrapped at `width`.
fn problem_line(ui: &mut egui::Ui, text: &str, width: f32) {
    ui.scope(|ui| {
        ui.set_max_width(width);
        ui.add(egui::Label::new(egui::RichText::new(text).color(INVALID).small()).wrap());
    });
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn coordinates_read_in_range_with_signs_or_hemisphere_letters() {
        // WGS84 latitude spans -90..90 and longitude -180..180 degrees (the ranges the project
        // file's checks use).
        assert_eq!(
            read_coordinates("-24.6132", "133.7208"),
            Ok(Some(LatLon { lat_deg: -24.6132, lon_deg: 133.7208 }))
        );
        assert_eq!(
            read_coordinates("24.6132 S", "133,7208°E"),
            Ok(Some(LatLon { lat_deg: -24.6132, lon_deg: 133.7208 }))
        );
        assert_eq!(read_coordinates("90", "-180"), Ok(Some(LatLon { lat_deg: 90.0, lon_deg: -180.0 })));
        assert_eq!(read_coordinates(" ", ""), Ok(None));
        let (f, e) = read_coordinates("91", "10").expect_err("out of range");
        assert_eq!(f, Field::Latitude);
        assert!(e.contains("between -90 and 90") && e.contains("91"), "{e}");
        let (f, e) = read_coordinates("10", "180.5").expect_err("out of range");
        assert_eq!(f, Field::Longitude);
        assert!(e.contains("between -180 and 180"), "{e}");
        let (f, e) = read_coordinates("south", "10").expect_err("not a number");
        assert_eq!(f, Field::Latitude);
        assert!(e.contains("\"south\""), "{e}");
        let (f, e) = read_coordinates("-10 S", "10").expect_err("two signs");
        assert_eq!(f, Field::Latitude);
        assert!(e.contains("both"), "{e}");
        assert_eq!(read_coordinates("10", "").map_err(|e| e.0), Err(Field::Longitude));
        assert_eq!(read_coordinates("", "10").map_err(|e| e.0), Err(Field::Latitude));
        assert!(read_coordinates("NaN", "10").is_err());
    }

    #[test]
    fn dates_are_real_days_written_yyyy_mm_dd() {
        // ISO 8601 calendar dates; 2024 is a leap year, 2023 is not (Gregorian calendar).
        assert_eq!(read_date(" 2024-02-29 "), Ok(Some("2024-02-29".into())));
        assert_eq!(read_date(""), Ok(None));
        assert!(read_date("2023-02-29").is_err());
        let e = read_date("14/07/2026").expect_err("not ISO");
        assert!(e.contains("YYYY-MM-DD") && e.contains("14/07/2026"), "{e}");
    }

    #[test]
    fn panel_positions_are_typed_in_the_display_unit_and_stored_in_metres() {
        // One international foot is 0.3048 m exactly (1959 agreement).
        assert_eq!(read_panel_position("1000", LengthUnit::Foot), Ok(Some(304.8)));
        assert_eq!(read_panel_position("250 m", LengthUnit::Metre), Ok(Some(250.0)));
        assert_eq!(read_panel_position("-12,5", LengthUnit::Metre), Ok(Some(-12.5)));
        assert_eq!(read_panel_position("", LengthUnit::Metre), Ok(None));
        let too_far = format!("{}", MAX_PANEL_POSITION_M * 1.01);
        let e = read_panel_position(&too_far, LengthUnit::Metre).expect_err("too far");
        assert!(e.contains("within ±"), "{e}");
        let e = read_panel_position("far", LengthUnit::Foot).expect_err("not a number");
        assert!(e.contains("\"far\"") && e.contains("ft"), "{e}");
    }

    #[test]
    fn values_left_as_shown_keep_their_stored_digits() {
        let mut s = Section::new("Corrie Wash");
        s.coordinates = Some(LatLon { lat_deg: -24.123_456_789, lon_deg: 133.1 });
        s.panel_position_m = Some(1.0 / 3.0);
        let mut d = SectionDetails::open(&s, 0);
        assert_eq!(d.text(Field::Latitude), "-24.123457", "shown rounded");
        d.set_text(Field::Notes, "rounded values untouched");
        let Outcome::Apply { edits, .. } = d.apply(&[]) else { panic!("reads") };
        assert_eq!(edits.len(), 1, "only the notes changed: {edits:?}");
        assert!(
            matches!(&edits[0], Edit::SetSectionInfo { notes, .. } if notes == "rounded values untouched")
        );
    }

    #[test]
    fn names_must_be_given_and_unique() {
        assert_eq!(read_name("  Corrie Wash ", &["Pell Butte"]), Ok("Corrie Wash".into()));
        assert!(read_name("   ", &[]).expect_err("blank").contains("needs a name"));
        assert!(read_name("Pell Butte", &["Pell Butte"]).expect_err("clash").contains("already named"));
    }

    #[test]
    fn a_field_that_does_not_read_is_marked_kept_and_nothing_is_applied() {
        let mut s = Section::new("Corrie Wash");
        s.panel_position_m = Some(304.8);
        s.display_unit = LengthUnit::Foot;
        let mut d = SectionDetails::open(&s, 0);
        assert_eq!(d.text(Field::PanelPosition), "1000", "shown in the display unit");
        assert!(!d.is_changed());
        d.set_text(Field::Latitude, "south");
        d.set_text(Field::Longitude, "10");
        d.set_text(Field::DateLogged, "2026-13-01");
        assert_eq!(d.apply(&[]), Outcome::Open);
        assert!(d.problem(Field::Latitude).is_some_and(|p| p.contains("\"south\"")));
        assert!(d.problem(Field::DateLogged).is_some());
        assert_eq!(d.problem(Field::Name), None);
        assert_eq!(d.text(Field::Latitude), "south", "kept as typed");
        assert_eq!(d.unstored_lines().len(), 3, "{:?}", d.unstored_lines());
        d.set_text(Field::Latitude, "-24.5");
        d.set_text(Field::DateLogged, "2026-06-18");
        d.set_unit(LengthUnit::Metre);
        assert_eq!(d.text(Field::PanelPosition), "304.8", "the same distance in the new unit");
        let Outcome::Apply { section: 0, edits } = d.apply(&[]) else { panic!("all fields read") };
        assert_eq!(
            edits,
            vec![
                Edit::SetSectionPlace {
                    coordinates: Some(LatLon { lat_deg: -24.5, lon_deg: 10.0 }),
                    date_logged: Some("2026-06-18".into()),
                    panel_position_m: Some(304.8),
                },
                Edit::SetDisplayUnit { unit: LengthUnit::Metre },
            ]
        );
    }
}
