//! What the column's header says about how and where the section was measured: the measuring
//! method and its uncertainty, the bedding attitude, the traverse, the GPS fixes (WGS84) and
//! whether thicknesses were worked out from distances measured along the ground. Short facts,
//! set on lines that fit the page (each fact kept whole where it fits a line).

use super::*;
use crate::layout::text::{wrap, wrap_facts};
use crate::model::{FixRole, GpsFix, MeasuringMethod};

/// Text size of the header's measurement lines, pt.
pub const SETTING_PT: f64 = SMALL_PT + 0.5;
/// Distance between the header's measurement lines, mm.
pub const SETTING_LINE_MM: f64 = 2.6;
/// What goes between two facts on a line.
const SEP: &str = "  \u{b7}  ";

/// A latitude or longitude to 5 decimals (about 1 m) with its hemisphere: "31.41527° S".
pub fn coordinate(v: f64, pos: char, neg: char) -> String {
    format!("{:.5}\u{b0} {}", v.abs(), if v >= 0.0 { pos } else { neg })
}

/// An azimuth as three digits of degrees: "045°".
fn azimuth(deg: f64) -> String {
    format!("{:03.0}\u{b0}", deg.rem_euclid(360.0).round() % 360.0)
}

/// A length in the section's display unit ("0.05 m", "0.16 ft", "5.0 cm").
fn length(section: &Section, m: f64) -> String {
    let unit = section.display_unit;
    let digits = if unit == LengthUnit::Centimetre { 1 } else { 2 };
    format!("{:.digits$} {}", unit.from_metres(m), unit.name())
}

/// "31.41527° S, 148.20311° E" and the elevation when known.
fn fix_place(lat: f64, lon: f64, elevation_m: Option<f64>) -> String {
    let mut s = format!("{}, {}", coordinate(lat, 'N', 'S'), coordinate(lon, 'E', 'W'));
    if let Some(e) = elevation_m.filter(|e| e.is_finite()) {
        s.push_str(&format!(", elev. {e:.0} m"));
    }
    s
}

/// The measurement facts of a section, in the order printed (none for a section without them).
pub fn setting_facts(section: &Section) -> Vec<String> {
    let mut facts = Vec::new();
    if let Some(m) = section.method {
        facts.push(match m {
            MeasuringMethod::JacobsStaff => "measured with a Jacob's staff".to_string(),
            MeasuringMethod::Tape => "measured with a tape".to_string(),
            MeasuringMethod::LaserRangefinder => "measured with a laser rangefinder".to_string(),
            MeasuringMethod::Other => "measured by other means".to_string(),
        });
    }
    if let Some(u) = section.thickness_uncertainty_m.filter(|u| u.is_finite()) {
        facts.push(format!("each thickness \u{b1}{}", length(section, u)));
    }
    if let Some(b) = section.bedding.filter(|b| b.dip_deg.is_finite() && b.dip_direction_deg.is_finite()) {
        facts.push(format!(
            "bedding dip {:.0}\u{b0} toward {} (strike/dip {}/{:.0}, right-hand rule)",
            b.dip_deg,
            azimuth(b.dip_direction_deg),
            azimuth(b.strike_rhr_deg()).trim_end_matches('\u{b0}'),
            b.dip_deg
        ));
    }
    if let Some(t) = section.traverse.filter(|t| t.bearing_deg.is_finite() && t.slope_deg.is_finite()) {
        let slope = match t.slope_deg {
            s if s > 0.0 => format!("ground rising {s:.0}\u{b0}"),
            s if s < 0.0 => format!("ground falling {:.0}\u{b0}", -s),
            _ => "level ground".to_string(),
        };
        facts.push(format!("traverse bearing {}, {slope}", azimuth(t.bearing_deg)));
    }
    facts.extend(gps_facts(section));
    facts
}

/// The GPS fixes, the first headed with the datum: the base (the section's coordinates, with
/// the elevation of a base fix), then the top and each offset with its height in the section.
fn gps_facts(section: &Section) -> Vec<String> {
    let finite = |f: &&GpsFix| f.lat_deg.is_finite() && f.lon_deg.is_finite();
    let base_fix = section.fixes.iter().filter(finite).find(|f| f.role == FixRole::Base);
    let mut v = Vec::new();
    let base = section.coordinates.filter(|c| c.lat_deg.is_finite() && c.lon_deg.is_finite());
    match (base, base_fix) {
        (Some(c), fix) => {
            v.push(format!("base {}", fix_place(c.lat_deg, c.lon_deg, fix.and_then(|f| f.elevation_m))))
        }
        (None, Some(f)) => v.push(format!("base {}", fix_place(f.lat_deg, f.lon_deg, f.elevation_m))),
        (None, None) => {}
    }
    for f in section.fixes.iter().filter(finite).filter(|f| f.role != FixRole::Base) {
        let mut s = match f.role {
            FixRole::Top => "top".to_string(),
            _ => format!("offset at {}", length(section, f.height_m)),
        };
        s.push(' ');
        s.push_str(&fix_place(f.lat_deg, f.lon_deg, f.elevation_m));
        if !f.note.trim().is_empty() {
            s.push_str(&format!(" ({})", f.note.trim()));
        }
        v.push(s);
    }
    if let Some(first) = v.first_mut() {
        *first = format!("GPS (WGS84): {first}");
    }
    v
}

