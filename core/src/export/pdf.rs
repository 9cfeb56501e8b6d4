//! PDF writer: translates layout pages item by item into PDF operations (printpdf), with the
//! DejaVu Sans font embedded so text is the same everywhere and selectable.
//!
//! No drawing decision lives here: positions, sizes, colours and dashes come from the items.
//! Only the coordinate flip (mm, y down → pt, y up) and text anchoring happen here.

use crate::layout::{text_width_mm, DEJAVU_SANS};
use crate::layout::{Anchor, Item, Page, PtMm, RectMm, Rgba, Stroke};
use printpdf::{
    Color, FontId, Line, LineDashPattern, LinePoint, Mm, Op, PaintMode, ParsedFont, PdfDocument, PdfFont,
    PdfFontHandle, PdfPage, PdfSaveOptions, Point, Polygon, PolygonRing, Pt, Rect, Rgb, TextItem, TextMatrix,
    WindingOrder,
};

/// Document facts written into the PDF's information dictionary.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PdfInfo {
    pub title: String,
    pub author: String,
    /// Creation (and modification) date, seconds since 1970-01-01 00:00 UTC. Passed in so that
    /// the same input gives the same bytes (tests fix it; the CLI reads `SOURCE_DATE_EPOCH`).
    pub creation_date: i64,
}

/// PostScript points per millimetre.
const PT_PER_MM: f64 = 72.0 / 25.4;

/// Bezier handle length for a quarter circle (4/3·(√2 − 1)).
const KAPPA: f64 = 0.552_284_749_830_793_4;

/// Resource name of the embedded font (fixed, so output is reproducible).
const FONT_RESOURCE: &str = "F1";

/// Translates one page's items into operations, tracking graphics state to skip repeats.
struct PageWriter {
    height_mm: f64,
    ops: Vec<Op>,
    fill: Option<Rgba>,
    stroke_color: Option<Rgba>,
    width_mm: Option<f64>,
    dash: Option<Vec<f64>>,
    font: PdfFontHandle,
}

fn color(c: Rgba) -> Color {
    Color::Rgb(Rgb {
        r: f32::from(c.0) / 255.0,
        g: f32::from(c.1) / 255.0,
        b: f32::from(c.2) / 255.0,
        icc_profile: None,
    })
}

fn pt(v_mm: f64) -> Pt {
    Pt((v_mm * PT_PER_MM) as f32)
}

/// A paint is drawn unless it is fully transparent (partial alpha is printed opaque).
fn visible(c: &Rgba) -> bool {
    c.3 > 0
}

impl PageWriter {
    fn point(&self, p: PtMm) -> Point {
        Point { x: pt(p.x), y: pt(self.height_mm - p.y) }
    }

    fn lp(&self, p: PtMm, bezier: bool) -> LinePoint {
        LinePoint { p: self.point(p), bezier }
    }

    fn set_fill(&mut self, c: Rgba) {
        if self.fill != Some(c) {
            self.ops.push(Op::SetFillColor { col: color(c) });
            self.fill = Some(c);
        }
    }

    fn set_stroke(&mut self, s: &Stroke) {
        if self.stroke_color != Some(s.color) {
            self.ops.push(Op::SetOutlineColor { col: color(s.color) });
            self.stroke_color = Some(s.color);
        }
        if self.width_mm != Some(s.width_mm) {
            self.ops.push(Op::SetOutlineThickness { pt: pt(s.width_mm.max(0.0)) });
            self.width_mm = Some(s.width_mm);
        }
        if self.dash.as_ref() != Some(&s.dash_mm) {
            let pattern: Vec<f32> = s.dash_mm.iter().map(|d| (d.max(0.0) * PT_PER_MM) as f32).collect();
            let dash = if pattern.iter().any(|d| *d > 0.0) {
                LineDashPattern::new(0.0, &pattern)
            } else {
                LineDashPattern::solid()
            };
            self.ops.push(Op::SetLineDashPattern { dash });
            self.dash = Some(s.dash_mm.clone());
        }
    }

