//! Measured curves attached to a section: values logged along it (e.g. an outcrop gamma-ray
//! profile from a hand-held spectrometer, read from a LAS 2.0 file), already placed on heights.

use serde::{Deserialize, Serialize};

/// How a log's index relates to the section's heights.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum IndexDirection {
    /// The index is depth, increasing downward: height = offset − depth.
    DepthBelowDatum,
    /// The index is already height, increasing upward: height = index − offset.
    HeightAboveDatum,
}

impl IndexDirection {
    /// Height above the section base (m) of an index value (m), given the index value of the base.
    pub fn height_m(self, index_m: f64, offset_m: f64) -> f64 {
        match self {
            IndexDirection::DepthBelowDatum => offset_m - index_m,
            IndexDirection::HeightAboveDatum => index_m - offset_m,
        }
    }

    /// Words for the user ("depth, increasing downward").
    pub fn describe(self) -> &'static str {
        match self {
            IndexDirection::DepthBelowDatum => "depth, increasing downward",
            IndexDirection::HeightAboveDatum => "height, increasing upward",
        }
    }
}

/// One measured curve kept with a section. Samples are stored on section heights so the column
/// can draw them without the source file; the placement used is kept for the record.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MeasuredCurve {
    /// The curve's mnemonic in its source (GR, K, TH …); unique within a section (ignoring case).
    pub mnemonic: String,
    /// Unit of the values as written in the source (API, %, ppm …).
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub unit: String,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub description: String,
    /// Name of the file the curve was read from (for the record; not read again).
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub source_file: String,
    /// The log's index value (m) that lies at the section's base (height 0).
    pub offset_m: f64,
    /// Whether the log's index ran down (depth) or up (height).
    pub direction: IndexDirection,
    /// (height above the section base in m, value), lowest first; `None` (JSON null) where the
    /// source held its NULL value, which leaves a gap in the drawn curve.
    pub samples: Vec<(f64, Option<f64>)>,
}

impl MeasuredCurve {
    /// "GR (API)", or the mnemonic alone when there is no unit.
    pub fn title(&self) -> String {
        if self.unit.trim().is_empty() {
            self.mnemonic.clone()
        } else {
            format!("{} ({})", self.mnemonic, self.unit)
        }
    }

    /// Smallest and largest finite value among samples whose height lies in [lo_m, hi_m].
    pub fn value_range_in(&self, lo_m: f64, hi_m: f64) -> Option<(f64, f64)> {
        self.samples
            .iter()
            .filter(|(h, _)| *h >= lo_m && *h <= hi_m)
            .filter_map(|(_, v)| v.filter(|v| v.is_finite()))
            .fold(None, |acc, v| match acc {
                None => Some((v, v)),
                Some((a, b)) => Some((v.min(a), v.max(b))),
            })
    }

    /// Lowest and highest sample height, m.
    pub fn height_range_m(&self) -> Option<(f64, f64)> {
        Some((self.samples.first()?.0, self.samples.last()?.0))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn curve() -> MeasuredCurve {
        MeasuredCurve {
            mnemonic: "GR".into(),
            unit: "API".into(),
            description: String::new(),
            source_file: "x.las".into(),
            offset_m: 10.0,
            direction: IndexDirection::DepthBelowDatum,
            samples: vec![(0.0, Some(80.0)), (0.5, None), (1.0, Some(45.0)), (1.5, Some(120.0))],
        }
    }

    #[test]
    fn placement_both_ways() {
        // Depth 2 m below a datum whose base lies at depth 10 m is 8 m above the base.
        assert_eq!(IndexDirection::DepthBelowDatum.height_m(2.0, 10.0), 8.0);
        assert_eq!(IndexDirection::HeightAboveDatum.height_m(12.0, 10.0), 2.0);
    }

    #[test]
    fn ranges_skip_nulls_and_respect_heights() {
        let c = curve();
        assert_eq!(c.value_range_in(0.0, 10.0), Some((45.0, 120.0)));
        assert_eq!(c.value_range_in(0.0, 1.0), Some((45.0, 80.0)));
        assert_eq!(c.value_range_in(0.4, 0.6), None, "only a NULL there");
        assert_eq!(c.height_range_m(), Some((0.0, 1.5)));
        assert_eq!(c.title(), "GR (API)");
    }

    #[test]
    fn json_keeps_nulls_as_null() {
        let text = serde_json::to_string(&curve()).expect("encode");
        assert!(text.contains("[0.5,null]"), "{text}");
        assert!(text.contains("\"direction\":\"depth_below_datum\""), "{text}");
        let back: MeasuredCurve = serde_json::from_str(&text).expect("decode");
        assert_eq!(back, curve());
    }
}
