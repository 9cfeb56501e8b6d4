//! The Section details dialog: every descriptive field of a section in one window (name,
//! locality, who logged it and when, coordinates, display unit, place on the correlation panel,
//! notes), and how it was measured (method, thickness uncertainty, bedding attitude as dip and
//! dip direction or as a right-hand-rule strike and dip, the traverse, GPS fixes). Nothing is stored while typing; Apply reads every field as a whole, and a field that
//! does not read stays as typed, framed in red with its message, while nothing is stored. The
//! changes applied together are one undo step. The reading rules are pure functions, tested here.

use super::document::Edit;
use super::field::{mark_invalid, INVALID};
use super::theme;
use aggrade_core::io::limits::{MAX_PANEL_POSITION_M, MAX_STRING_CHARS};
use aggrade_core::io::MAX_BED_THICKNESS_M;
use aggrade_core::model::{
    BeddingAttitude, FixRole, GpsFix, LatLon, LengthUnit, MeasuringMethod, Section, Traverse,
};

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
    /// The ± error of one thickness reading, in the display unit.
    Uncertainty,
    /// Bedding: the dip, or the strike (right-hand rule), as the toggle says.
    BeddingFirst,
    /// Bedding: the dip direction, or the dip after a strike.
    BeddingSecond,
    TraverseBearing,
    TraverseSlope,
}

/// How many fields with a text the dialog has (besides the GPS fixes).
const FIELDS: usize = 13;

impl Field {
    /// Every field with a text, in order.
    pub const ALL: [Field; FIELDS] = [
        Field::Name,
        Field::Locality,
        Field::LoggedBy,
        Field::DateLogged,
        Field::Latitude,
        Field::Longitude,
        Field::PanelPosition,
        Field::Notes,
        Field::Uncertainty,
        Field::BeddingFirst,
        Field::BeddingSecond,
        Field::TraverseBearing,
        Field::TraverseSlope,
    ];

    /// The fields of the section's place and description (the dialog's first grid).
    const PLACE: [Field; 7] = [
        Field::Name,
        Field::Locality,
        Field::LoggedBy,
        Field::DateLogged,
        Field::Latitude,
        Field::Longitude,
        Field::PanelPosition,
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
            Field::Uncertainty => "Thickness uncertainty ±",
            Field::BeddingFirst => "Bedding dip (°)",
            Field::BeddingSecond => "Dip direction (°)",
            Field::TraverseBearing => "Traverse bearing (°)",
            Field::TraverseSlope => "Ground slope (°)",
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
            Field::Uncertainty => "e.g. 0.05",
            Field::BeddingFirst => "0–90",
            Field::BeddingSecond => "0–360",
            Field::TraverseBearing => "0–360, walked up-section",
            Field::TraverseSlope => "e.g. 12 uphill, -5 downhill",
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
            Field::Uncertainty => {
                "Your estimate of the ± error of one thickness reading, in the display unit (e.g. 0.05 for a Jacob's staff read to 5 cm); empty if not estimated"
            }
            Field::BeddingFirst => "Bedding dip at the section, 0 to 90 degrees",
            Field::BeddingSecond => "Bedding dip direction, 0 to 360 degrees clockwise from north",
            Field::TraverseBearing => {
                "Direction walked up-section while taping along the ground, 0 to 360 degrees clockwise from north"
            }
            Field::TraverseSlope => {
                "Slope of the ground along the traverse in degrees: positive uphill in the direction walked, negative downhill"
            }
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
    pub method: Option<MeasuringMethod>,
    pub thickness_uncertainty_m: Option<f64>,
    pub bedding: Option<BeddingAttitude>,
    pub traverse: Option<Traverse>,
    pub fixes: Vec<GpsFix>,
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
            method: s.method,
            thickness_uncertainty_m: s.thickness_uncertainty_m,
            bedding: s.bedding,
            traverse: s.traverse,
            fixes: s.fixes.clone(),
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
        if (self.method, self.thickness_uncertainty_m, self.bedding, self.traverse, &self.fixes)
            != (before.method, before.thickness_uncertainty_m, before.bedding, before.traverse, &before.fixes)
        {
            out.push(Edit::SetSectionSetting {
                method: self.method,
                thickness_uncertainty_m: self.thickness_uncertainty_m,
                bedding: self.bedding,
                traverse: self.traverse,
                fixes: self.fixes.clone(),
            });
        }
        if self.display_unit != before.display_unit {
            out.push(Edit::SetDisplayUnit { unit: self.display_unit });
        }
        out
    }
}