    /// Set state for a fill/stroke pair; returns the paint mode, or `None` if nothing shows.
    fn paint(&mut self, fill: &Option<Rgba>, stroke: &Option<Stroke>) -> Option<PaintMode> {
        let fill = fill.filter(visible);
        let stroke = stroke.as_ref().filter(|s| visible(&s.color) && s.width_mm > 0.0);
        if let Some(c) = fill {
            self.set_fill(c);
        }
        if let Some(s) = stroke {
            self.set_stroke(s);
        }
        match (fill.is_some(), stroke.is_some()) {
            (true, true) => Some(PaintMode::FillStroke),
            (true, false) => Some(PaintMode::Fill),
            (false, true) => Some(PaintMode::Stroke),
            (false, false) => None,
        }
    }

    fn polygon(&mut self, points: Vec<LinePoint>, mode: PaintMode) {
        self.ops.push(Op::DrawPolygon {
            polygon: Polygon {
                rings: vec![PolygonRing { points }],
                mode,
                winding_order: WindingOrder::NonZero,
            },
        });
    }

    fn item(&mut self, item: &Item) {
        match item {
            Item::Rect { rect, fill, stroke } => {
                let Some(mode) = self.paint(fill, stroke) else { return };
                let RectMm { x, y, w, h } = *rect;
                self.ops.push(Op::DrawRectangle {
                    rectangle: Rect {
                        x: pt(x),
                        y: pt(self.height_mm - y - h),
                        width: pt(w),
                        height: pt(h),
                        mode: Some(mode),
                        winding_order: Some(WindingOrder::NonZero),
                    },
                });
            }
            Item::Polygon { points, fill, stroke } => {
                if points.len() < 2 {
                    return;
                }
                let Some(mode) = self.paint(fill, stroke) else { return };
                let pts = points.iter().map(|p| self.lp(*p, false)).collect();
                self.polygon(pts, mode);
            }
            Item::Polyline { points, stroke } => {
                if points.len() < 2 || !visible(&stroke.color) || stroke.width_mm <= 0.0 {
                    return;
                }
                self.set_stroke(stroke);
                let pts = points.iter().map(|p| self.lp(*p, false)).collect();
                self.ops.push(Op::DrawLine { line: Line { points: pts, is_closed: false } });
            }
            Item::Circle { center, radius_mm, fill, stroke } => {
                let r = *radius_mm;
                if r.is_nan() || r <= 0.0 {
                    return;
                }
                let Some(mode) = self.paint(fill, stroke) else { return };
                let (cx, cy, k) = (center.x, center.y, r * KAPPA);
                let p = |x: f64, y: f64| PtMm { x: cx + x, y: cy + y };
                // Four cubic arcs: end points normal, the two handles of each arc marked bezier.
                let seq = [
                    (p(r, 0.0), false),
                    (p(r, k), true),
                    (p(k, r), true),
                    (p(0.0, r), false),
                    (p(-k, r), true),
                    (p(-r, k), true),
                    (p(-r, 0.0), false),
                    (p(-r, -k), true),
                    (p(-k, -r), true),
                    (p(0.0, -r), false),
                    (p(k, -r), true),
                    (p(r, -k), true),
                    (p(r, 0.0), false),
                ];
                let pts = seq.iter().map(|(q, b)| self.lp(*q, *b)).collect();
                self.polygon(pts, mode);
            }
            Item::Text { pos, text, size_pt, color: c, anchor, rotation_deg } => {
                if text.is_empty() || !visible(c) || size_pt.is_nan() || *size_pt <= 0.0 {
                    return;
                }
                let w = text_width_mm(text, *size_pt);
                let shift = match anchor {
                    Anchor::Start => 0.0,
                    Anchor::Middle => -w / 2.0,
                    Anchor::End => -w,
                };
                let a = rotation_deg.to_radians();
                let (cos, sin) = (a.cos(), a.sin());
                // Anchor shift runs along the baseline, which points (cos, −sin) on a y-down page.
                let start = PtMm { x: pos.x + shift * cos, y: pos.y - shift * sin };
                let at = self.point(start);
                self.set_fill(*c);
                self.ops.push(Op::StartTextSection);
                self.ops.push(Op::SetFont { font: self.font.clone(), size: Pt(*size_pt as f32) });
                self.ops.push(Op::SetTextMatrix {
                    matrix: TextMatrix::Raw([
                        cos as f32,
                        sin as f32,
                        -sin as f32,
                        cos as f32,
                        at.x.0,
                        at.y.0,
                    ]),
                });
                self.ops.push(Op::ShowText { items: vec![TextItem::Text(text.clone())] });
                self.ops.push(Op::EndTextSection);
            }
        }
    }
}

