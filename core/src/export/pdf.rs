//! PDF writer: puts layout pages out one group at a time, so memory does not grow with the
//! section; the file (ISO 32000-1: header, objects, cross-reference table, trailer) is written
//! here around content streams from `pdf_content.rs` and the font from `pdf_font.rs`.
//!
//! No drawing decision lives here: positions, sizes, colours and dashes come from the items.
//! Each page is two objects written as soon as its group is done (its compressed content stream
//! and its page dictionary); what every page refers to (the resources, the font, the page tree)
//! has a fixed object number and is written after the last page, the font subset to the glyphs
//! the whole document shows.

use super::pdf_content::{num, uint, ContentWriter, FONT_RESOURCE, PT_PER_MM};
use super::pdf_font::font_objects;
use crate::layout::Page;
use std::collections::BTreeMap;
use std::io::{self, Write};

/// Document facts written into the PDF's information dictionary.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PdfInfo {
    pub title: String,
    pub author: String,
    /// Creation (and modification) date, seconds since 1970-01-01 00:00 UTC. Passed in so that
    /// the same input gives the same bytes (tests fix it; the CLI reads `SOURCE_DATE_EPOCH`).
    pub creation_date: i64,
}

/// Pages translated together, spread over the processor's cores, before any of them is written.
/// Memory holds one group's pages and their compressed content; the file's bytes do not depend on
/// the group size.
pub const PAGES_PER_GROUP: usize = 32;

/// Object numbers fixed in advance, because every page refers to them; they are written last.
const CATALOG: u32 = 1;
const PAGE_TREE: u32 = 2;
const RESOURCES: u32 = 3;
const FONT: u32 = 4;
/// The first number handed out for pages.
const FIRST_FREE: u32 = 5;

/// A zlib compressor and its output buffer, kept from one stream to the next: a new compressor
/// for every page cost as much again in fresh memory (its window and tables) as compressing.
pub(super) struct Deflater {
    z: flate2::Compress,
    buf: Vec<u8>,
}

impl Deflater {
    pub(super) fn new() -> Self {
        Deflater { z: flate2::Compress::new(flate2::Compression::fast(), true), buf: Vec::new() }
    }

    /// `data` deflated (zlib format, fast level), or `None` if that does not make it smaller
    /// (or fails): store it as it is.
    pub(super) fn deflate(&mut self, data: &[u8]) -> Option<&[u8]> {
        self.z.reset();
        self.buf.clear();
        self.buf.reserve(data.len() / 2 + 64);
        loop {
            let done = usize::try_from(self.z.total_in()).ok()?;
            let status =
                self.z.compress_vec(&data[done..], &mut self.buf, flate2::FlushCompress::Finish).ok()?;
            if status == flate2::Status::StreamEnd {
                break;
            }
            self.buf.reserve(self.buf.capacity().max(4096));
        }
        (self.buf.len() + 19 < data.len()).then_some(&self.buf)
    }
}

/// Append a stream object's body: `<< … /Length n [/Filter /FlateDecode] >> stream … endstream`,
/// compressed when that helps.
pub(super) fn stream_into(out: &mut Vec<u8>, dict_entries: &[u8], data: &[u8], z: &mut Deflater) {
    let (body, filter): (&[u8], &[u8]) = match z.deflate(data) {
        Some(c) => (c, b" /Filter /FlateDecode"),
        None => (data, b""),
    };
    out.reserve(body.len() + dict_entries.len() + 64);
    out.extend_from_slice(b"<< ");
    out.extend_from_slice(dict_entries);
    out.extend_from_slice(b"/Length ");
    uint(out, body.len() as u64);
    out.extend_from_slice(filter);
    out.extend_from_slice(b" >>\nstream\n");
    out.extend_from_slice(body);
    out.extend_from_slice(b"\nendstream");
}

/// A page translated and compressed, ready to write: its size and where its content stream's
/// object body lies in its worker's buffer.
struct Translated {
    width_mm: f64,
    height_mm: f64,
    body: std::ops::Range<usize>,
}

/// One worker's share of a group: the pages in order, their object bodies end to end, and the
/// glyphs they show.
struct Share {
    pages: Vec<Translated>,
    bodies: Vec<u8>,
    glyphs: BTreeMap<u16, char>,
}

/// Translate and compress consecutive pages, reusing one content buffer and one compressor.
fn translate_share(pages: &[Page]) -> Share {
    let mut share =
        Share { pages: Vec::with_capacity(pages.len()), bodies: Vec::new(), glyphs: BTreeMap::new() };
    let mut z = Deflater::new();
    let mut content = Vec::new();
    for page in pages {
        content = ContentWriter::new(page, content, &mut share.glyphs).page(page);
        let start = share.bodies.len();
        stream_into(&mut share.bodies, b"", &content, &mut z);
        share.pages.push(Translated {
            width_mm: page.width_mm,
            height_mm: page.height_mm,
            body: start..share.bodies.len(),
        });
    }
    share
}

