//! PDF writer: puts layout pages out one group at a time, so memory does not grow with the
//! section; the file (ISO 32000-1: header, objects, cross-reference table, trailer) is written
//! here around content streams from `pdf_content.rs` and the font from `pdf_font.rs`.
//!
//! No drawing decision lives here: positions, sizes, colours and dashes come from the items.
//! Each page is two objects written as soon as its group is done (its compressed content stream
//! and its page dictionary); what every page refers to (the resources, the font, the page tree)
//! has a fixed object number and is written after the last page, the font subset to the glyphs
//! the whole document shows.

use super::pdf_content::{num, uint, ContentWriter, PenState, FONT_RESOURCE, PT_PER_MM};
use super::pdf_font::font_objects;
use super::pdf_stream::{stream_into, Deflater};
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

/// Size at which a page written in pieces ([`PdfWriter::begin_page`]) starts a new content
/// stream, bytes before compression.
const PIECE_STREAM_BYTES: usize = 1 << 20;

/// A page begun with [`PdfWriter::begin_page`] and not yet ended.
struct OpenPage {
    width_mm: f64,
    height_mm: f64,
    /// Its content streams written so far.
    contents: Vec<u32>,
    /// The graphics state its content has set, and the content not yet written.
    pen: PenState,
    buf: Vec<u8>,
    z: Deflater,
}

/// Object numbers fixed in advance, because every page refers to them; they are written last.
const CATALOG: u32 = 1;
const PAGE_TREE: u32 = 2;
const RESOURCES: u32 = 3;
const FONT: u32 = 4;
/// The first number handed out for pages.
const FIRST_FREE: u32 = 5;

/// A page translated and compressed, ready to write: its size, its content stream's object body
/// and the glyphs it shows.
struct Translated {
    width_mm: f64,
    height_mm: f64,
    body: Vec<u8>,
    glyphs: BTreeMap<u16, char>,
}

/// Translates pages one after another, reusing one content buffer and one compressor (a fresh
/// compressor's window and tables cost as much in new memory as compressing a page).
struct Translator {
    z: Deflater,
    content: Vec<u8>,
}

impl Translator {
    fn new() -> Self {
        Translator { z: Deflater::new(), content: Vec::new() }
    }

    fn page(&mut self, page: &Page) -> Translated {
        let mut glyphs = BTreeMap::new();
        self.content = ContentWriter::new(page, std::mem::take(&mut self.content), &mut glyphs).page(page);
        let mut body = Vec::new();
        stream_into(&mut body, b"", &self.content, &mut self.z);
        Translated { width_mm: page.width_mm, height_mm: page.height_mm, body, glyphs }
    }
}

/// How many threads translate pages: the processor's cores, at most 8.
fn worker_count() -> usize {
    std::thread::available_parallelism().map(|n| n.get()).unwrap_or(1).clamp(1, 8)
}

/// Translate borrowed pages, spread over the cores in consecutive runs; results in page order.
fn translate(pages: &[Page]) -> Vec<Translated> {
    let threads = worker_count();
    if threads == 1 || pages.len() < 2 {
        let mut t = Translator::new();
        return pages.iter().map(|p| t.page(p)).collect();
    }
    let per = pages.len().div_ceil(threads);
    std::thread::scope(|scope| {
        let handles: Vec<_> = pages
            .chunks(per)
            .map(|chunk| {
                scope.spawn(move || {
                    let mut t = Translator::new();
                    chunk.iter().map(|p| t.page(p)).collect::<Vec<_>>()
                })
            })
            .collect();
        // A worker only panics on a defect; re-raise it here rather than lose pages.
        handles.into_iter().flat_map(|h| h.join().unwrap_or_else(|e| std::panic::resume_unwind(e))).collect()
    })
}

/// What a pool worker sends back: the page's number and its translation (or the panic that
/// stopped it, re-raised by the writer).
type Done = (usize, std::thread::Result<Translated>);

/// Worker threads that translate owned pages as they are laid out, each keeping its own
/// compressor and buffer for the whole document. Results come back in any order; the writer
/// puts them back in page order.
struct Pool {
    jobs: Option<std::sync::mpsc::Sender<(usize, Page)>>,
    results: std::sync::mpsc::Receiver<Done>,
    workers: Vec<std::thread::JoinHandle<()>>,
    /// Pages sent to the workers, pages written.
    sent: usize,
    written: usize,
    /// Translations that arrived before an earlier page's.
    early: BTreeMap<usize, Translated>,
}

