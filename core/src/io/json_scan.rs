//! A light pass over JSON text that needs no parse tree: it enforces the nesting, array-length
//! and string-length limits before a parser allocates anything, lists the fields a project file
//! should not have, and finds the line on which a JSON path's value starts (for error messages;
//! serde gives a line only for syntax errors).

use super::limits::{MAX_ARRAY_ITEMS, MAX_JSON_DEPTH, MAX_STRING_CHARS};
use super::problem::Problem;
use std::collections::{HashMap, HashSet};

/// One open container while scanning.
struct Frame {
    is_array: bool,
    /// What the container is in a project file (for the unknown-field check).
    role: Role,
    /// Items seen so far (arrays).
    count: usize,
    /// The key whose value comes next, or came last (objects).
    key: String,
    awaiting_key: bool,
}

/// The role of a container in a project file, as far as the unknown-field check needs it.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Role {
    Root,
    Sections,
    Section,
    Beds,
    Bed,
    Curves,
    Curve,
    Other,
}

/// Known field names of the project root, a section, a bed and a measured curve.
pub struct KnownFields {
    pub project: Vec<&'static str>,
    pub section: Vec<&'static str>,
    pub bed: Vec<&'static str>,
    pub curve: Vec<&'static str>,
}

/// What the scan visits: each value's path (when asked for) and line.
struct Scanner<'a> {
    bytes: &'a [u8],
    pos: usize,
    line: usize,
    stack: Vec<Frame>,
    known: Option<&'a KnownFields>,
    /// Fields not in `known`: (path, line).
    unknown: Vec<(String, usize)>,
}

impl<'a> Scanner<'a> {
    fn new(text: &'a str) -> Self {
        Scanner {
            bytes: text.as_bytes(),
            pos: 0,
            line: 1,
            stack: Vec::new(),
            known: None,
            unknown: Vec::new(),
        }
    }

    /// The path of the container stack, e.g. `sections[0].beds[3].thickness_m`.
    fn path(&self) -> String {
        let mut out = String::new();
        for frame in &self.stack {
            if frame.is_array {
                out.push_str(&format!("[{}]", frame.count.saturating_sub(1)));
            } else {
                if !out.is_empty() {
                    out.push('.');
                }
                out.push_str(&frame.key);
            }
        }
        out
    }

    /// Note the start of a value; errors when an array grows past its limit.
    fn value_start(&mut self) -> Result<(), Problem> {
        if let Some(top) = self.stack.last_mut() {
            if top.is_array {
                top.count += 1;
                if top.count > MAX_ARRAY_ITEMS {
                    let path = {
                        let mut p = self.path();
                        // Name the array, not the item past the limit.
                        if let Some(i) = p.rfind('[') {
                            p.truncate(i);
                        }
                        p
                    };
                    return Err(Problem::new(
                        path,
                        format!(
                            "more than {MAX_ARRAY_ITEMS} items; this build reads at most {MAX_ARRAY_ITEMS}"
                        ),
                    )
                    .at_line(self.line));
                }
            }
        }
        Ok(())
    }

