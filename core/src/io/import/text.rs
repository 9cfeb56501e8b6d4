//! Text tables (CSV, TSV, TXT) as people and instruments write them: the encoding (byte-order
//! marks, UTF-16, Latin-1), the delimiter (comma, semicolon, tab, bar or runs of spaces) and the
//! decimal mark are detected, each overridable, and the table is split into rows with their
//! line numbers.

use super::values::DecimalMark;
use super::{Cell, Row, Table};
use crate::io::limits::{MAX_BEDS_PER_SECTION, MAX_STRING_CHARS};
use crate::io::Problem;

/// Text encodings the importer reads.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TextEncoding {
    Utf8,
    Utf16Le,
    Utf16Be,
    /// ISO 8859-1 as Windows writes it (Windows-1252, a superset for printable text).
    Latin1,
}

impl TextEncoding {
    /// The encoding as named to the user.
    pub fn name(self) -> &'static str {
        match self {
            TextEncoding::Utf8 => "UTF-8",
            TextEncoding::Utf16Le => "UTF-16LE",
            TextEncoding::Utf16Be => "UTF-16BE",
            TextEncoding::Latin1 => "Latin-1 (Windows-1252)",
        }
    }

    /// Parse a name given on the command line (`utf-8`, `utf-16le`, `latin1`, `windows-1252` …).
    pub fn parse(text: &str) -> Option<TextEncoding> {
        match text.trim().to_ascii_lowercase().replace(['-', '_'], "").as_str() {
            "utf8" => Some(TextEncoding::Utf8),
            "utf16" | "utf16le" => Some(TextEncoding::Utf16Le),
            "utf16be" => Some(TextEncoding::Utf16Be),
            "latin1" | "iso88591" | "windows1252" | "cp1252" => Some(TextEncoding::Latin1),
            _ => None,
        }
    }
}

/// How cells are separated.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Delimiter {
    /// One character (`,`, `;`, tab, `|`), with RFC 4180 quoting.
    Char(u8),
    /// Runs of spaces or tabs (instrument exports), no quoting.
    Whitespace,
}

impl Delimiter {
    /// The delimiter as named to the user.
    pub fn describe(self) -> String {
        match self {
            Delimiter::Char(b'\t') => "tab".to_string(),
            Delimiter::Char(c) => format!("'{}'", c as char),
            Delimiter::Whitespace => "spaces".to_string(),
        }
    }

    /// Parse a name given on the command line: a single character, `tab`, `space`, `semicolon` …
    pub fn parse(text: &str) -> Option<Delimiter> {
        match text.to_ascii_lowercase().as_str() {
            "tab" | "\\t" | "\t" => Some(Delimiter::Char(b'\t')),
            "space" | "spaces" | "whitespace" => Some(Delimiter::Whitespace),
            "comma" => Some(Delimiter::Char(b',')),
            "semicolon" => Some(Delimiter::Char(b';')),
            "bar" | "pipe" => Some(Delimiter::Char(b'|')),
            t if t.len() == 1 && t.is_ascii() => t.bytes().next().map(Delimiter::Char),
            _ => None,
        }
    }
}

/// Choices for reading a text table; `None` means detect.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct TextOptions {
    pub encoding: Option<TextEncoding>,
    pub delimiter: Option<Delimiter>,
    pub decimal: Option<DecimalMark>,
}

/// What was detected (or given) for a text table, to print beside the mapping.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct TextSniffed {
    pub encoding: TextEncoding,
    pub bom: bool,
    pub delimiter: Delimiter,
    pub decimal: DecimalMark,
}

impl TextSniffed {
    /// One line: "UTF-8 with BOM, delimiter ';', decimal comma".
    pub fn describe(&self) -> String {
        format!(
            "{}{}, delimiter {}, {}",
            self.encoding.name(),
            if self.bom { " with byte-order mark" } else { "" },
            self.delimiter.describe(),
            self.decimal.describe()
        )
    }
}