/// The texts of one GPS fix as typed: height in the section (display unit), latitude, longitude,
/// elevation (m) and a note, with its role.
#[derive(Debug, Clone, PartialEq)]
pub struct FixTexts {
    pub role: FixRole,
    pub texts: [String; 5],
    /// The field that does not read and why (after Apply).
    problem: Option<(FixField, String)>,
}

/// The fields of a GPS fix.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FixField {
    Height,
    Latitude,
    Longitude,
    Elevation,
    Note,
}

impl FixField {
    pub const ALL: [FixField; 5] =
        [FixField::Height, FixField::Latitude, FixField::Longitude, FixField::Elevation, FixField::Note];

    /// The column's name (a field is named "Fix 2 latitude" for screen readers and tests).
    pub fn label(self) -> &'static str {
        match self {
            FixField::Height => "height",
            FixField::Latitude => "latitude",
            FixField::Longitude => "longitude",
            FixField::Elevation => "elevation",
            FixField::Note => "note",
        }
    }
}

impl FixTexts {
    /// A fix as the dialog shows it.
    fn of(f: &GpsFix, unit: LengthUnit) -> Self {
        FixTexts {
            role: f.role,
            texts: [
                plain(unit.from_metres(f.height_m), 3),
                plain(f.lat_deg, 6),
                plain(f.lon_deg, 6),
                f.elevation_m.map(|e| plain(e, 1)).unwrap_or_default(),
                f.note.clone(),
            ],
            problem: None,
        }
    }

    /// A new fix at the top of the section.
    fn new_top(total_m: f64, unit: LengthUnit) -> Self {
        FixTexts {
            role: FixRole::Top,
            texts: [
                plain(unit.from_metres(total_m), 3),
                String::new(),
                String::new(),
                String::new(),
                String::new(),
            ],
            problem: None,
        }
    }

    fn text(&self, f: FixField) -> &str {
        &self.texts[f as usize]
    }
}

/// Read a GPS fix: height within the section (0 to `total_m`, typed in `unit`), latitude and
/// longitude in decimal degrees (required), elevation in metres (optional), a note.
pub fn read_fix(fix: &FixTexts, unit: LengthUnit, total_m: f64) -> Result<GpsFix, (FixField, String)> {
    let h_text = fix.text(FixField::Height).trim();
    let sym = unit.name();
    let height_m = aggrade_core::model::shorthand::length(h_text, unit)
        .ok()
        .filter(|h| h.is_finite() && (0.0..=total_m + 1e-9).contains(h))
        .ok_or_else(|| {
            (
                FixField::Height,
                format!(
                    "{h_text:?} is not a height within the section: 0 to {} {sym} above its base",
                    plain(unit.from_metres(total_m), 3)
                ),
            )
        })?
        .min(total_m);
    let lat = read_degrees(fix.text(FixField::Latitude), "latitude", 90.0, 'N', 'S')
        .map_err(|e| (FixField::Latitude, e))?
        .ok_or((FixField::Latitude, "a fix needs its latitude".to_string()))?;
    let lon = read_degrees(fix.text(FixField::Longitude), "longitude", 180.0, 'E', 'W')
        .map_err(|e| (FixField::Longitude, e))?
        .ok_or((FixField::Longitude, "a fix needs its longitude".to_string()))?;
    let e_text = fix.text(FixField::Elevation).trim();
    let elevation_m = if e_text.is_empty() {
        None
    } else {
        let t = e_text.strip_suffix('m').unwrap_or(e_text);
        Some(number(t).filter(|e| e.abs() <= 20_000.0).ok_or_else(|| {
            (
                FixField::Elevation,
                format!("{e_text:?} is not an elevation in metres (e.g. 1245); empty if not read"),
            )
        })?)
    };
    let note = fix.text(FixField::Note).trim().to_string();
    if note.chars().count() > MAX_STRING_CHARS {
        return Err((FixField::Note, format!("at most {MAX_STRING_CHARS} characters")));
    }
    Ok(GpsFix { role: fix.role, height_m, lat_deg: lat, lon_deg: lon, elevation_m, note })
}

/// Read an angle in degrees within `lo..=hi` (a degree sign allowed); empty is `None`.
fn read_angle(text: &str, what: &str, lo: f64, hi: f64) -> Result<Option<f64>, String> {
    let t = text.trim();
    if t.is_empty() {
        return Ok(None);
    }
    let v = number(&t.replace('°', "")).ok_or_else(|| {
        format!("{t:?} is not {what} in degrees (e.g. {})", plain((lo.max(0.0) + hi) / 4.0, 0))
    })?;
    if !(lo..=hi).contains(&v) {
        return Err(format!(
            "{what} lies between {} and {} degrees, got {}",
            plain(lo, 0),
            plain(hi, 0),
            plain(v, 3)
        ));
    }
    Ok(Some(v))
}