/// The embedded font, parsed once per export (each group of pages gets a copy).
fn parsed_font() -> Option<ParsedFont> {
    let mut warnings = Vec::new();
    ParsedFont::from_bytes(DEJAVU_SANS, 0, &mut warnings)
}

/// The printpdf document of the pages: info, the embedded font and each page's operations.
fn document(pages: &[Page], info: &PdfInfo, font: &Option<ParsedFont>) -> PdfDocument {
    let mut doc = PdfDocument::new(&info.title);
    let date = printpdf::OffsetDateTime::from_unix_timestamp(info.creation_date)
        .or_else(|_| printpdf::OffsetDateTime::from_unix_timestamp(0));
    if let Ok(date) = date {
        doc.metadata.info.creation_date = date;
        doc.metadata.info.modification_date = date;
        doc.metadata.info.metadata_date = date;
    }
    doc.metadata.info.author = info.author.clone();
    doc.metadata.info.creator = "Aggrade".to_string();
    doc.metadata.info.producer = "Aggrade".to_string();
    let font_id = FontId(FONT_RESOURCE.to_string());
    let font = match font {
        Some(parsed) => {
            doc.resources.fonts.map.insert(font_id.clone(), PdfFont::new(parsed.clone()));
            PdfFontHandle::External(font_id)
        }
        // The font is compiled in; if it ever failed to parse, fall back to a standard font
        // rather than failing the export.
        None => PdfFontHandle::Builtin(printpdf::BuiltinFont::Helvetica),
    };
    let pdf_pages = pages
        .iter()
        .map(|page| {
            let mut w = PageWriter {
                height_mm: page.height_mm,
                ops: Vec::with_capacity(page.items.len() * 2),
                fill: None,
                stroke_color: None,
                width_mm: None,
                dash: None,
                font: font.clone(),
            };
            for item in &page.items {
                w.item(item);
            }
            PdfPage::new(Mm(page.width_mm as f32), Mm(page.height_mm as f32), w.ops)
        })
        .collect();
    doc.with_pages(pdf_pages);
    doc
}

/// Pages translated together by [`write_pdf`]. Each group goes through printpdf, becomes PDF
/// objects and is compressed before the next group is started, so a long section never holds
/// every page's operations and uncompressed content at once (that took about 30 KB per bed: 2.9 GB
/// for a 100,000-bed export). Each group embeds the subset of the font its own pages use, so
/// smaller groups cost file size (about 1.8 % at 64 pages, 7 % at 16) and time.
pub const PAGES_PER_GROUP: usize = 64;

/// Write pages to a PDF file's bytes. Same pages and info give the same bytes.
pub fn write_pdf(pages: &[Page], info: &PdfInfo) -> Vec<u8> {
    write_pdf_in_groups(pages, info, PAGES_PER_GROUP)
}

/// [`write_pdf`] with a chosen number of pages per group (at least 1).
pub fn write_pdf_in_groups(pages: &[Page], info: &PdfInfo, pages_per_group: usize) -> Vec<u8> {
    let mut groups = pages.chunks(pages_per_group.max(1));
    let font = parsed_font();
    let mut lo = group_document(groups.next().unwrap_or(&[]), info, &font);
    for group in groups {
        append_pages(&mut lo, group_document(group, info, &font));
    }
    let mut bytes = Vec::new();
    if lo.save_to(&mut bytes).is_err() {
        // Writing to memory cannot fail short of allocation failure; fall back to printpdf's
        // own serialiser.
        let mut warnings = Vec::new();
        return document(pages, info, &font).save(&PdfSaveOptions::default(), &mut warnings);
    }
    bytes
}

