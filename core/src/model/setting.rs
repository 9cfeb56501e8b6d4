//! Where and how a section was measured: the measuring method and uncertainty, the bedding
//! attitude and GPS fixes along the traverse.

use super::vocab::FixRole;
use serde::{Deserialize, Serialize};

/// The attitude of bedding at the section, as dip and dip direction (degrees). Strike and dip
/// after the right-hand rule convert with [`BeddingAttitude::from_strike_rhr`].
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct BeddingAttitude {
    /// Dip, 0–90°.
    pub dip_deg: f64,
    /// Dip direction, 0–360° clockwise from north.
    pub dip_direction_deg: f64,
}

impl BeddingAttitude {
    /// From a strike written by the right-hand rule (the bed dips to the right of the strike
    /// direction, so dip direction = strike + 90°; common practice in North American field work).
    pub fn from_strike_rhr(strike_deg: f64, dip_deg: f64) -> Self {
        BeddingAttitude { dip_deg, dip_direction_deg: (strike_deg + 90.0).rem_euclid(360.0) }
    }

    /// The right-hand-rule strike, degrees.
    pub fn strike_rhr_deg(&self) -> f64 {
        (self.dip_direction_deg - 90.0).rem_euclid(360.0)
    }
}

/// The line along which thicknesses were measured when they were measured along the ground
/// (tape or rangefinder), for the apparent-to-true thickness correction.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Traverse {
    /// Direction walked up-section, degrees clockwise from north.
    pub bearing_deg: f64,
    /// Slope of the ground along the traverse, degrees; positive uphill in the direction walked.
    pub slope_deg: f64,
}

/// A GPS fix on the traverse.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct GpsFix {
    pub role: FixRole,
    /// Height in the section where it was taken, metres above the base.
    pub height_m: f64,
    pub lat_deg: f64,
    pub lon_deg: f64,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub elevation_m: Option<f64>,
    #[serde(default, skip_serializing_if = "String::is_empty")]
    pub note: String,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn right_hand_rule_strike_turns_into_dip_direction() {
        // Right-hand rule: dip direction is 90° clockwise from strike (common practice).
        let a = BeddingAttitude::from_strike_rhr(300.0, 20.0);
        assert_eq!(a.dip_direction_deg, 30.0);
        assert_eq!(a.strike_rhr_deg(), 300.0);
        assert_eq!(BeddingAttitude::from_strike_rhr(0.0, 5.0).dip_direction_deg, 90.0);
    }
}