impl Pool {
    fn new(threads: usize) -> Self {
        use std::sync::{mpsc, Arc, Mutex};
        let (jobs, job_rx) = mpsc::channel::<(usize, Page)>();
        let (done_tx, results) = mpsc::channel::<Done>();
        let job_rx = Arc::new(Mutex::new(job_rx));
        let workers = (0..threads)
            .map(|_| {
                let (job_rx, done_tx) = (Arc::clone(&job_rx), done_tx.clone());
                std::thread::spawn(move || {
                    let mut t = Translator::new();
                    loop {
                        // The lock is held only while taking a job; a poisoned lock means
                        // another worker panicked, which the writer reports.
                        let job = match job_rx.lock() {
                            Ok(rx) => rx.recv(),
                            Err(_) => return,
                        };
                        let Ok((index, page)) = job else { return };
                        let done = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| t.page(&page)));
                        let failed = done.is_err();
                        if done_tx.send((index, done)).is_err() || failed {
                            return;
                        }
                    }
                })
            })
            .collect();
        Pool { jobs: Some(jobs), results, workers, sent: 0, written: 0, early: BTreeMap::new() }
    }
}

impl Drop for Pool {
    fn drop(&mut self) {
        // Closing the job channel ends the workers.
        self.jobs = None;
        for w in self.workers.drain(..) {
            let _ = w.join();
        }
    }
}

/// Writes a PDF page by page to any [`Write`]. Pages given to [`PdfWriter::add_page`] go to
/// worker threads as they come and are written, in order, as soon as they are translated; at most
/// a group's worth ([`PAGES_PER_GROUP`]) is waiting at any time, so memory does not grow with the
/// document. [`PdfWriter::add_pages`] translates borrowed pages a group at a time. The same pages
/// and info give the same bytes, whatever the group size and however the pages were added.
pub struct PdfWriter<W: Write> {
    out: W,
    /// Bytes written so far (the next object's offset).
    pos: u64,
    /// Offset of each object, by number − 1 (0 until written).
    offsets: Vec<u64>,
    page_ids: Vec<u32>,
    glyphs: BTreeMap<u16, char>,
    info: PdfInfo,
    pages_per_group: usize,
    /// Started with the first page given by value (none on a single core: pages are then
    /// translated where they are added).
    pool: Option<Pool>,
    /// A page being written in pieces.
    open: Option<OpenPage>,
}

impl<W: Write> PdfWriter<W> {
    /// Start a PDF on `out` (writes the header), grouping [`PAGES_PER_GROUP`] pages.
    pub fn new(out: W, info: &PdfInfo) -> io::Result<Self> {
        Self::with_group_size(out, info, PAGES_PER_GROUP)
    }

    /// Start a PDF that holds at most `pages_per_group` pages not yet written (at least 1).
    pub fn with_group_size(out: W, info: &PdfInfo, pages_per_group: usize) -> io::Result<Self> {
        let mut w = PdfWriter {
            out,
            pos: 0,
            offsets: vec![0; (FIRST_FREE - 1) as usize],
            page_ids: Vec::new(),
            glyphs: BTreeMap::new(),
            info: info.clone(),
            pages_per_group: pages_per_group.max(1),
            pool: None,
            open: None,
        };
        // PDF 1.7; the second line's bytes above 127 mark the file as binary (ISO 32000-1 §7.5.2).
        w.put(b"%PDF-1.7\n%\xE2\xE3\xCF\xD3\n")?;
        Ok(w)
    }

    /// Pages added so far.
    pub fn page_count(&self) -> usize {
        self.page_ids.len() + self.pool.as_ref().map_or(0, |p| p.sent - p.written)
    }

    /// Add a page: it is translated by a worker while the caller lays out the next ones, and
    /// written as soon as the pages before it are. Waits for the workers when a group's worth of
    /// pages is not yet written.
    pub fn add_page(&mut self, page: Page) -> io::Result<()> {
        if self.open.is_some() {
            self.end_page()?;
        }
        let threads = worker_count();
        if threads == 1 {
            let t = Translator::new().page(&page);
            return self.write_translated(t);
        }
        let pool = self.pool.get_or_insert_with(|| Pool::new(threads));
        let index = pool.sent;
        if let Some(jobs) = &pool.jobs {
            if jobs.send((index, page)).is_err() {
                // Every worker has stopped, which only a panic does: report it.
                return self.drain(0);
            }
        }
        pool.sent += 1;
        self.drain(self.pages_per_group)
    }

    /// Write translated pages in order until at most `waiting` pages are still out.
    fn drain(&mut self, waiting: usize) -> io::Result<()> {
        loop {
            let Some(pool) = self.pool.as_mut() else { return Ok(()) };
            if let Some(t) = pool.early.remove(&pool.written) {
                pool.written += 1;
                self.write_translated(t)?;
                continue;
            }
            let out = pool.sent - pool.written;
            let next = if out > waiting {
                match pool.results.recv() {
                    Ok(done) => done,
                    Err(_) => {
                        return Err(io::Error::other("the PDF workers stopped before every page was written"))
                    }
                }
            } else {
                match pool.results.try_recv() {
                    Ok(done) => done,
                    Err(_) => return Ok(()),
                }
            };
            let (index, result) = next;
            // A worker only panics on a defect; re-raise it here rather than lose pages.
            let t = result.unwrap_or_else(|e| std::panic::resume_unwind(e));
            pool.early.insert(index, t);
        }
    }