/// Translate pages, spread over the processor's cores (at most 8) in consecutive shares.
fn translate(pages: &[Page]) -> Vec<Share> {
    let threads = std::thread::available_parallelism().map(|n| n.get()).unwrap_or(1).clamp(1, 8);
    if threads == 1 || pages.len() < 2 {
        return vec![translate_share(pages)];
    }
    let per = pages.len().div_ceil(threads);
    std::thread::scope(|scope| {
        let handles: Vec<_> =
            pages.chunks(per).map(|chunk| scope.spawn(move || translate_share(chunk))).collect();
        // A worker only panics on a defect; re-raise it here rather than lose pages.
        handles.into_iter().map(|h| h.join().unwrap_or_else(|e| std::panic::resume_unwind(e))).collect()
    })
}

/// Writes a PDF page by page to any [`Write`]: pages given to [`PdfWriter::add_page`] are kept
/// until a group is full, then translated and compressed (in the background, while the next group
/// is laid out) and written; [`PdfWriter::finish`] writes the rest. The same pages and info give the same bytes, whatever the group size.
pub struct PdfWriter<W: Write> {
    out: W,
    /// Bytes written so far (the next object's offset).
    pos: u64,
    /// Offset of each object, by number − 1 (0 until written).
    offsets: Vec<u64>,
    page_ids: Vec<u32>,
    glyphs: BTreeMap<u16, char>,
    info: PdfInfo,
    pending: Vec<Page>,
    pages_per_group: usize,
    /// The group being translated in the background while the next one is laid out, with its
    /// page count.
    in_flight: Option<(std::thread::JoinHandle<Vec<Share>>, usize)>,
}

impl<W: Write> PdfWriter<W> {
    /// Start a PDF on `out` (writes the header), grouping [`PAGES_PER_GROUP`] pages.
    pub fn new(out: W, info: &PdfInfo) -> io::Result<Self> {
        Self::with_group_size(out, info, PAGES_PER_GROUP)
    }

    /// Start a PDF that translates `pages_per_group` pages at a time (at least 1).
    pub fn with_group_size(out: W, info: &PdfInfo, pages_per_group: usize) -> io::Result<Self> {
        let mut w = PdfWriter {
            out,
            pos: 0,
            offsets: vec![0; (FIRST_FREE - 1) as usize],
            page_ids: Vec::new(),
            glyphs: BTreeMap::new(),
            info: info.clone(),
            pending: Vec::new(),
            pages_per_group: pages_per_group.max(1),
            in_flight: None,
        };
        // PDF 1.7; the second line's bytes above 127 mark the file as binary (ISO 32000-1 §7.5.2).
        w.put(b"%PDF-1.7\n%\xE2\xE3\xCF\xD3\n")?;
        Ok(w)
    }

    /// Pages added so far.
    pub fn page_count(&self) -> usize {
        self.page_ids.len() + self.pending.len() + self.in_flight.as_ref().map_or(0, |(_, n)| *n)
    }

    /// Add a page; it is written when its group is full (or at [`PdfWriter::finish`]). A full
    /// group is translated in the background while the caller lays out the next one; it is
    /// written when that one is full, so at most two groups are held.
    pub fn add_page(&mut self, page: Page) -> io::Result<()> {
        self.pending.push(page);
        if self.pending.len() >= self.pages_per_group {
            let group = std::mem::take(&mut self.pending);
            self.collect()?;
            let n = group.len();
            self.in_flight = Some((std::thread::spawn(move || translate(&group)), n));
        }
        Ok(())
    }

    /// Write the group translated in the background, if there is one.
    fn collect(&mut self) -> io::Result<()> {
        if let Some((handle, _)) = self.in_flight.take() {
            // The translation only panics on a defect; re-raise it here rather than lose pages.
            let shares = handle.join().unwrap_or_else(|e| std::panic::resume_unwind(e));
            self.write_shares(shares)?;
        }
        Ok(())
    }

    /// Translate and write pages now, in groups (pages still waiting from
    /// [`PdfWriter::add_page`] go first).
    pub fn add_pages(&mut self, pages: &[Page]) -> io::Result<()> {
        self.collect()?;
        let waiting = std::mem::take(&mut self.pending);
        self.write_pages(&waiting)?;
        for group in pages.chunks(self.pages_per_group) {
            self.write_pages(group)?;
        }
        Ok(())
    }

    fn put(&mut self, bytes: &[u8]) -> io::Result<()> {
        self.out.write_all(bytes)?;
        self.pos += bytes.len() as u64;
        Ok(())
    }