/// Read the bedding attitude from its two fields: dip and dip direction, or (with `strike`)
/// a right-hand-rule strike and dip. Both empty is none; one alone is refused.
pub fn read_bedding(
    first: &str,
    second: &str,
    strike: bool,
) -> Result<Option<BeddingAttitude>, (Field, String)> {
    let (a, b) = if strike {
        (
            read_angle(first, "a strike", 0.0, 360.0).map_err(|e| (Field::BeddingFirst, e))?,
            read_angle(second, "a dip", 0.0, 90.0).map_err(|e| (Field::BeddingSecond, e))?,
        )
    } else {
        (
            read_angle(first, "a dip", 0.0, 90.0).map_err(|e| (Field::BeddingFirst, e))?,
            read_angle(second, "a dip direction", 0.0, 360.0).map_err(|e| (Field::BeddingSecond, e))?,
        )
    };
    match (a, b) {
        (None, None) => Ok(None),
        (Some(_), None) => {
            Err((Field::BeddingSecond, "give this too, or clear the other bedding field".into()))
        }
        (None, Some(_)) => {
            Err((Field::BeddingFirst, "give this too, or clear the other bedding field".into()))
        }
        (Some(strike_deg), Some(dip_deg)) if strike => {
            Ok(Some(BeddingAttitude::from_strike_rhr(strike_deg, dip_deg)))
        }
        (Some(dip_deg), Some(dip_direction_deg)) => Ok(Some(BeddingAttitude { dip_deg, dip_direction_deg })),
    }
}

/// Read the traverse: bearing 0–360° and ground slope −90–90°. Both empty is none.
pub fn read_traverse(bearing: &str, slope: &str) -> Result<Option<Traverse>, (Field, String)> {
    let b = read_angle(bearing, "a bearing", 0.0, 360.0).map_err(|e| (Field::TraverseBearing, e))?;
    let s = read_angle(slope, "a ground slope", -90.0, 90.0).map_err(|e| (Field::TraverseSlope, e))?;
    match (b, s) {
        (None, None) => Ok(None),
        (Some(_), None) => {
            Err((Field::TraverseSlope, "give the slope too (0 on flat ground), or clear the bearing".into()))
        }
        (None, Some(_)) => Err((Field::TraverseBearing, "give the bearing too, or clear the slope".into())),
        (Some(bearing_deg), Some(slope_deg)) => Ok(Some(Traverse { bearing_deg, slope_deg })),
    }
}

/// Read the thickness uncertainty typed in `unit` (a trailing unit overrides it), in metres; empty
/// is `None`.
pub fn read_uncertainty(text: &str, unit: LengthUnit) -> Result<Option<f64>, String> {
    let t = text.trim().trim_start_matches('±').trim();
    if t.is_empty() {
        return Ok(None);
    }
    match aggrade_core::model::shorthand::length(t, unit) {
        Ok(m) if m.is_finite() && (0.0..=MAX_BED_THICKNESS_M).contains(&m) => Ok(Some(m)),
        _ => Err(format!("{t:?} is not an error of 0 or more, in {} (e.g. 0.05, 5cm)", unit.name())),
    }
}

/// `new` when it differs from `old` by more than rounding of the shown digits, else `old` (a
/// value left as shown keeps its stored digits).
fn unless_same<T: Copy>(new: Option<T>, old: Option<T>, same: impl Fn(&T, &T) -> bool) -> Option<T> {
    match (new, old) {
        (Some(n), Some(o)) if same(&n, &o) => Some(o),
        _ => new,
    }
}

fn close(a: f64, b: f64, tol: f64) -> bool {
    (a - b).abs() <= tol
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
    /// The section's thickness when the dialog opened, metres (GPS fixes lie within it).
    total_m: f64,
    texts: [String; FIELDS],
    unit: LengthUnit,
    method: Option<MeasuringMethod>,
    /// Bedding typed as a right-hand-rule strike and dip (else dip and dip direction).
    strike: bool,
    fixes: Vec<FixTexts>,
    problems: [Option<String>; FIELDS],
    /// Why the document refused the edits, or why the dialog cannot close yet.
    note: Option<String>,
    focus: Option<Field>,
    /// The pop-up lists drawn in the dialog this frame (their widget ids).
    lists: Vec<egui::Id>,
    /// Has the dialog been drawn yet?
    drawn: bool,
}

impl SectionDetails {
    /// The dialog on section `index` of the project, filled from what it holds.
    pub fn open(section: &Section, index: usize) -> Self {
        Self::open_from(&Details::of(section), index, section.total_thickness_m())
    }