    /// Walk the whole text, calling `visit(path_fn, line)` at the start of each value. Stops
    /// quietly at malformed input (the JSON parser reports that) and with an error at a limit.
    fn run(&mut self, mut visit: impl FnMut(&Self, usize)) -> Result<(), Problem> {
        while self.pos < self.bytes.len() {
            let b = self.bytes[self.pos];
            match b {
                b'\n' => {
                    self.line += 1;
                    self.pos += 1;
                }
                b' ' | b'\t' | b'\r' => self.pos += 1,
                b'{' | b'[' => {
                    self.value_start()?;
                    visit(self, self.line);
                    if self.stack.len() >= MAX_JSON_DEPTH {
                        return Err(Problem::new(
                            self.path(),
                            format!("nested more than {MAX_JSON_DEPTH} levels deep; a project nests 6"),
                        )
                        .at_line(self.line));
                    }
                    let role = match self.stack.last() {
                        None => Role::Root,
                        Some(f) => match (f.role, f.is_array, f.key.as_str()) {
                            (Role::Root, false, "sections") => Role::Sections,
                            (Role::Sections, true, _) => Role::Section,
                            (Role::Section, false, "beds") => Role::Beds,
                            (Role::Beds, true, _) => Role::Bed,
                            (Role::Section, false, "curves") => Role::Curves,
                            (Role::Curves, true, _) => Role::Curve,
                            _ => Role::Other,
                        },
                    };
                    self.stack.push(Frame {
                        is_array: b == b'[',
                        role,
                        count: 0,
                        key: String::new(),
                        awaiting_key: b == b'{',
                    });
                    self.pos += 1;
                }
                b'}' | b']' => {
                    self.stack.pop();
                    self.pos += 1;
                }
                b',' => {
                    if let Some(top) = self.stack.last_mut() {
                        if !top.is_array {
                            top.awaiting_key = true;
                        }
                    }
                    self.pos += 1;
                }
                b':' => {
                    if let Some(top) = self.stack.last_mut() {
                        top.awaiting_key = false;
                    }
                    self.pos += 1;
                }
                b'"' => {
                    let start_line = self.line;
                    let start = self.pos + 1;
                    let mut i = start;
                    // Characters of the decoded text, counted as validation counts them
                    // (`str::chars`): an escape is one character (a surrogate pair too), and
                    // UTF-8 continuation bytes are part of the character before them.
                    let mut chars = 0usize;
                    while i < self.bytes.len() && self.bytes[i] != b'"' {
                        match self.bytes[i] {
                            b'\\' => i += escape_len(self.bytes, i),
                            b'\n' => {
                                self.line += 1;
                                i += 1
                            }
                            _ => i += 1,
                        }
                        chars += 1;
                        // Continuation bytes (10xx_xxxx) of a multi-byte character.
                        while i < self.bytes.len() && (self.bytes[i] & 0xC0) == 0x80 {
                            i += 1;
                        }
                    }
                    let end = i.min(self.bytes.len());
                    self.pos = end + 1;
                    let is_key = self.stack.last().is_some_and(|f| !f.is_array && f.awaiting_key);
                    if is_key {
                        let key = String::from_utf8_lossy(&self.bytes[start..end]);
                        if let Some(top) = self.stack.last_mut() {
                            top.key.clear();
                            top.key.push_str(&key);
                        }
                        if let (Some(known), Some(top)) = (self.known, self.stack.last()) {
                            let list: &[&str] = match top.role {
                                Role::Root => &known.project,
                                Role::Section => &known.section,
                                Role::Bed => &known.bed,
                                Role::Curve => &known.curve,
                                _ => &[],
                            };
                            if !list.is_empty() && !list.contains(&key.as_ref()) {
                                self.unknown.push((self.path(), start_line));
                            }
                        }
                    } else {
                        self.value_start()?;
                        visit(self, start_line);
                        if chars > MAX_STRING_CHARS {
                            return Err(Problem::new(
                                self.path(),
                                format!("text of {chars} characters; at most {MAX_STRING_CHARS} allowed"),
                            )
                            .at_line(start_line));
                        }
                    }
                }
                _ => {
                    // Number or literal: runs to the next delimiter.
                    self.value_start()?;
                    visit(self, self.line);
                    while self.pos < self.bytes.len()
                        && !matches!(
                            self.bytes[self.pos],
                            b',' | b']' | b'}' | b' ' | b'\n' | b'\r' | b'\t' | b'"'
                        )
                    {
                        self.pos += 1;
                    }
                    if self.pos < self.bytes.len() && self.bytes[self.pos] == b'"' {
                        // Malformed; leave it to the parser.
                        return Ok(());
                    }
                }
            }
        }
        Ok(())
    }
}