    fn new_id(&mut self) -> u32 {
        self.offsets.push(0);
        self.offsets.len() as u32
    }

    /// Write object `id` with its body.
    fn object(&mut self, id: u32, body: &[u8]) -> io::Result<()> {
        if let Some(slot) = self.offsets.get_mut(id as usize - 1) {
            *slot = self.pos;
        }
        let mut head = Vec::with_capacity(16);
        uint(&mut head, u64::from(id));
        head.extend_from_slice(b" 0 obj\n");
        self.put(&head)?;
        self.put(body)?;
        self.put(b"\nendobj\n")
    }

    fn write_pages(&mut self, pages: &[Page]) -> io::Result<()> {
        if pages.is_empty() {
            return Ok(());
        }
        self.write_shares(translate(pages))
    }

    /// Write translated pages: each one's content stream, then its page dictionary.
    fn write_shares(&mut self, shares: Vec<Share>) -> io::Result<()> {
        for share in shares {
            // The first character seen for a glyph wins, in page order, as in one pass.
            for (g, c) in share.glyphs {
                self.glyphs.entry(g).or_insert(c);
            }
            for t in share.pages {
                let content = self.new_id();
                self.object(content, &share.bodies[t.body])?;
                let page = self.new_id();
                let mut d = b"<< /Type /Page /Parent ".to_vec();
                uint(&mut d, u64::from(PAGE_TREE));
                d.extend_from_slice(b" 0 R /MediaBox [0 0 ");
                num(&mut d, t.width_mm * PT_PER_MM, 3);
                d.push(b' ');
                num(&mut d, t.height_mm * PT_PER_MM, 3);
                d.extend_from_slice(b"] /Resources ");
                uint(&mut d, u64::from(RESOURCES));
                d.extend_from_slice(b" 0 R /Contents ");
                uint(&mut d, u64::from(content));
                d.extend_from_slice(b" 0 R >>");
                self.object(page, &d)?;
                self.page_ids.push(page);
            }
        }
        Ok(())
    }

    /// Write the remaining pages, the font, page tree, catalogue, information dictionary,
    /// cross-reference table and trailer; gives back the output.
    pub fn finish(mut self) -> io::Result<W> {
        self.collect()?;
        let waiting = std::mem::take(&mut self.pending);
        self.write_pages(&waiting)?;

        let next = self.offsets.len() as u32 + 1;
        let (font, next) = font_objects(&self.glyphs, FONT, next);
        for _ in self.offsets.len() as u32 + 1..next {
            self.offsets.push(0);
        }
        for (id, body) in &font {
            self.object(*id, body)?;
        }
        drop(font);

        let mut r = b"<< /Font << /".to_vec();
        r.extend_from_slice(FONT_RESOURCE.as_bytes());
        r.push(b' ');
        uint(&mut r, u64::from(FONT));
        r.extend_from_slice(b" 0 R >> /ProcSet [/PDF /Text] >>");
        self.object(RESOURCES, &r)?;

        let mut t = b"<< /Type /Pages /Count ".to_vec();
        uint(&mut t, self.page_ids.len() as u64);
        t.extend_from_slice(b" /Kids [");
        for (k, id) in self.page_ids.iter().enumerate() {
            if k > 0 {
                t.push(if k % 16 == 0 { b'\n' } else { b' ' });
            }
            uint(&mut t, u64::from(*id));
            t.extend_from_slice(b" 0 R");
        }
        t.extend_from_slice(b"] >>");
        self.object(PAGE_TREE, &t)?;

        let mut c = b"<< /Type /Catalog /Pages ".to_vec();
        uint(&mut c, u64::from(PAGE_TREE));
        c.extend_from_slice(b" 0 R >>");
        self.object(CATALOG, &c)?;

        let info_id = self.new_id();
        let body = info_dictionary(&self.info);
        self.object(info_id, &body)?;

        // Cross-reference table: one 20-byte line per object (ISO 32000-1 §7.5.4).
        let xref_at = self.pos;
        let mut x = Vec::with_capacity(self.offsets.len() * 20 + 64);
        x.extend_from_slice(b"xref\n0 ");
        uint(&mut x, self.offsets.len() as u64 + 1);
        x.extend_from_slice(b"\n0000000000 65535 f \n");
        for off in &self.offsets {
            let digits = format!("{off:010}");
            x.extend_from_slice(digits.as_bytes());
            x.extend_from_slice(b" 00000 n \n");
        }
        x.extend_from_slice(b"trailer\n<< /Size ");
        uint(&mut x, self.offsets.len() as u64 + 1);
        x.extend_from_slice(b" /Root ");
        uint(&mut x, u64::from(CATALOG));
        x.extend_from_slice(b" 0 R /Info ");
        uint(&mut x, u64::from(info_id));
        x.extend_from_slice(b" 0 R >>\nstartxref\n");
        uint(&mut x, xref_at);
        x.extend_from_slice(b"\n%%EOF\n");
        self.put(&x)?;
        self.out.flush()?;
        Ok(self.out)
    }
}