/// Decode bytes to text: a byte-order mark decides; otherwise UTF-16 is recognised by its zero
/// bytes, valid UTF-8 is UTF-8, and anything else is read as Latin-1 (Windows-1252), which
/// every byte sequence is. A forced encoding that does not fit is an error naming the line.
pub fn decode(bytes: &[u8], forced: Option<TextEncoding>) -> Result<(String, TextEncoding, bool), Problem> {
    let (bom_enc, rest): (Option<TextEncoding>, &[u8]) = if let Some(r) = bytes.strip_prefix(b"\xEF\xBB\xBF")
    {
        (Some(TextEncoding::Utf8), r)
    } else if let Some(r) = bytes.strip_prefix(b"\xFF\xFE") {
        (Some(TextEncoding::Utf16Le), r)
    } else if let Some(r) = bytes.strip_prefix(b"\xFE\xFF") {
        (Some(TextEncoding::Utf16Be), r)
    } else {
        (None, bytes)
    };
    let bom = bom_enc.is_some();
    let encoding = forced.or(bom_enc).unwrap_or_else(|| {
        let sample = &bytes[..bytes.len().min(4096)];
        let zeros_even = sample.iter().step_by(2).filter(|b| **b == 0).count();
        let zeros_odd = sample.iter().skip(1).step_by(2).filter(|b| **b == 0).count();
        let half = sample.len() / 2;
        if half > 0 && zeros_odd * 3 > half && zeros_even * 10 < half {
            TextEncoding::Utf16Le
        } else if half > 0 && zeros_even * 3 > half && zeros_odd * 10 < half {
            TextEncoding::Utf16Be
        } else if std::str::from_utf8(bytes).is_ok() {
            TextEncoding::Utf8
        } else {
            TextEncoding::Latin1
        }
    });
    // A forced encoding that differs from the mark reads the bytes after the mark anyway.
    let body = if bom_enc.is_some() { rest } else { bytes };
    let text = match encoding {
        TextEncoding::Utf8 => match std::str::from_utf8(body) {
            Ok(t) => t.to_string(),
            Err(e) => {
                let valid = e.valid_up_to();
                let line = 1 + body[..valid].iter().filter(|&&b| b == b'\n').count();
                return Err(Problem::new(
                    "",
                    format!(
                        "not UTF-8 text: invalid byte 0x{:02X}; the file may be Latin-1 (give --encoding latin1) \
                         or UTF-16",
                        body.get(valid).copied().unwrap_or(0)
                    ),
                )
                .at_line(line));
            }
        },
        TextEncoding::Utf16Le | TextEncoding::Utf16Be => {
            let enc =
                if encoding == TextEncoding::Utf16Le { encoding_rs::UTF_16LE } else { encoding_rs::UTF_16BE };
            let (text, had_errors) = enc.decode_without_bom_handling(body);
            if had_errors || body.len() % 2 == 1 {
                let line = 1 + text.chars().take_while(|c| *c != '\u{FFFD}').filter(|c| *c == '\n').count();
                return Err(Problem::new("", format!("not valid {} text", encoding.name())).at_line(line));
            }
            text.into_owned()
        }
        TextEncoding::Latin1 => encoding_rs::WINDOWS_1252.decode_without_bom_handling(body).0.into_owned(),
    };
    if let Some(i) = text.find('\0') {
        let line = 1 + text[..i].matches('\n').count();
        return Err(Problem::new(
            "",
            format!(
                "a NUL character in {} text: this is not a text table (or the encoding is wrong)",
                encoding.name()
            ),
        )
        .at_line(line));
    }
    Ok((text, encoding, bom))
}

/// Split one line into cells on runs of spaces or tabs.
fn split_whitespace(line: &str) -> Vec<String> {
    line.split_whitespace().map(str::to_string).collect()
}

/// Field counts of the first records with a one-character delimiter (quote-aware).
fn field_counts(text: &str, delimiter: u8, records: usize) -> Vec<usize> {
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .delimiter(delimiter)
        .from_reader(text.as_bytes());
    reader
        .records()
        .take(records)
        .map_while(Result::ok)
        .filter(|r| r.iter().any(|c| !c.trim().is_empty()))
        .map(|r| r.len())
        .collect()
}

