//! PDF stream objects (ISO 32000-1 §7.3.8): data deflated at zlib's fast level when that makes
//! it smaller, with the dictionary that says so.

use super::pdf_content::uint;

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

#[cfg(test)]
mod tests {
    use super::*;
    use std::io::Read;

    #[test]
    fn streams_inflate_back_or_are_stored() {
        let mut z = Deflater::new();
        let text = b"0 0 25.4 25.4 re\nf\n".repeat(200);
        let mut obj = Vec::new();
        stream_into(&mut obj, b"", &text, &mut z);
        let head_end = obj.windows(7).position(|w| w == b"stream\n").expect("stream keyword") + 7;
        let head = String::from_utf8_lossy(&obj[..head_end]).into_owned();
        assert!(head.contains("/Filter /FlateDecode"), "{head}");
        let body = &obj[head_end..obj.len() - b"\nendstream".len()];
        assert!(head.contains(&format!("/Length {} ", body.len())), "{head}");
        // zlib (RFC 1950) read back by flate2's decoder gives the content exactly.
        let mut back = Vec::new();
        flate2::read::ZlibDecoder::new(body).read_to_end(&mut back).expect("inflates");
        assert_eq!(back, text);
        // The same compressor, reused: three bytes do not shrink, so they are stored.
        let mut short = Vec::new();
        stream_into(&mut short, b"", b"abc", &mut z);
        assert_eq!(short, b"<< /Length 3 >>\nstream\nabc\nendstream");
    }
}