/// The length in bytes of the escape starting with the `\\` at `at`, which decodes to one
/// character: `\\n`, `\\"` … (2 bytes), `\\uXXXX` (6), or a surrogate pair `\\uD83D\\uDE00` (12).
/// Malformed escapes are left to the JSON parser; they count as one character here.
fn escape_len(bytes: &[u8], at: usize) -> usize {
    let hex_at = |i: usize| -> Option<u32> {
        let digits = bytes.get(i..i + 4)?;
        if !digits.iter().all(u8::is_ascii_hexdigit) {
            return None;
        }
        digits.iter().try_fold(0u32, |acc, d| Some(acc * 16 + char::from(*d).to_digit(16)?))
    };
    if bytes.get(at + 1) != Some(&b'u') {
        return 2;
    }
    match hex_at(at + 2) {
        Some(0xD800..=0xDBFF) => {
            let low_follows = bytes.get(at + 6..at + 8) == Some(b"\\u".as_slice())
                && hex_at(at + 8).is_some_and(|low| (0xDC00..=0xDFFF).contains(&low));
            if low_follows {
                12
            } else {
                6
            }
        }
        Some(_) => 6,
        None => 2,
    }
}

/// Enforce [`MAX_JSON_DEPTH`], [`MAX_ARRAY_ITEMS`] and [`MAX_STRING_CHARS`] without building a tree.
#[cfg(any(test, feature = "internals"))]
pub fn check_limits(text: &str) -> Result<(), Problem> {
    Scanner::new(text).run(|_, _| {})
}

/// Like [`check_limits`], and also list the fields of the root, sections and beds that are not
/// in `known` (measured curves too), as (path, line).
pub fn check_limits_and_fields(text: &str, known: &KnownFields) -> Result<Vec<(String, usize)>, Problem> {
    let mut scanner = Scanner::new(text);
    scanner.known = Some(known);
    scanner.run(|_, _| {})?;
    Ok(scanner.unknown)
}