/// Pick the delimiter whose first rows split most consistently into the most columns.
pub fn sniff_delimiter(text: &str) -> Delimiter {
    // Only the first lines decide (bounded work on huge files).
    let head: String = text.lines().take(60).collect::<Vec<_>>().join("\n");
    let mut best = (0usize, 0usize, Delimiter::Char(b','));
    for d in [b',', b';', b'\t', b'|'] {
        let counts = field_counts(&head, d, 50);
        let Some(&first) = counts.first() else { continue };
        if first < 2 {
            continue;
        }
        let agree = counts.iter().filter(|&&n| n == first).count();
        if (agree, first) > (best.0, best.1) {
            best = (agree, first, Delimiter::Char(d));
        }
    }
    if best.0 == 0 {
        let counts: Vec<usize> =
            head.lines().filter(|l| !l.trim().is_empty()).map(|l| split_whitespace(l).len()).collect();
        if counts.first().is_some_and(|&n| n >= 2) {
            return Delimiter::Whitespace;
        }
    }
    best.2
}

/// Decimal comma when more number-like cells are written `1,5` than `1.5` (only possible when
/// the delimiter is not a comma).
pub fn sniff_decimal(rows: &[Row], delimiter: Delimiter) -> DecimalMark {
    if delimiter == Delimiter::Char(b',') {
        return DecimalMark::Point;
    }
    let mut comma = 0usize;
    let mut point = 0usize;
    let is_num = |s: &str, mark: char| {
        let s = s.trim().trim_start_matches(['-', '+']);
        let mut parts = s.splitn(2, mark);
        let a = parts.next().unwrap_or("");
        let b = parts.next();
        b.is_some_and(|b| !b.is_empty() && b.bytes().all(|c| c.is_ascii_digit()))
            && a.bytes().all(|c| c.is_ascii_digit())
    };
    for row in rows.iter().take(200) {
        for c in &row.cells {
            if let Cell::Text(t) = c {
                if is_num(t, ',') {
                    comma += 1;
                } else if is_num(t, '.') {
                    point += 1;
                }
            }
        }
    }
    if comma > point {
        DecimalMark::Comma
    } else {
        DecimalMark::Point
    }
}

/// Split decoded text into rows (each with its 1-based line), at most `MAX_BEDS_PER_SECTION`
/// + 20 non-empty rows (a header may sit below a few title lines); more is an error.
pub fn split_rows(text: &str, delimiter: Delimiter) -> Result<Vec<Row>, Problem> {
    let max_rows = MAX_BEDS_PER_SECTION + 20;
    let mut rows = Vec::new();
    let too_many = |line: usize| {
        Problem::new(
            "",
            format!("more than {MAX_BEDS_PER_SECTION} rows; at most {MAX_BEDS_PER_SECTION} beds per section"),
        )
        .at_line(line)
    };
    let check_len = |cells: &[String], line: usize| -> Result<(), Problem> {
        match cells.iter().position(|c| c.chars().count() > MAX_STRING_CHARS) {
            Some(i) => Err(Problem::new(
                format!("column {}", i + 1),
                format!("a cell of more than {MAX_STRING_CHARS} characters"),
            )
            .at_line(line)),
            None => Ok(()),
        }
    };
    match delimiter {
        Delimiter::Whitespace => {
            for (i, l) in text.lines().enumerate() {
                let cells = split_whitespace(l);
                if cells.is_empty() {
                    continue;
                }
                if rows.len() >= max_rows {
                    return Err(too_many(i + 1));
                }
                check_len(&cells, i + 1)?;
                rows.push(Row { line: i + 1, cells: cells.into_iter().map(Cell::Text).collect() });
            }
        }
        Delimiter::Char(d) => {
            // Lines counted from byte offsets (the parser's own count runs short on CR LF).
            let breaks: Vec<usize> = text.match_indices('\n').map(|(i, _)| i).collect();
            let line_of = |byte: usize| {
                let mut at = byte;
                while text.as_bytes().get(at).is_some_and(|b| *b == b'\n' || *b == b'\r') {
                    at += 1;
                }
                breaks.partition_point(|&b| b < at) + 1
            };
            let mut reader = csv::ReaderBuilder::new()
                .has_headers(false)
                .flexible(true)
                .delimiter(d)
                .from_reader(text.as_bytes());
            for record in reader.records() {
                let record = match record {
                    Ok(r) => r,
                    Err(e) => {
                        let line = e.position().map_or(1, |p| line_of(p.byte() as usize));
                        return Err(Problem::new("", format!("unreadable row: {e}")).at_line(line));
                    }
                };
                let line = record.position().map_or(1, |p| line_of(p.byte() as usize));
                if record.iter().all(|c| c.trim().is_empty()) {
                    continue;
                }
                if rows.len() >= max_rows {
                    return Err(too_many(line));
                }
                let cells: Vec<String> = record.iter().map(str::to_string).collect();
                check_len(&cells, line)?;
                rows.push(Row {
                    line,
                    cells: cells
                        .into_iter()
                        .map(|c| if c.trim().is_empty() { Cell::Empty } else { Cell::Text(c) })
                        .collect(),
                });
            }
        }
    }
    Ok(rows)
}