/// The line saying how many thicknesses were worked out from distances measured along the
/// ground, when any were.
pub fn slope_note(section: &Section) -> Option<String> {
    let n = section.beds.iter().filter(|b| b.slope_distance_m.is_some()).count();
    (n > 0).then(|| {
        let beds = if n == 1 { "1 bed".to_string() } else { format!("{n} beds") };
        format!(
            "Thicknesses of {beds} corrected from slope distances (measured along the ground, \
             corrected for the ground's slope and the bedding's dip)."
        )
    })
}

/// The header's measurement lines for a page `max_w_mm` wide between its margins.
pub fn setting_lines(section: &Section, max_w_mm: f64) -> Vec<String> {
    let mut lines = wrap_facts(&setting_facts(section), SEP, max_w_mm, SETTING_PT);
    if let Some(note) = slope_note(section) {
        lines.extend(wrap(&note, max_w_mm, SETTING_PT));
    }
    lines
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::layout::sample::sample_section;
    use crate::model::{BeddingAttitude, Traverse};

    fn field_section() -> Section {
        let mut s = sample_section();
        s.method = Some(MeasuringMethod::JacobsStaff);
        s.thickness_uncertainty_m = Some(0.05);
        s.bedding = Some(BeddingAttitude::from_strike_rhr(315.0, 12.0));
        s.traverse = Some(Traverse { bearing_deg: 50.0, slope_deg: 8.0 });
        s.fixes = vec![
            GpsFix {
                role: FixRole::Base,
                height_m: 0.0,
                lat_deg: -31.41527,
                lon_deg: 148.20311,
                elevation_m: Some(312.4),
                note: String::new(),
            },
            GpsFix {
                role: FixRole::Offset,
                height_m: 12.4,
                lat_deg: -31.414_801,
                lon_deg: 148.204_406,
                elevation_m: None,
                note: "along the coal".into(),
            },
            GpsFix {
                role: FixRole::Top,
                height_m: 31.0,
                lat_deg: -31.41402,
                lon_deg: 148.20577,
                elevation_m: Some(344.0),
                note: String::new(),
            },
        ];
        s.beds[3].slope_distance_m = Some(3.1);
        s.beds[4].slope_distance_m = Some(2.2);
        s
    }

    #[test]
    fn the_header_states_method_uncertainty_attitude_traverse_and_fixes() {
        let facts = setting_facts(&field_section());
        assert_eq!(facts[0], "measured with a Jacob's staff");
        assert_eq!(facts[1], "each thickness \u{b1}0.05 m");
        // Right-hand rule: strike 315° dipping 12° dips toward 045° (strike + 90°; common practice).
        assert_eq!(facts[2], "bedding dip 12\u{b0} toward 045\u{b0} (strike/dip 315/12, right-hand rule)");
        assert_eq!(facts[3], "traverse bearing 050\u{b0}, ground rising 8\u{b0}");
        assert_eq!(facts[4], "GPS (WGS84): base 31.41527\u{b0} S, 148.20311\u{b0} E, elev. 312 m");
        assert_eq!(facts[5], "offset at 12.40 m 31.41480\u{b0} S, 148.20441\u{b0} E (along the coal)");
        assert_eq!(facts[6], "top 31.41402\u{b0} S, 148.20577\u{b0} E, elev. 344 m");
        assert_eq!(facts.len(), 7);
        assert!(
            slope_note(&field_section()).is_some_and(|n| n.starts_with("Thicknesses of 2 beds corrected"))
        );
        // A version-1 section: only the base coordinates, with the datum; no slope note.
        let plain = sample_section();
        assert_eq!(
            setting_facts(&plain),
            vec!["GPS (WGS84): base 31.41527\u{b0} S, 148.20311\u{b0} E".to_string()]
        );
        assert_eq!(slope_note(&plain), None);
    }

    #[test]
    fn the_lines_fit_the_page_and_lose_no_fact() {
        let s = field_section();
        for w in [186.0, 120.0, 60.0] {
            let lines = setting_lines(&s, w);
            for l in &lines {
                assert!(width(l, SETTING_PT) <= w + 1e-9, "{l:?} wider than {w} mm");
            }
            let all = lines.join(" ");
            for f in setting_facts(&s) {
                for word in f.split_whitespace() {
                    assert!(all.contains(word), "{word} lost at {w} mm");
                }
            }
        }
        assert!(setting_lines(&s, 60.0).len() > setting_lines(&s, 186.0).len());
    }
}
