//! CSV records of a text (RFC 4180 quoting; CR LF, LF and CR line breaks; blank lines skipped),
//! each with the byte offset its text starts at, read by a parser built once per thread; and the
//! escaping of text cells that a spreadsheet would run as formulas.
//!
//! Building a CSV parser makes its transition tables; for a short bed table that cost more than
//! reading the table itself (most of each bed-table fuzz run, where every comparison is traced).
//! The parser is kept per thread and reset for each text. (A copy of a built `csv_core` parser
//! does not work: its `Clone` copies only part of the tables, so it is reset, never cloned.)

use std::cell::Cell;

thread_local! {
    /// The parser of the last text read on this thread, ready for the next.
    static SPARE_PARSER: Cell<Option<csv_core::Reader>> = const { Cell::new(None) };
}

/// A parser in its start state: the thread's spare, reset, or a new one.
fn take_parser() -> csv_core::Reader {
    match SPARE_PARSER.with(Cell::take) {
        Some(mut parser) => {
            parser.reset();
            parser
        }
        None => csv_core::ReaderBuilder::new().build(),
    }
}

/// One record: its fields (unquoted) and the byte offset where its text starts.
#[derive(Debug, Default, Clone, PartialEq, Eq)]
pub struct Record {
    /// The fields one after another.
    text: String,
    /// Where each field ends in `text`.
    ends: Vec<usize>,
    /// Byte offset in the input at which the parser started on this record (it may point at
    /// line breaks it skipped before the record, as the LF of a CR LF).
    pub start: usize,
}

impl Record {
    /// Field `i`, if the record has that many.
    pub fn get(&self, i: usize) -> Option<&str> {
        let end = *self.ends.get(i)?;
        let start = if i == 0 { 0 } else { self.ends[i - 1] };
        self.text.get(start..end)
    }

    /// Number of fields.
    pub fn len(&self) -> usize {
        self.ends.len()
    }

    /// The fields in order.
    pub fn iter(&self) -> impl Iterator<Item = &str> + '_ {
        (0..self.len()).map(move |i| self.get(i).unwrap_or(""))
    }
}

/// The records of a CSV text, in order.
pub struct Records<'t> {
    /// Always `Some` until dropped (then handed back to the thread).
    parser: Option<csv_core::Reader>,
    input: &'t [u8],
    pos: usize,
    done: bool,
    /// Output buffers, reused from record to record.
    fields: Vec<u8>,
    ends: Vec<usize>,
}

impl<'t> Records<'t> {
    pub fn new(text: &'t str) -> Self {
        Records {
            parser: Some(take_parser()),
            input: text.as_bytes(),
            pos: 0,
            done: false,
            fields: vec![0; 1024],
            ends: vec![0; 32],
        }
    }
}

impl Drop for Records<'_> {
    fn drop(&mut self) {
        let parser = self.parser.take();
        SPARE_PARSER.with(|spare| spare.set(parser));
    }
}

impl Iterator for Records<'_> {
    type Item = Record;

    fn next(&mut self) -> Option<Record> {
        use csv_core::ReadRecordResult;
        let parser = self.parser.as_mut()?;
        if self.done {
            return None;
        }
        let start = self.pos;
        let (mut out_len, mut ends_len) = (0usize, 0usize);
        loop {
            // An empty input tells the parser the text has ended.
            let input = &self.input[self.pos..];
            let (result, read, written, ended) =
                parser.read_record(input, &mut self.fields[out_len..], &mut self.ends[ends_len..]);
            self.pos += read;
            out_len += written;
            ends_len += ended;
            match result {
                ReadRecordResult::InputEmpty => {}
                ReadRecordResult::OutputFull => {
                    let grown = self.fields.len() * 2;
                    self.fields.resize(grown, 0);
                }
                ReadRecordResult::OutputEndsFull => {
                    let grown = self.ends.len() * 2;
                    self.ends.resize(grown, 0);
                }
                ReadRecordResult::Record => {
                    // Fields are cut at ASCII bytes (separators, quotes) of UTF-8 text, so they
                    // are UTF-8 themselves; the lossy form only guards that.
                    let text = String::from_utf8_lossy(&self.fields[..out_len]).into_owned();
                    return Some(Record { text, ends: self.ends[..ends_len].to_vec(), start });
                }
                ReadRecordResult::End => {
                    self.done = true;
                    return None;
                }
            }
        }
    }
}