/// Read a text table from bytes: decode, detect, split.
pub fn read_text_table(bytes: &[u8], options: &TextOptions) -> Result<(Table, TextSniffed), Problem> {
    let (text, encoding, bom) = decode(bytes, options.encoding)?;
    let text = text.strip_prefix('\u{feff}').unwrap_or(&text);
    let delimiter = options.delimiter.unwrap_or_else(|| sniff_delimiter(text));
    let rows = split_rows(text, delimiter)?;
    let decimal = options.decimal.unwrap_or_else(|| sniff_decimal(&rows, delimiter));
    Ok((Table { sheet: None, rows }, TextSniffed { encoding, bom, delimiter, decimal }))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn european_spreadsheet_export() {
        let text = "\u{feff}Mächtigkeit (m);Lithology;Grain size\r\n1,2;sst;fs\r\n0,45;mdst;si\r\n";
        let (table, sniffed) = read_text_table(text.as_bytes(), &TextOptions::default()).expect("reads");
        assert_eq!(sniffed.encoding, TextEncoding::Utf8);
        assert!(sniffed.bom);
        assert_eq!(sniffed.delimiter, Delimiter::Char(b';'));
        assert_eq!(sniffed.decimal, DecimalMark::Comma);
        assert_eq!(table.rows.len(), 3);
        assert_eq!(table.rows[2].line, 3);
        assert_eq!(table.rows[0].cells[0], Cell::Text("Mächtigkeit (m)".into()));
    }

    #[test]
    fn utf16_and_latin1_are_recognised() {
        let text = "thickness,lithology\n1.5,sandstone\n";
        let mut le = vec![0xFF, 0xFE];
        le.extend(text.encode_utf16().flat_map(|u| u.to_le_bytes()));
        let (t, e, bom) = decode(&le, None).expect("utf-16le");
        assert_eq!((t.as_str(), e, bom), (text, TextEncoding::Utf16Le, true));
        let no_bom: Vec<u8> = text.encode_utf16().flat_map(|u| u.to_be_bytes()).collect();
        assert_eq!(decode(&no_bom, None).expect("utf-16be").1, TextEncoding::Utf16Be);
        // "Gr\xfcn" is "Grün" in Latin-1 and not UTF-8.
        let (t, e, _) = decode(b"colour\nGr\xfcn\n", None).expect("latin-1");
        assert_eq!((t.as_str(), e), ("colour\nGrün\n", TextEncoding::Latin1));
        let err = decode(b"a\nb\n\xff\n", Some(TextEncoding::Utf8)).expect_err("forced utf-8");
        assert_eq!(err.line, Some(3));
    }

    #[test]
    fn delimiters_are_detected() {
        assert_eq!(sniff_delimiter("a,b,c\n1,2,3\n"), Delimiter::Char(b','));
        assert_eq!(sniff_delimiter("a;b;c\n1,5;2;3\n"), Delimiter::Char(b';'));
        assert_eq!(sniff_delimiter("a\tb\n1\t2\n"), Delimiter::Char(b'\t'));
        assert_eq!(sniff_delimiter("height   K    U\n 0.1  1.2  3.4\n"), Delimiter::Whitespace);
        // A quoted comma does not make an extra column.
        assert_eq!(sniff_delimiter("notes;thick\n\"a, b\";1\n"), Delimiter::Char(b';'));
    }
}