/// One group of pages as a compressed lopdf document.
fn group_document(pages: &[Page], info: &PdfInfo, font: &Option<ParsedFont>) -> lopdf::Document {
    let doc = document(pages, info, font);
    let mut warnings = Vec::new();
    let mut lo = doc.to_lopdf_document(&PdfSaveOptions::default(), &mut warnings);
    // The operations are in the content streams now: free them before compressing.
    drop(doc);
    // printpdf fills the trailer ID from a process-wide counter; drop it (it is optional for
    // unencrypted files) so that the same input gives the same bytes.
    lo.trailer.remove(b"ID");
    compress_streams(&mut lo);
    lo
}

/// Deflate every stream, spread over the available cores, at zlib's fast level: lopdf's own
/// `compress` uses the slowest level, which dominated the time for long sections (about 2.5 s of
/// 3.4 s for 10,000 beds) for a few per cent smaller files. Each stream's bytes are the same as
/// compressing in sequence.
fn compress_streams(lo: &mut lopdf::Document) {
    let mut streams: Vec<_> = lo
        .objects
        .values_mut()
        .filter_map(|o| o.as_stream_mut().ok())
        .filter(|s| s.allows_compression)
        .collect();
    let threads = std::thread::available_parallelism().map(|n| n.get()).unwrap_or(1).clamp(1, 8);
    let per = streams.len().div_ceil(threads).max(1);
    std::thread::scope(|scope| {
        for chunk in streams.chunks_mut(per) {
            scope.spawn(move || {
                for stream in chunk.iter_mut() {
                    deflate_fast(stream);
                }
            });
        }
    });
}

/// Move the pages of `part` (with everything they refer to) to the end of `doc`'s page tree.
fn append_pages(doc: &mut lopdf::Document, mut part: lopdf::Document) {
    use lopdf::Object;
    let Ok(tree) = doc.catalog().and_then(|c| c.get(b"Pages")).and_then(Object::as_reference) else {
        return;
    };
    part.renumber_objects_with(doc.max_id + 1);
    let added: Vec<lopdf::ObjectId> = part.get_pages().into_values().collect();
    // The part's own catalogue, page tree, metadata and information dictionary are not carried
    // over: its pages join `doc`'s tree (their numbers stay unused: free entries in the xref).
    let catalog = part.trailer.get(b"Root").and_then(Object::as_reference).ok();
    let info = part.trailer.get(b"Info").and_then(Object::as_reference).ok();
    let from_catalog = |key: &[u8]| {
        catalog
            .and_then(|c| part.get_dictionary(c).ok())
            .and_then(|c| c.get(key).and_then(Object::as_reference).ok())
    };
    let (tree_of_part, metadata) = (from_catalog(b"Pages"), from_catalog(b"Metadata"));
    for id in [catalog, info, tree_of_part, metadata].into_iter().flatten() {
        part.objects.remove(&id);
    }
    for id in &added {
        if let Ok(page) = part.get_object_mut(*id).and_then(Object::as_dict_mut) {
            page.set("Parent", tree);
        }
    }
    doc.max_id = doc.max_id.max(part.max_id);
    // One by one: the new numbers all sort after the old ones (`append` would rebuild the whole map).
    doc.objects.extend(std::mem::take(&mut part.objects));
    if let Ok(node) = doc.get_object_mut(tree).and_then(Object::as_dict_mut) {
        let mut kids = node.get(b"Kids").and_then(Object::as_array).cloned().unwrap_or_default();
        kids.extend(added.into_iter().map(Object::Reference));
        node.set("Count", kids.len() as i64);
        node.set("Kids", kids);
    }
}

/// Deflate one stream's content at zlib's fast level and mark it FlateDecode. A stream that
/// already has a filter, or that would not shrink, or that fails to deflate is left as it is
/// (still a valid PDF).
fn deflate_fast(stream: &mut lopdf::Stream) {
    use std::io::Write;
    if stream.dict.get(b"Filter").is_ok() {
        return;
    }
    let mut encoder = flate2::write::ZlibEncoder::new(Vec::new(), flate2::Compression::fast());
    if encoder.write_all(&stream.content).is_err() {
        return;
    }
    if let Ok(compressed) = encoder.finish() {
        if compressed.len() + 19 < stream.content.len() {
            stream.dict.set("Filter", "FlateDecode");
            stream.set_content(compressed);
        }
    }
}