/// Characters that make a spreadsheet treat a cell as a formula (OWASP CSV injection guidance).
const FORMULA_STARTS: [char; 6] = ['=', '+', '-', '@', '\t', '\r'];

/// Whether a text cell needs a leading `'`: it starts with a formula character, perhaps after
/// `'`s of its own (so that text such as `'=x` reads back with its `'`).
fn needs_escape(text: &str) -> bool {
    text.trim_start_matches('\'').starts_with(FORMULA_STARTS)
}

/// Escape a text cell that a spreadsheet would run as a formula.
pub fn escape_formula(text: &str) -> String {
    if needs_escape(text) {
        format!("'{text}")
    } else {
        text.to_string()
    }
}

/// Undo [`escape_formula`]: drop the `'` that [`escape_formula`] adds (one before a formula
/// character, or before `'`s followed by one). Other text, `'x` included, is kept as it is.
pub fn unescape_formula(text: &str) -> &str {
    match text.strip_prefix('\'') {
        Some(rest) if needs_escape(rest) => rest,
        _ => text,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        /// The same records, fields and start offsets as the `csv` crate's reader (flexible rows,
        /// no header row) on text made of separators, quotes, line breaks and letters.
        #[test]
        fn reads_what_the_csv_crate_reads(text in "[a,\"\r\n é漢]{0,40}") {
            let mut reader =
                csv::ReaderBuilder::new().has_headers(false).flexible(true).from_reader(text.as_bytes());
            let want: Vec<(usize, Vec<String>)> = reader
                .records()
                .map(|r| {
                    let r = r.expect("the csv crate reads UTF-8 text");
                    let start = r.position().map_or(0, |p| p.byte() as usize);
                    (start, r.iter().map(str::to_string).collect())
                })
                .collect();
            prop_assert_eq!(rows(&text), want);
        }
    }

    fn rows(text: &str) -> Vec<(usize, Vec<String>)> {
        Records::new(text).map(|r| (r.start, r.iter().map(str::to_string).collect())).collect()
    }

    #[test]
    fn reads_quoted_fields_line_breaks_and_offsets() {
        let text = "a,b\r\n\"x,\"\"y\"\"\nz\",é\n\n3\n";
        let got = rows(text);
        assert_eq!(
            got,
            [
                (0, vec!["a".to_string(), "b".to_string()]),
                // The LF of the CR LF is skipped before the second record.
                (4, vec!["x,\"y\"\nz".to_string(), "é".to_string()]),
                (text.find("\n\n3").unwrap_or(0) + 1, vec!["3".to_string()]),
            ]
        );
    }

    #[test]
    fn the_last_record_needs_no_line_break_and_long_fields_grow_the_buffers() {
        let long = "漢".repeat(5_000);
        let many = vec!["f"; 100].join(",");
        let got = rows(&format!("{long},1\n{many}"));
        assert_eq!(got[0].1, vec![long, "1".to_string()]);
        assert_eq!(got[1].1.len(), 100);
        assert!(rows("").is_empty());
        // The thread's parser starts fresh for each text (no state from an open quote), also
        // when two readers are open at once.
        let mut open = Records::new("\"a,b\n1");
        assert_eq!(Records::new("x,y").next().map(|r| r.len()), Some(2));
        assert_eq!(open.next().map(|r| r.len()), Some(1));
        assert_eq!(rows("\"open")[0].1, vec!["open".to_string()]);
        assert_eq!(rows("a,b")[0].1, vec!["a".to_string(), "b".to_string()]);
    }
}
