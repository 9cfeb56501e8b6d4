//! PDF, SVG and PNG writers that translate layout pages item by item.

mod pdf;
mod pdf_content;
mod pdf_font;
mod pdf_stream;
mod png;
mod svg;

pub use pdf::{write_pdf, write_pdf_in_groups, write_pdf_to, PdfInfo, PdfWriter, PAGES_PER_GROUP};
pub use png::{px_per_mm, rasterise, write_png, PngError, DPI_RANGE, MAX_PNG_PIXELS};
pub use svg::{write_svg, write_svg_to, SvgWriter};

/// The civil date (YYYY-MM-DD, UTC, proleptic Gregorian calendar) of a Unix time, for the
/// "printed on" line; the time is passed in so output stays reproducible. Uses the
/// days-from-civil inverse (H. Hinnant's public-domain date algorithms).
pub fn civil_date(unix_s: i64) -> String {
    let z = unix_s.div_euclid(86_400) + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

#[cfg(test)]
mod tests {
    use super::civil_date;

    #[test]
    fn dates_from_unix_time() {
        // 1970-01-01 is day 0 of the Unix epoch; 951 782 400 s is 2000-02-29 (leap day) and
        // 951 868 800 s is 2000-03-01; 1 796 083 200 s is 2026-12-01 (computed with Python's
        // datetime, an independent implementation).
        assert_eq!(civil_date(0), "1970-01-01");
        assert_eq!(civil_date(-86_400), "1969-12-31");
        assert_eq!(civil_date(951_782_400), "2000-02-29");
        assert_eq!(civil_date(951_868_800), "2000-03-01");
        assert_eq!(civil_date(1_796_083_200), "2026-12-01");
        assert_eq!(civil_date(1_796_083_200 - 1), "2026-11-30");
    }
}