/// A text string as UTF-16BE with its byte-order mark, in hex (ISO 32000-1 §7.9.2.2).
fn text_string(out: &mut Vec<u8>, s: &str) {
    out.extend_from_slice(b"<FEFF");
    for u in s.encode_utf16() {
        super::pdf_content::hex16(out, u);
    }
    out.push(b'>');
}

/// `D:YYYYMMDDHHmmSSZ` (ISO 32000-1 §7.9.4) of a Unix time; times before 1970 are written as 1970.
fn pdf_date(unix_s: i64) -> String {
    let t = unix_s.max(0);
    let day = super::civil_date(t).replace('-', "");
    let s = t.rem_euclid(86_400);
    format!("D:{day}{:02}{:02}{:02}Z", s / 3600, s / 60 % 60, s % 60)
}

fn info_dictionary(info: &PdfInfo) -> Vec<u8> {
    let mut d = b"<< /Title ".to_vec();
    text_string(&mut d, &info.title);
    if !info.author.is_empty() {
        d.extend_from_slice(b" /Author ");
        text_string(&mut d, &info.author);
    }
    let date = pdf_date(info.creation_date);
    for key in ["CreationDate", "ModDate"] {
        d.extend_from_slice(format!(" /{key} ({date})").as_bytes());
    }
    d.extend_from_slice(b" /Creator (Aggrade) /Producer (Aggrade) >>");
    d
}

/// Write pages to a PDF file's bytes. Same pages and info give the same bytes.
pub fn write_pdf(pages: &[Page], info: &PdfInfo) -> Vec<u8> {
    write_pdf_in_groups(pages, info, PAGES_PER_GROUP)
}

/// [`write_pdf`] translating `pages_per_group` pages at a time (at least 1); the bytes are the
/// same for every group size.
pub fn write_pdf_in_groups(pages: &[Page], info: &PdfInfo, pages_per_group: usize) -> Vec<u8> {
    let written = PdfWriter::with_group_size(Vec::new(), info, pages_per_group)
        .and_then(|mut w| w.add_pages(pages).map(|()| w))
        .and_then(PdfWriter::finish);
    // Writing to memory only fails if memory runs out, which aborts before this.
    written.unwrap_or_default()
}

/// Write pages as they come (e.g. from [`crate::layout::page_stream`]) to `out`, a group at a
/// time, never holding more than one group: the way to print a section of any length. Returns
/// the number of pages written.
pub fn write_pdf_to<W: Write>(
    out: W,
    pages: impl IntoIterator<Item = Page>,
    info: &PdfInfo,
) -> io::Result<usize> {
    let mut w = PdfWriter::new(out, info)?;
    for page in pages {
        w.add_page(page)?;
    }
    let n = w.page_count();
    w.finish()?;
    Ok(n)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates_in_pdf_form() {
        // 1 796 083 200 s is 2026-12-01 00:00 UTC (see `civil_date`); 3,723 s later is 01:02:03.
        assert_eq!(pdf_date(1_796_083_200), "D:20261201000000Z");
        assert_eq!(pdf_date(1_796_083_200 + 3_723), "D:20261201010203Z");
        assert_eq!(pdf_date(-5), "D:19700101000000Z");
    }

    #[test]
    fn the_cross_reference_table_points_at_every_object() {
        let page = Page { width_mm: 210.0, height_mm: 297.0, items: Vec::new(), segments: Vec::new() };
        let pdf = write_pdf(&[page.clone(), page], &PdfInfo::default());
        let text = |from: usize| String::from_utf8_lossy(&pdf[from..]).into_owned();
        let tail = text(pdf.len() - 40);
        let start: usize = tail
            .rsplit("startxref\n")
            .next()
            .and_then(|t| t.lines().next())
            .map_or(0, |l| l.parse().expect("offset"));
        let table = text(start);
        assert!(table.starts_with("xref\n0 "), "startxref points at the table");
        let count: usize =
            table.lines().nth(1).and_then(|l| l.split(' ').nth(1)).expect("count").parse().expect("n");
        for (k, line) in table.lines().skip(3).take(count - 1).enumerate() {
            assert_eq!(line.len(), 19, "line {line:?} (20 bytes with its newline)");
            let off: usize = line[..10].parse().expect("offset");
            assert!(text(off).starts_with(&format!("{} 0 obj\n", k + 1)), "object {} at {off}", k + 1);
        }
        let text = text(0);
        assert!(text.contains("/Type /Pages /Count 2"));
        assert!(text.ends_with("%%EOF\n"));
    }
}