    /// Translate and write pages now, in groups (pages still out with the workers go first).
    pub fn add_pages(&mut self, pages: &[Page]) -> io::Result<()> {
        if self.open.is_some() {
            self.end_page()?;
        }
        self.drain(0)?;
        for group in pages.chunks(self.pages_per_group) {
            for t in translate(group) {
                self.write_translated(t)?;
            }
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

    /// Write a translated page: its content stream, then its page dictionary.
    fn write_translated(&mut self, t: Translated) -> io::Result<()> {
        // The first character seen for a glyph wins, in page order.
        for (g, c) in t.glyphs {
            self.glyphs.entry(g).or_insert(c);
        }
        let content = self.new_id();
        self.object(content, &t.body)?;
        self.page_dictionary(t.width_mm, t.height_mm, &[content])
    }

    /// Start a page whose items come in pieces ([`PdfWriter::page_items`], then
    /// [`PdfWriter::end_page`]), for a page too large to hold whole (a correlation panel of many
    /// long sections): its content goes to the file in streams of about 1 MB as the items come.
    /// Pages added before it are written first.
    pub fn begin_page(&mut self, width_mm: f64, height_mm: f64) -> io::Result<()> {
        self.drain(0)?;
        let mut glyphs = BTreeMap::new();
        let (buf, pen) = ContentWriter::start(height_mm, Vec::new(), &mut glyphs).pause();
        let page = OpenPage { width_mm, height_mm, contents: Vec::new(), pen, buf, z: Deflater::new() };
        self.merge_glyphs(glyphs);
        self.open = Some(page);
        Ok(())
    }

    /// The next items of the page begun with [`PdfWriter::begin_page`], in drawing order.
    pub fn page_items(&mut self, items: &[crate::layout::Item]) -> io::Result<()> {
        let Some(mut page) = self.open.take() else {
            return Err(io::Error::other("page_items without begin_page"));
        };
        let mut glyphs = BTreeMap::new();
        let mut w =
            ContentWriter::resume(std::mem::take(&mut page.pen), std::mem::take(&mut page.buf), &mut glyphs);
        // A few hundred items at a time, so no piece's content grows far past the stream size.
        for chunk in items.chunks(256) {
            w.items(chunk);
            if w.len() >= PIECE_STREAM_BYTES {
                let (buf, pen) = w.pause();
                let buf = self.content_stream(&mut page, buf)?;
                w = ContentWriter::resume(pen, buf, &mut glyphs);
            }
        }
        (page.buf, page.pen) = w.pause();
        self.merge_glyphs(glyphs);
        self.open = Some(page);
        Ok(())
    }

    /// Finish the page begun with [`PdfWriter::begin_page`]: its last content stream and its
    /// page dictionary, whose `Contents` lists every stream in order.
    pub fn end_page(&mut self) -> io::Result<()> {
        let Some(mut page) = self.open.take() else {
            return Err(io::Error::other("end_page without begin_page"));
        };
        let buf = std::mem::take(&mut page.buf);
        if !buf.is_empty() || page.contents.is_empty() {
            self.content_stream(&mut page, buf)?;
        }
        self.page_dictionary(page.width_mm, page.height_mm, &page.contents)
    }

    /// Write `content` as the open page's next content stream; gives the buffer back emptied.
    fn content_stream(&mut self, page: &mut OpenPage, mut content: Vec<u8>) -> io::Result<Vec<u8>> {
        let mut body = Vec::new();
        stream_into(&mut body, b"", &content, &mut page.z);
        let id = self.new_id();
        self.object(id, &body)?;
        page.contents.push(id);
        content.clear();
        Ok(content)
    }

    fn merge_glyphs(&mut self, glyphs: BTreeMap<u16, char>) {
        for (g, c) in glyphs {
            self.glyphs.entry(g).or_insert(c);
        }
    }

    /// Write a page dictionary whose content is the stream objects `contents`, in order.
    fn page_dictionary(&mut self, width_mm: f64, height_mm: f64, contents: &[u32]) -> io::Result<()> {
        let page = self.new_id();
        let mut d = b"<< /Type /Page /Parent ".to_vec();
        uint(&mut d, u64::from(PAGE_TREE));
        d.extend_from_slice(b" 0 R /MediaBox [0 0 ");
        num(&mut d, width_mm * PT_PER_MM, 3);
        d.push(b' ');
        num(&mut d, height_mm * PT_PER_MM, 3);
        d.extend_from_slice(b"] /Resources ");
        uint(&mut d, u64::from(RESOURCES));
        d.extend_from_slice(b" 0 R /Contents ");
        if let [content] = contents {
            uint(&mut d, u64::from(*content));
            d.extend_from_slice(b" 0 R >>");
        } else {
            d.push(b'[');
            for (k, id) in contents.iter().enumerate() {
                if k > 0 {
                    d.push(if k % 16 == 0 { b'\n' } else { b' ' });
                }
                uint(&mut d, u64::from(*id));
                d.extend_from_slice(b" 0 R");
            }
            d.extend_from_slice(b"] >>");
        }
        self.object(page, &d)?;
        self.page_ids.push(page);
        Ok(())
    }

    /// Write the remaining pages, the font, page tree, catalogue, information dictionary,
    /// cross-reference table and trailer; gives back the output.
    pub fn finish(mut self) -> io::Result<W> {
        self.drain(0)?;
        self.pool = None;
        if self.open.is_some() {
            self.end_page()?;
        }

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

    #[test]
    fn pages_added_one_by_one_give_the_bytes_of_pages_added_together() {
        use crate::layout::sample::generated_section;
        use crate::layout::{pages, LayoutOptions, PrintMeta};
        let (s, i) = generated_section(400);
        let p = pages(&s, &i, &LayoutOptions::default(), &PrintMeta::default());
        assert!(p.len() > 4, "{} pages", p.len());
        let info = PdfInfo { title: "Σ test".into(), author: String::new(), creation_date: 0 };
        let together = write_pdf(&p, &info);
        // However few pages may wait (1: the writer waits for each page in turn), the pages
        // come out in order and the bytes are the same.
        for waiting in [1, 3, PAGES_PER_GROUP] {
            let mut w = PdfWriter::with_group_size(Vec::new(), &info, waiting).expect("memory");
            for page in p.iter().cloned() {
                w.add_page(page).expect("memory");
            }
            assert_eq!(w.page_count(), p.len());
            assert!(w.finish().expect("memory") == together, "{waiting} pages waiting");
        }
    }
    /// The decompressed content of stream object `id` in `pdf`.
    fn stream_of(pdf: &[u8], id: u32) -> Vec<u8> {
        use std::io::Read;
        let head = format!("\n{id} 0 obj\n");
        let at = pdf.windows(head.len()).position(|w| w == head.as_bytes()).expect("object") + head.len();
        let start = at + pdf[at..].windows(7).position(|w| w == b"stream\n").expect("stream") + 7;
        let end = start + pdf[start..].windows(10).position(|w| w == b"\nendstream").expect("end");
        let mut out = Vec::new();
        flate2::read::ZlibDecoder::new(&pdf[start..end]).read_to_end(&mut out).expect("inflates");
        out
    }

    /// The object numbers in the first page's `/Contents` (one number or an array).
    fn contents_of(pdf: &[u8]) -> Vec<u32> {
        let text = String::from_utf8_lossy(pdf);
        let after = text.split("/Contents ").nth(1).expect("a page");
        let list = after.strip_prefix('[').map_or(after, |a| a.split(']').next().unwrap_or(""));
        let list = list.split(">>").next().unwrap_or("");
        list.split(" 0 R").filter_map(|n| n.trim().parse().ok()).collect()
    }

    #[test]
    fn a_page_written_in_pieces_is_the_page_written_whole() {
        use crate::layout::sample::generated_section;
        use crate::layout::{pages, LayoutOptions, Paper, PrintMeta};
        // One tall page of 3,000 beds: about 2.5 MB of content, so several streams.
        let (s, i) = generated_section(3_000);
        let opts = LayoutOptions { paper: Paper::TallSingle, ..Default::default() };
        let page = pages(&s, &i, &opts, &PrintMeta::default()).remove(0);
        let info = PdfInfo::default();
        let whole = write_pdf(std::slice::from_ref(&page), &info);
        let mut w = PdfWriter::new(Vec::new(), &info).expect("memory");
        w.begin_page(page.width_mm, page.height_mm).expect("memory");
        for piece in page.items.chunks(997) {
            w.page_items(piece).expect("memory");
        }
        w.end_page().expect("memory");
        let pieces = w.finish().expect("memory");
        let (one, many) = (contents_of(&whole), contents_of(&pieces));
        assert_eq!(one.len(), 1);
        assert!(many.len() >= 3, "{} content streams, {} bytes", many.len(), stream_of(&whole, one[0]).len());
        // Read in order, as a reader joins a page's streams (ISO 32000-1 §7.7.3.3), the pieces
        // are the whole page's content, byte for byte.
        let joined: Vec<u8> = many.iter().flat_map(|id| stream_of(&pieces, *id)).collect();
        assert!(joined == stream_of(&whole, one[0]), "content differs");
        assert!(String::from_utf8_lossy(&pieces).contains("/Type /Pages /Count 1"));
    }
}