    fn open_from(before: &Details, index: usize, total_m: f64) -> Self {
        let before = before.clone();
        let unit = before.display_unit;
        let (lat, lon) = match before.coordinates {
            Some(c) => (plain(c.lat_deg, 6), plain(c.lon_deg, 6)),
            None => (String::new(), String::new()),
        };
        let (dip, dir) = match before.bedding {
            Some(b) => (plain(b.dip_deg, 3), plain(b.dip_direction_deg, 3)),
            None => (String::new(), String::new()),
        };
        let (bearing, slope) = match before.traverse {
            Some(t) => (plain(t.bearing_deg, 3), plain(t.slope_deg, 3)),
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
            before.thickness_uncertainty_m.map(|m| plain(unit.from_metres(m), 4)).unwrap_or_default(),
            dip,
            dir,
            bearing,
            slope,
        ];
        SectionDetails {
            section: index,
            total_m,
            texts,
            unit,
            method: before.method,
            strike: false,
            fixes: before.fixes.iter().map(|f| FixTexts::of(f, unit)).collect(),
            before,
            problems: Default::default(),
            note: None,
            focus: Some(Field::Name),
            lists: Vec::new(),
            drawn: false,
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

    /// Choose the display unit; a panel position, an uncertainty and fix heights that read are
    /// converted, so that they stay the same lengths.
    pub fn set_unit(&mut self, unit: LengthUnit) {
        let i = Field::PanelPosition.index();
        if let Ok(Some(m)) = read_panel_position(&self.texts[i], self.unit) {
            self.texts[i] = plain(unit.from_metres(m), 3);
        }
        let i = Field::Uncertainty.index();
        if let Ok(Some(m)) = read_uncertainty(&self.texts[i], self.unit) {
            self.texts[i] = plain(unit.from_metres(m), 4);
        }
        for f in &mut self.fixes {
            let h = &mut f.texts[FixField::Height as usize];
            if let Ok(m) = aggrade_core::model::shorthand::length(h, self.unit) {
                *h = plain(unit.from_metres(m), 3);
            }
        }
        self.unit = unit;
    }

    /// Type bedding as strike and dip (right-hand rule) or as dip and dip direction; an attitude
    /// that reads is rewritten in the other form.
    pub fn set_strike(&mut self, strike: bool) {
        if strike == self.strike {
            return;
        }
        let (a, b) = (Field::BeddingFirst.index(), Field::BeddingSecond.index());
        if let Ok(Some(att)) = read_bedding(&self.texts[a], &self.texts[b], self.strike) {
            let (x, y) = if strike {
                (att.strike_rhr_deg(), att.dip_deg)
            } else {
                (att.dip_deg, att.dip_direction_deg)
            };
            self.texts[a] = plain(x, 3);
            self.texts[b] = plain(y, 3);
        }
        self.problems[a] = None;
        self.problems[b] = None;
        self.strike = strike;
    }

    /// The problem marked on a field (after Apply).
    #[cfg(test)]
    pub fn problem(&self, f: Field) -> Option<&str> {
        self.problems[f.index()].as_deref()
    }

    /// The problem marked on GPS fix `k` (after Apply).
    #[cfg(test)]
    pub fn fix_problem(&self, k: usize) -> Option<&(FixField, String)> {
        self.fixes.get(k).and_then(|f| f.problem.as_ref())
    }

    /// Add a GPS fix (at the top of the section) with its fields to fill.
    pub fn add_fix(&mut self) {
        self.fixes.push(FixTexts::new_top(self.total_m, self.unit));
    }

    /// Type into a field of GPS fix `k`.
    #[cfg(test)]
    pub fn set_fix_text(&mut self, k: usize, f: FixField, text: impl Into<String>) {
        self.fixes[k].texts[f as usize] = text.into();
    }

    /// The dialog as it was opened (what "changed" is measured against).
    fn fresh(&self) -> Self {
        SectionDetails::open_from(&self.before, self.section, self.total_m)
    }

    /// Has anything been typed or chosen that differs from the section as opened?
    pub fn is_changed(&self) -> bool {
        let fresh = self.fresh();
        fresh.texts != self.texts
            || fresh.unit != self.unit
            || fresh.method != self.method
            || fresh.fixes.len() != self.fixes.len()
            || fresh.fixes.iter().zip(&self.fixes).any(|(a, b)| (a.role, &a.texts) != (b.role, &b.texts))
    }

    /// The typed texts that differ from the section, one line each ("Latitude (°) \"south\""),
    /// for the window's backup and the question asked before closing.
    pub fn unstored_lines(&self) -> Vec<String> {
        let fresh = self.fresh();
        let name = &self.before.name;
        let mut out: Vec<String> = Field::ALL
            .iter()
            .filter(|f| fresh.texts[f.index()] != self.texts[f.index()])
            .map(|f| format!("Section details of {name}: {} {:?}", self.label(*f), self.text(*f)))
            .collect();
        if fresh.unit != self.unit {
            out.push(format!("Section details of {name}: display unit {}", self.unit.name()));
        }
        if fresh.method != self.method {
            let m = self.method.map_or("none".to_string(), method_label);
            out.push(format!("Section details of {name}: measuring method {m}"));
        }
        for (k, f) in self.fixes.iter().enumerate() {
            if fresh.fixes.get(k).is_none_or(|o| (o.role, &o.texts) != (f.role, &f.texts)) {
                let typed: Vec<String> = FixField::ALL
                    .iter()
                    .filter(|x| !f.text(**x).is_empty())
                    .map(|x| format!("{} {:?}", x.label(), f.text(*x)))
                    .collect();
                out.push(format!(
                    "Section details of {name}: GPS fix {} ({}) {}",
                    k + 1,
                    f.role.name(),
                    typed.join(", ")
                ));
            }
        }
        if self.fixes.len() < fresh.fixes.len() {
            out.push(format!(
                "Section details of {name}: {} GPS fixes removed",
                fresh.fixes.len() - self.fixes.len()
            ));
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
        let uncertainty = read_uncertainty(t(Field::Uncertainty), self.unit)
            .map_err(|e| problems.push((Field::Uncertainty, e)))
            .ok();
        let bedding = read_bedding(t(Field::BeddingFirst), t(Field::BeddingSecond), self.strike)
            .map_err(|e| problems.push(e))
            .ok();
        let traverse = read_traverse(t(Field::TraverseBearing), t(Field::TraverseSlope))
            .map_err(|e| problems.push(e))
            .ok();
        let mut fixes = Vec::new();
        let mut fix_failed = false;
        for (k, f) in self.fixes.iter_mut().enumerate() {
            f.problem = None;
            // Left as shown: the stored fix with every digit (even one the section has since
            // grown shorter than).
            let mut shown = f.clone();
            shown.problem = None;
            if let Some(same) = self.before.fixes.get(k).filter(|o| FixTexts::of(o, self.unit) == shown) {
                fixes.push(same.clone());
                continue;
            }
            match read_fix(f, self.unit, self.total_m) {
                Ok(fix) => fixes.push(fix),
                Err(p) => {
                    f.problem = Some(p);
                    fix_failed = true;
                }
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
        if fix_failed {
            return None;
        }
        // A number left as it was shown keeps its stored value exactly (the field shows it
        // rounded).
        let shown = self.fresh().texts;
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
        let uncertainty = unless_same(uncertainty?, self.before.thickness_uncertainty_m, |a, b| {
            close(*a, *b, 1e-4 * self.unit.metres())
        });
        let bedding = unless_same(bedding?, self.before.bedding, |a, b| {
            close(a.dip_deg, b.dip_deg, 1e-3) && close(a.dip_direction_deg, b.dip_direction_deg, 1e-3)
        });
        let traverse = unless_same(traverse?, self.before.traverse, |a, b| {
            close(a.bearing_deg, b.bearing_deg, 1e-3) && close(a.slope_deg, b.slope_deg, 1e-3)
        });
        Some(Details {
            name: name?,
            locality: t(Field::Locality).to_string(),
            logged_by: t(Field::LoggedBy).to_string(),
            date_logged: date?,
            coordinates,
            display_unit: self.unit,
            panel_position_m: panel,
            notes: t(Field::Notes).to_string(),
            method: self.method,
            thickness_uncertainty_m: uncertainty,
            bedding,
            traverse,
            fixes,
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
        // Room for the list of GPS fixes: what the window has beside the dialog's other rows.
        let room = (ctx.content_rect().height() - 760.0).max(90.0);
        if !self.drawn {
            // A menu or list left open in the window behind (the shortcut opens the dialog over
            // it) is closed: only the dialog's own lists show above the dialog.
            egui::Popup::close_all(ctx);
            self.drawn = true;
        }
        self.lists.clear();
        let modal = egui::Modal::new(egui::Id::unique("section_details")).show(ctx, |ui| {
            ui.set_max_width(700.0);
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
                for f in Field::PLACE {
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
            ui.add_space(8.0);
            ui.label(egui::RichText::new("How it was measured").strong());
            self.measuring_ui(ui);
            ui.add_space(8.0);
            self.fixes_ui(ui, room);
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
        lists_above(ctx, modal.response.layer_id, &self.lists);
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

    /// Method, uncertainty, bedding attitude and traverse.
    fn measuring_ui(&mut self, ui: &mut egui::Ui) {
        egui::Grid::new("section_measuring_grid").num_columns(2).spacing([12.0, 6.0]).show(ui, |ui| {
            let label = ui.label("Measuring method").id;
            let list = egui::ComboBox::from_id_salt("measuring_method")
                .selected_text(self.method.map_or("— (not said)".to_string(), method_label))
                .width(180.0)
                .show_ui(ui, |ui| {
                    ui.selectable_value(&mut self.method, None, "— (not said)");
                    for m in MeasuringMethod::ALL {
                        ui.selectable_value(&mut self.method, Some(*m), method_label(*m));
                    }
                })
                .response
                .labelled_by(label)
                .on_hover_text("How the thicknesses were measured");
            self.lists.push(list.id);
            ui.end_row();
            let label = ui.label(self.label(Field::Uncertainty)).id;
            self.field(ui, Field::Uncertainty, label);
            ui.end_row();
            ui.label("Bedding typed as");
            ui.horizontal(|ui| {
                let mut strike = self.strike;
                ui.selectable_value(&mut strike, false, "dip / dip direction")
                    .on_hover_text("Dip 0–90° and the direction it dips towards, 0–360°");
                ui.selectable_value(&mut strike, true, "strike / dip (right-hand rule)").on_hover_text(
                    "Strike 0–360° with the bed dipping to the right of it, and the dip 0–90°",
                );
                self.set_strike(strike);
            });
            ui.end_row();
            for f in [Field::BeddingFirst, Field::BeddingSecond, Field::TraverseBearing, Field::TraverseSlope]
            {
                let label = ui.label(self.label(f)).id;
                self.field(ui, f, label);
                ui.end_row();
            }
        });
        let b = (self.text(Field::BeddingFirst), self.text(Field::BeddingSecond));
        if let (true, Ok(Some(att))) = (self.strike, read_bedding(b.0, b.1, true)) {
            note_line(
                ui,
                &format!("Dips {}° towards {}°.", plain(att.dip_deg, 1), plain(att.dip_direction_deg, 1)),
            );
        }
        note_line(
            ui,
            "The traverse and bedding give each bed's true thickness from a slope distance typed in the Bed tab.",
        );
    }

    /// The GPS fixes: one row each, with a role, a height in the section and the position.
    fn fixes_ui(&mut self, ui: &mut egui::Ui, room: f32) {
        ui.label(egui::RichText::new(format!("GPS fixes ({})", self.fixes.len())).strong());
        note_line(
            ui,
            "The section's base location is the latitude and longitude above; list here the top and each offset \
             of a composite traverse (a base fix may be repeated with its elevation).",
        );
        let unit = self.unit;
        let mut remove = None;
        let lists = &mut self.lists;
        if !self.fixes.is_empty() {
            egui::ScrollArea::vertical().id_salt("section_fixes").max_height(room).show(ui, |ui| {
                egui::Grid::new("section_fixes_grid").num_columns(7).spacing([6.0, 4.0]).show(ui, |ui| {
                    let height = format!("height ({})", unit.name());
                    for h in [
                        "role",
                        height.as_str(),
                        "latitude (°)",
                        "longitude (°)",
                        "elevation (m)",
                        "note",
                        "",
                    ] {
                        ui.label(egui::RichText::new(h).small().color(theme::TEXT_DIM));
                    }
                    ui.end_row();
                    for (k, fix) in self.fixes.iter_mut().enumerate() {
                        let list = egui::ComboBox::from_id_salt(("fix_role", k))
                            .selected_text(fix.role.name())
                            .width(70.0)
                            .show_ui(ui, |ui| {
                                for r in FixRole::ALL {
                                    ui.selectable_value(&mut fix.role, *r, r.name());
                                }
                            })
                            .response
                            .on_hover_text("Where along the traverse the fix was taken");
                        lists.push(list.id);
                        for f in FixField::ALL {
                            let width = match f {
                                FixField::Height | FixField::Elevation => 64.0,
                                FixField::Latitude | FixField::Longitude => 88.0,
                                FixField::Note => 120.0,
                            };
                            let r = ui
                                .add_sized(
                                    [width, 20.0],
                                    egui::TextEdit::singleline(&mut fix.texts[f as usize])
                                        .desired_width(width)
                                        .char_limit(MAX_STRING_CHARS),
                                )
                                .accessible_name(format!("Fix {} {}", k + 1, f.label()));
                            if fix.problem.as_ref().is_some_and(|(p, _)| *p == f) {
                                mark_invalid(ui, r.rect);
                            }
                        }
                        if ui.small_button("✕").on_hover_text("Remove this fix").clicked() {
                            remove = Some(k);
                        }
                        ui.end_row();
                    }
                });
            });
            for (k, fix) in self.fixes.iter().enumerate() {
                if let Some((f, why)) = &fix.problem {
                    problem_line(ui, &format!("GPS fix {}, {}: {why}", k + 1, f.label()), 600.0);
                }
            }
        }
        if let Some(k) = remove {
            self.fixes.remove(k);
        }
        if ui
            .button("Add GPS fix")
            .on_hover_text("Add a fix, at the top of the section to begin with")
            .clicked()
        {
            self.add_fix();
        }
    }

    /// The label of a field (lengths name the unit they are typed in; the bedding fields follow
    /// the way bedding is typed).
    fn label(&self, f: Field) -> String {
        match f {
            Field::PanelPosition | Field::Uncertainty => format!("{} ({})", f.label(), self.unit.name()),
            Field::BeddingFirst if self.strike => "Strike (°, right-hand rule)".into(),
            Field::BeddingSecond if self.strike => "Bedding dip (°)".into(),
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
            } else if Field::PLACE.contains(&f) {
                (egui::TextEdit::singleline(text), 420.0)
            } else {
                (egui::TextEdit::singleline(text), 180.0)
            };
            let resp = ui.add(edit.hint_text(f.hint()).desired_width(width).char_limit(MAX_STRING_CHARS));
            let resp = resp.labelled_by(label_id).on_hover_text(f.tip());
            if self.focus == Some(f) {
                resp.request_focus();
                self.focus = None;
            }
            if let Some(p) = &self.problems[f.index()] {
                mark_invalid(ui, resp.rect);
                problem_line(ui, &format!("{label}: {p}"), resp.rect.width().max(300.0));
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

/// A measuring method as the window shows it: its stored name with a capital first letter
/// ("Jacob's staff", "Tape"), as the printed column header writes it.
pub fn method_label(m: MeasuringMethod) -> String {
    let name = m.name();
    let mut chars = name.chars();
    chars.next().map_or_else(String::new, |c| c.to_uppercase().chain(chars).collect())
}

/// Keep the dialog's open pop-up list (a measuring method or fix role; `lists` are their widget
/// ids) drawn directly above the dialog on layer `modal`. A press on the dialog raises the
/// dialog; a list opened by a quick click (press and release in one frame) asks to be raised in
/// the same frame, and when the list had been shown before, the dialog stayed above it: the list
/// opened hidden behind the dialog, and the window remembers that order from one session to the
/// next. Called every frame.
fn lists_above(ctx: &egui::Context, modal: egui::LayerId, lists: &[egui::Id]) {
    for id in lists {
        if egui::ComboBox::is_open(ctx, *id) {
            // The list's layer: egui names a combo box's pop-up after the box.
            let layer = egui::LayerId::new(modal.order, id.with("popup"));
            debug_assert!(
                ctx.memory(|m| m.areas().is_visible(&layer)),
                "the open list of {id:?} is not on the layer expected"
            );
            ctx.set_sublayer(modal, layer);
        }
    }
}

/// A small grey line of explanation, wrapped.
fn note_line(ui: &mut egui::Ui, text: &str) {
    ui.add(egui::Label::new(egui::RichText::new(text).small().color(theme::TEXT_DIM)).wrap());
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

    #[test]
    fn bedding_reads_as_dip_and_direction_or_as_a_right_hand_rule_strike() {
        // Right-hand rule: the bed dips to the right of the strike direction, dip direction =
        // strike + 90° (common practice in North American field work).
        assert_eq!(
            read_bedding("20", "30", false),
            Ok(Some(BeddingAttitude { dip_deg: 20.0, dip_direction_deg: 30.0 }))
        );
        assert_eq!(
            read_bedding("300", "20", true),
            Ok(Some(BeddingAttitude { dip_deg: 20.0, dip_direction_deg: 30.0 }))
        );
        assert_eq!(read_bedding("", " ", true), Ok(None));
        assert_eq!(read_bedding("95", "30", false).map_err(|e| e.0), Err(Field::BeddingFirst));
        assert_eq!(read_bedding("20", "361", false).map_err(|e| e.0), Err(Field::BeddingSecond));
        assert_eq!(read_bedding("20", "", false).map_err(|e| e.0), Err(Field::BeddingSecond));
        let (_, e) = read_bedding("north", "20", true).expect_err("not a number");
        assert!(e.contains("\"north\"") && e.contains("strike"), "{e}");
        // The toggle rewrites an attitude that reads in the other form.
        let mut s = Section::new("Sedge Creek");
        s.bedding = Some(BeddingAttitude { dip_deg: 12.0, dip_direction_deg: 75.0 });
        let mut d = SectionDetails::open(&s, 0);
        d.set_strike(true);
        assert_eq!((d.text(Field::BeddingFirst), d.text(Field::BeddingSecond)), ("345", "12"));
        let Outcome::Closed = d.apply(&[]) else { panic!("the same attitude: nothing to apply") };
    }

    #[test]
    fn traverse_uncertainty_and_method_are_one_setting_edit() {
        assert_eq!(read_traverse("210", "-8"), Ok(Some(Traverse { bearing_deg: 210.0, slope_deg: -8.0 })));
        assert_eq!(read_traverse("", ""), Ok(None));
        assert_eq!(read_traverse("210", "").map_err(|e| e.0), Err(Field::TraverseSlope));
        assert_eq!(read_traverse("210", "95").map_err(|e| e.0), Err(Field::TraverseSlope));
        // 1 ft = 0.3048 m exactly (1959 agreement).
        assert_eq!(read_uncertainty("0.5", LengthUnit::Foot), Ok(Some(0.1524)));
        assert_eq!(read_uncertainty("±5cm", LengthUnit::Metre), Ok(Some(0.05)));
        assert!(read_uncertainty("-1", LengthUnit::Metre).is_err());
        let mut d = SectionDetails::open(&Section::new("Pell Butte"), 0);
        d.method = Some(MeasuringMethod::JacobsStaff);
        d.set_text(Field::Uncertainty, "0.05");
        d.set_text(Field::TraverseBearing, "120");
        d.set_text(Field::TraverseSlope, "15");
        let Outcome::Apply { edits, .. } = d.apply(&[]) else { panic!("reads") };
        assert_eq!(
            edits,
            vec![Edit::SetSectionSetting {
                method: Some(MeasuringMethod::JacobsStaff),
                thickness_uncertainty_m: Some(0.05),
                bedding: None,
                traverse: Some(Traverse { bearing_deg: 120.0, slope_deg: 15.0 }),
                fixes: vec![],
            }]
        );
    }

    #[test]
    fn measuring_methods_are_shown_with_a_capital_and_stored_by_their_vocabulary_names() {
        // "Jacob's staff" takes its capital from Jacob (common practice in field manuals).
        assert_eq!(method_label(MeasuringMethod::JacobsStaff), "Jacob's staff");
        assert_eq!(method_label(MeasuringMethod::LaserRangefinder), "Laser rangefinder");
        for m in MeasuringMethod::ALL {
            assert_eq!(method_label(*m).to_lowercase(), m.name(), "only the first letter changes");
        }
    }

    #[test]
    fn gps_fixes_lie_within_the_section_and_on_the_globe() {
        use aggrade_core::model::{Bed, BedId, Lithology};
        let mut s = Section::new("Corrie Wash");
        s.beds.push(Bed::new(BedId(1), 12.0, Lithology::Mudstone, None));
        let mut d = SectionDetails::open(&s, 0);
        d.add_fix();
        assert_eq!(d.fixes[0].text(FixField::Height), "12", "a new fix is at the top");
        // WGS84 ranges: latitude -90..90, longitude -180..180.
        d.set_fix_text(0, FixField::Latitude, "-91");
        d.set_fix_text(0, FixField::Longitude, "133.7");
        assert_eq!(d.apply(&[]), Outcome::Open);
        assert_eq!(d.fix_problem(0).map(|p| p.0), Some(FixField::Latitude));
        d.set_fix_text(0, FixField::Latitude, "24.6 S");
        d.set_fix_text(0, FixField::Height, "12.5");
        assert_eq!(d.apply(&[]), Outcome::Open);
        let (f, why) = d.fix_problem(0).cloned().expect("above the top");
        assert_eq!(f, FixField::Height);
        assert!(why.contains("0 to 12 m"), "{why}");
        d.set_fix_text(0, FixField::Height, "11");
        d.set_fix_text(0, FixField::Elevation, "1245");
        d.set_fix_text(0, FixField::Note, "cairn on the ridge — Río Seco");
        let Outcome::Apply { edits, .. } = d.apply(&[]) else { panic!("reads") };
        let Edit::SetSectionSetting { fixes, .. } = &edits[0] else { panic!("{edits:?}") };
        assert_eq!(
            fixes,
            &vec![GpsFix {
                role: FixRole::Top,
                height_m: 11.0,
                lat_deg: -24.6,
                lon_deg: 133.7,
                elevation_m: Some(1245.0),
                note: "cairn on the ridge — Río Seco".into(),
            }]
        );
        assert!(d.unstored_lines().iter().any(|l| l.contains("GPS fix 1 (top)")), "{:?}", d.unstored_lines());
    }
}
