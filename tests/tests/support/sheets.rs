//! Small workbooks written by the tests themselves (no spreadsheet program needed): a stored
//! (uncompressed) zip archive, and the fewest parts an `.xlsx` (ECMA-376) or `.ods`
//! (OpenDocument 1.2) reader needs for one sheet of inline strings and numbers.

#![allow(dead_code)]

/// A cell to write.
#[derive(Debug, Clone)]
pub enum V {
    N(f64),
    S(&'static str),
    Blank,
}

/// CRC-32 (IEEE 802.3 polynomial, as zip uses), bit by bit.
pub fn crc32(bytes: &[u8]) -> u32 {
    let mut crc = 0xFFFF_FFFFu32;
    for &b in bytes {
        crc ^= b as u32;
        for _ in 0..8 {
            crc = if crc & 1 == 1 { (crc >> 1) ^ 0xEDB8_8320 } else { crc >> 1 };
        }
    }
    !crc
}

/// A zip archive of members stored without compression (PKWARE APPNOTE 4.3: local headers,
/// then the central directory and its end record).
pub fn zip(members: &[(&str, Vec<u8>)]) -> Vec<u8> {
    zip_raw(members.iter().map(|(n, d)| (n.to_string(), d.clone(), 0u16, crc32(d), d.len() as u32)).collect())
}

/// A zip archive from prepared members: (name, data as stored, method 0 stored / 8 deflate,
/// CRC-32 and size of the unpacked data).
pub fn zip_raw(members: Vec<(String, Vec<u8>, u16, u32, u32)>) -> Vec<u8> {
    let mut out = Vec::new();
    let mut central = Vec::new();
    for (name, data, method, crc, unpacked) in &members {
        let offset = out.len() as u32;
        let header = |sig: u32, central_dir: bool| {
            let mut h = Vec::new();
            h.extend(sig.to_le_bytes());
            if central_dir {
                h.extend(20u16.to_le_bytes());
            }
            h.extend(20u16.to_le_bytes());
            h.extend(0u16.to_le_bytes());
            h.extend(method.to_le_bytes());
            h.extend(0u32.to_le_bytes());
            h.extend(crc.to_le_bytes());
            h.extend((data.len() as u32).to_le_bytes());
            h.extend(unpacked.to_le_bytes());
            h.extend((name.len() as u16).to_le_bytes());
            h.extend(0u16.to_le_bytes());
            if central_dir {
                // Comment length, disk number, internal and external attributes.
                h.extend([0u8; 6]);
                h.extend(0u32.to_le_bytes());
                h.extend(offset.to_le_bytes());
            }
            h.extend(name.as_bytes());
            h
        };
        out.extend(header(0x0403_4b50, false));
        out.extend(data);
        central.extend(header(0x0201_4b50, true));
    }
    let dir_offset = out.len() as u32;
    out.extend(&central);
    out.extend(0x0605_4b50u32.to_le_bytes());
    out.extend([0u8; 4]);
    out.extend((members.len() as u16).to_le_bytes());
    out.extend((members.len() as u16).to_le_bytes());
    out.extend((central.len() as u32).to_le_bytes());
    out.extend(dir_offset.to_le_bytes());
    out.extend(0u16.to_le_bytes());
    out
}

fn escape(s: &str) -> String {
    s.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;")
}

fn letters(col: usize) -> String {
    let mut n = col + 1;
    let mut out = Vec::new();
    while n > 0 {
        out.push(b'A' + ((n - 1) % 26) as u8);
        n = (n - 1) / 26;
    }
    out.reverse();
    String::from_utf8(out).unwrap_or_default()
}

const NS_MAIN: &str = "http://schemas.openxmlformats.org/spreadsheetml/2006/main";
const NS_REL: &str = "http://schemas.openxmlformats.org/officeDocument/2006/relationships";
const NS_PKG_REL: &str = "http://schemas.openxmlformats.org/package/2006/relationships";

/// The parts of an `.xlsx` workbook with one sheet: `rows` first, then `empty_rows` rows with no
/// cells, then `tail` (so a table can sit below a million empty rows).
pub fn xlsx_parts(
    sheet: &str,
    rows: &[Vec<V>],
    empty_rows: usize,
    tail: &[Vec<V>],
) -> Vec<(&'static str, Vec<u8>)> {
    let mut data = String::new();
    let mut r = 0usize;
    let row_xml = |r: usize, cells: &[V], data: &mut String| {
        data.push_str(&format!("<row r=\"{}\">", r + 1));
        for (c, v) in cells.iter().enumerate() {
            let at = format!("{}{}", letters(c), r + 1);
            match v {
                V::N(x) => data.push_str(&format!("<c r=\"{at}\"><v>{x}</v></c>")),
                V::S(s) => {
                    data.push_str(&format!("<c r=\"{at}\" t=\"inlineStr\"><is><t>{}</t></is></c>", escape(s)))
                }
                V::Blank => {}
            }
        }
        data.push_str("</row>");
    };
    for cells in rows {
        row_xml(r, cells, &mut data);
        r += 1;
    }
    for _ in 0..empty_rows {
        data.push_str(&format!("<row r=\"{}\"/>", r + 1));
        r += 1;
    }
    for cells in tail {
        row_xml(r, cells, &mut data);
        r += 1;
    }
    vec![
        (
            "[Content_Types].xml",
            ("<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"yes\"?>\
<Types xmlns=\"http://schemas.openxmlformats.org/package/2006/content-types\">\
<Default Extension=\"rels\" ContentType=\"application/vnd.openxmlformats-package.relationships+xml\"/>\
<Default Extension=\"xml\" ContentType=\"application/xml\"/>\
<Override PartName=\"/xl/workbook.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml\"/>\
<Override PartName=\"/xl/worksheets/sheet1.xml\" ContentType=\"application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml\"/>\
</Types>")
                .as_bytes()
                .to_vec(),
        ),
        (
            "_rels/.rels",
            format!(
                "<?xml version=\"1.0\" encoding=\"UTF-8\"?><Relationships xmlns=\"{NS_PKG_REL}\">\
<Relationship Id=\"rId1\" Type=\"{NS_REL}/officeDocument\" Target=\"xl/workbook.xml\"/></Relationships>"
            )
            .into_bytes(),
        ),
        (
            "xl/workbook.xml",
            format!(
                "<?xml version=\"1.0\" encoding=\"UTF-8\"?><workbook xmlns=\"{NS_MAIN}\" xmlns:r=\"{NS_REL}\">\
<sheets><sheet name=\"{}\" sheetId=\"1\" r:id=\"rId1\"/></sheets></workbook>",
                escape(sheet)
            )
            .into_bytes(),
        ),
        (
            "xl/_rels/workbook.xml.rels",
            format!(
                "<?xml version=\"1.0\" encoding=\"UTF-8\"?><Relationships xmlns=\"{NS_PKG_REL}\">\
<Relationship Id=\"rId1\" Type=\"{NS_REL}/worksheet\" Target=\"worksheets/sheet1.xml\"/></Relationships>"
            )
            .into_bytes(),
        ),
        (
            "xl/worksheets/sheet1.xml",
            format!("<?xml version=\"1.0\" encoding=\"UTF-8\"?><worksheet xmlns=\"{NS_MAIN}\"><sheetData>{data}</sheetData></worksheet>")
                .into_bytes(),
        ),
    ]
}

/// An `.xlsx` workbook with one sheet of these rows.
pub fn xlsx(sheet: &str, rows: &[Vec<V>]) -> Vec<u8> {
    zip(&xlsx_parts(sheet, rows, 0, &[]))
}

/// The `content.xml` of an `.ods` with one sheet; `repeated_empty_rows` rows (one element
/// repeated) follow the rows.
pub fn ods_content(sheet: &str, rows: &[Vec<V>], repeated_empty_rows: usize, tail: &[Vec<V>]) -> String {
    let row = |cells: &[V]| {
        let mut s = String::from("<table:table-row>");
        for v in cells {
            match v {
                V::N(x) => s.push_str(&format!(
                    "<table:table-cell office:value-type=\"float\" office:value=\"{x}\"><text:p>{x}</text:p></table:table-cell>"
                )),
                V::S(t) => s.push_str(&format!(
                    "<table:table-cell office:value-type=\"string\"><text:p>{}</text:p></table:table-cell>",
                    escape(t)
                )),
                V::Blank => s.push_str("<table:table-cell/>"),
            }
        }
        s.push_str("</table:table-row>");
        s
    };
    let mut body: String = rows.iter().map(|r| row(r)).collect();
    if repeated_empty_rows > 0 {
        body.push_str(&format!(
            "<table:table-row table:number-rows-repeated=\"{repeated_empty_rows}\"><table:table-cell table:number-columns-repeated=\"1024\"/></table:table-row>"
        ));
    }
    body.extend(tail.iter().map(|r| row(r)));
    format!(
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\
<office:document-content xmlns:office=\"urn:oasis:names:tc:opendocument:xmlns:office:1.0\" \
xmlns:table=\"urn:oasis:names:tc:opendocument:xmlns:table:1.0\" \
xmlns:text=\"urn:oasis:names:tc:opendocument:xmlns:text:1.0\" office:version=\"1.2\">\
<office:body><office:spreadsheet><table:table table:name=\"{}\">{body}</table:table>\
</office:spreadsheet></office:body></office:document-content>",
        escape(sheet)
    )
}

/// An `.ods` workbook from its `content.xml`.
pub fn ods_from_content(content: String) -> Vec<u8> {
    zip(&[
        ("mimetype", b"application/vnd.oasis.opendocument.spreadsheet".to_vec()),
        (
            "META-INF/manifest.xml",
            b"<?xml version=\"1.0\" encoding=\"UTF-8\"?><manifest:manifest xmlns:manifest=\"urn:oasis:names:tc:opendocument:xmlns:manifest:1.0\" manifest:version=\"1.2\">\
<manifest:file-entry manifest:full-path=\"/\" manifest:media-type=\"application/vnd.oasis.opendocument.spreadsheet\"/>\
<manifest:file-entry manifest:full-path=\"content.xml\" manifest:media-type=\"text/xml\"/></manifest:manifest>"
                .to_vec(),
        ),
        ("content.xml", content.into_bytes()),
    ])
}

/// An `.ods` workbook with one sheet of these rows.
pub fn ods(sheet: &str, rows: &[Vec<V>]) -> Vec<u8> {
    ods_from_content(ods_content(sheet, rows, 0, &[]))
}