/// The line each wanted path's value starts on. A path absent from the text falls back to its
/// nearest ancestor that is present (a bed's line when its field is missing).
pub fn lines_of(text: &str, wanted: &[&str]) -> HashMap<String, usize> {
    // Every ancestor of a wanted path is wanted too, for the fallback.
    let mut want: HashSet<String> = HashSet::new();
    for w in wanted {
        let mut p = w.to_string();
        loop {
            want.insert(p.clone());
            match p.rfind(['.', '[']) {
                Some(i) => p.truncate(i),
                None => break,
            }
        }
    }
    let mut found: HashMap<String, usize> = HashMap::new();
    let mut scanner = Scanner::new(text);
    // Limits were checked before; a limit error here only ends the search early.
    let _ = scanner.run(|s, line| {
        let p = s.path();
        if want.contains(&p) {
            found.entry(p).or_insert(line);
        }
    });
    let mut out = HashMap::new();
    for w in wanted {
        let mut p = w.to_string();
        loop {
            if let Some(line) = found.get(&p) {
                out.insert(w.to_string(), *line);
                break;
            }
            match p.rfind(['.', '[']) {
                Some(i) => p.truncate(i),
                None => break,
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    const TEXT: &str = "{\n  \"sections\": [\n    {\n      \"name\": \"A\",\n      \"beds\": [\n        {\"thickness_m\": 1.0},\n        {\n          \"thickness_m\": -2\n        }\n      ]\n    }\n  ]\n}\n";

    #[test]
    fn finds_lines_of_paths_and_falls_back_to_ancestors() {
        let lines = lines_of(
            TEXT,
            &["sections[0].name", "sections[0].beds[1].thickness_m", "sections[0].beds[0].lithology"],
        );
        assert_eq!(lines.get("sections[0].name"), Some(&4));
        assert_eq!(lines.get("sections[0].beds[1].thickness_m"), Some(&8));
        // Missing field: the bed's own line.
        assert_eq!(lines.get("sections[0].beds[0].lithology"), Some(&6));
    }

    #[test]
    fn refuses_deep_nesting_and_long_arrays() {
        let deep = "[".repeat(MAX_JSON_DEPTH + 5);
        let err = check_limits(&deep).expect_err("deep nesting must be refused");
        assert!(err.message.contains("nested"), "{err}");
        let long = format!("{{\"a\": [{}0]}}", "0,".repeat(MAX_ARRAY_ITEMS));
        let err = check_limits(&long).expect_err("long array must be refused");
        assert_eq!(err.location, "a");
        assert!(check_limits(TEXT).is_ok());
    }

    #[test]
    fn lists_unknown_fields_of_sections_and_beds() {
        let known = KnownFields {
            project: vec!["sections"],
            section: vec!["name", "beds"],
            bed: vec!["id"],
            curve: vec!["mnemonic"],
        };
        let unknown = check_limits_and_fields(TEXT, &known).expect("within limits");
        assert_eq!(
            unknown,
            [
                ("sections[0].beds[0].thickness_m".to_string(), 6),
                ("sections[0].beds[1].thickness_m".to_string(), 8)
            ]
        );
    }

    /// A `notes` value written as `body`, `n` times, inside a JSON object.
    fn notes_of(body: &str, n: usize) -> String {
        format!("{{\"notes\": \"{}\"}}", body.repeat(n))
    }

    #[test]
    fn counts_decoded_characters_not_bytes() {
        // Each body decodes to one character: 2-, 3- and 4-byte UTF-8, an escape of the Basic
        // Multilingual Plane, a surrogate-pair escape (RFC 8259 §7) and two-character escapes.
        for body in ["é", "漢", "😀", "\\u00e9", "\\uD83D\\uDE00", "\\ud83d\\ude00", "\\n", "\\\"", "\\\\"]
        {
            let at_limit = notes_of(body, MAX_STRING_CHARS);
            assert!(check_limits(&at_limit).is_ok(), "{body:?} × {MAX_STRING_CHARS} must pass");
            let decoded: String = serde_json::from_str::<serde_json::Value>(&at_limit).expect("json")
                ["notes"]
                .as_str()
                .expect("text")
                .to_string();
            assert_eq!(decoded.chars().count(), MAX_STRING_CHARS, "{body:?}");
            let over = notes_of(body, MAX_STRING_CHARS + 1);
            let err = check_limits(&over).expect_err("one over must be refused");
            assert_eq!(
                err.message,
                format!("text of {} characters; at most {MAX_STRING_CHARS} allowed", MAX_STRING_CHARS + 1),
                "{body:?}"
            );
        }
        // "e" plus a combining acute accent is two characters to `str::chars`, and to the scan.
        let combining = notes_of("e\u{301}", MAX_STRING_CHARS / 2);
        assert!(check_limits(&combining).is_ok());
        assert!(check_limits(&notes_of("e\u{301}", MAX_STRING_CHARS / 2 + 1)).is_err());
    }

    #[test]
    fn a_lone_surrogate_escape_counts_as_one_and_is_left_to_the_parser() {
        // Not valid text (serde_json refuses it); the scan must neither panic nor miscount.
        let text = notes_of("\\uD83D", 3);
        assert!(check_limits(&text).is_ok());
        for cut in ["{\"notes\": \"\\u", "{\"notes\": \"\\uD83D\\u12", "{\"notes\": \"\\"] {
            assert!(check_limits(cut).is_ok(), "{cut:?}");
        }
    }

    #[test]
    fn refuses_long_strings() {
        let text = format!("{{\"notes\": \"{}\"}}", "x".repeat(MAX_STRING_CHARS + 1));
        let err = check_limits(&text).expect_err("long text must be refused");
        assert_eq!(err.location, "notes");
    }
}
