//! Closed vocabularies of the log: sedimentary structures, basal contacts, paleosol development
//! and features, and length units (with lengths written in a display unit).

use super::grain::normalise_term;
use serde::{Deserialize, Serialize};
use std::fmt;

macro_rules! vocabulary {
    ($(#[$meta:meta])* $name:ident { $($(#[$vmeta:meta])* $variant:ident => $text:literal),+ $(,)? }) => {
        $(#[$meta])*
        #[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
        #[serde(rename_all = "snake_case")]
        pub enum $name { $($(#[$vmeta])* $variant),+ }

        impl $name {
            /// Every term of the vocabulary.
            pub const ALL: &'static [$name] = &[$($name::$variant),+];

            /// The term as shown to the user.
            pub fn name(self) -> &'static str {
                match self { $($name::$variant => $text),+ }
            }

            /// Case-insensitive parse; spaces, hyphens and underscores are interchangeable.
            pub fn parse(text: &str) -> Option<Self> {
                let norm = normalise_term(text);
                // Terms are lower-case words joined by single spaces or hyphens: compare without
                // allocating (the same result as normalising both sides).
                Self::ALL.iter().copied().find(|v| {
                    v.name().bytes().map(|b| if b == b' ' || b == b'-' { b'_' } else { b }).eq(norm.bytes())
                })
            }

            /// All terms joined for "valid values are …" messages.
            pub fn valid_list() -> String {
                Self::ALL.iter().map(|v| v.name()).collect::<Vec<_>>().join(", ")
            }
        }

        impl fmt::Display for $name {
            fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result { f.write_str(self.name()) }
        }
    };
}

vocabulary! {
    /// Sedimentary structures seen in a bed.
    Structure {
        TroughCrossBedding => "trough cross-bedding",
        PlanarCrossBedding => "planar cross-bedding",
        RippleCrossLamination => "ripple cross-lamination",
        HorizontalLamination => "horizontal lamination",
        Massive => "massive",
        LateralAccretion => "lateral accretion",
        DownstreamAccretion => "downstream accretion",
        Imbrication => "imbrication",
        MudClasts => "mud clasts",
        BasalLag => "basal lag",
        RootTraces => "root traces",
        Slickensides => "slickensides",
        CarbonateNodules => "carbonate nodules",
        Mottling => "mottling",
        DesiccationCracks => "desiccation cracks",
        Bioturbation => "bioturbation",
        SoftSedimentDeformation => "soft-sediment deformation",
    }
}

vocabulary! {
    /// Nature of a bed's basal contact.
    Contact {
        Sharp => "sharp",
        Erosional => "erosional",
        Gradational => "gradational",
    }
}

vocabulary! {
    /// Paleosol degree of development (after Retallack's scale).
    PaleosolDevelopment {
        None => "none",
        Weak => "weak",
        Moderate => "moderate",
        Strong => "strong",
        VeryStrong => "very strong",
    }
}

vocabulary! {
    /// Features that mark a fossil soil.
    PaleosolFeature {
        RootTraces => "root traces",
        Slickensides => "slickensides",
        CarbonateNodules => "carbonate nodules",
        Mottling => "mottling",
        ClayCoatings => "clay coatings",
        Rhizoliths => "rhizoliths",
        Gleying => "gleying",
    }
}

vocabulary! {
    /// The geologist's rank for a bed's base in the bounding-surface hierarchy (after Miall
    /// 1985, 1996): where given, it overrides the rules' own reading of that base.
    BaseRank {
        /// A storey (channel-fill) surface: a new storey starts here.
        StoreySurface => "storey surface",
        /// The base of a channel body: a new storey and a new body start here.
        BodyBase => "body base",
        /// A scour or set boundary inside a storey: no new storey here.
        WithinStorey => "within storey",
    }
}

vocabulary! {
    /// What kind of surface a named surface is.
    SurfaceKind {
        Incision => "incision surface",
        PaleosolTop => "paleosol top",
        Other => "other",
    }
}

vocabulary! {
    /// Units a thickness may be entered in.
    LengthUnit {
        Metre => "m",
        Centimetre => "cm",
        Foot => "ft",
    }
}

vocabulary! {
    /// What a paleocurrent reading was measured on. The stored azimuth is the direction as
    /// measured: the plunge direction of a trough axis, the dip direction of a foreset, a ripple's
    /// lee face or an accretion surface, the dip direction of imbricated clasts (upstream), the
    /// trend of a lineation or groove (two-way). See `docs/field-record.md`.
    Indicator {
        /// A flow direction whose indicator was not written down (all version-1 readings).
        Unspecified => "unspecified",
        TroughAxis => "trough axis",
        PlanarForeset => "planar foreset",
        Ripple => "ripple",
        Imbrication => "imbrication",
        PartingLineation => "parting lineation",
        FluteCast => "flute cast",
        GrooveCast => "groove cast",
        /// The dip direction of lateral-accretion surfaces: roughly across the flow, never pooled
        /// with flow indicators (Miall 1974).
        AccretionSurface => "accretion surface",
    }
}

vocabulary! {
    /// What a sample was taken for.
    SampleKind {
        HandSpecimen => "hand specimen",
        ThinSection => "thin section",
        Palynology => "palynology",
        DetritalZircon => "detrital zircon",
        Geochemistry => "geochemistry",
        GrainSizeAnalysis => "grain size analysis",
        Paleomagnetism => "paleomagnetism",
        Radiocarbon => "radiocarbon",
        Luminescence => "luminescence",
        Other => "other",
    }
}

vocabulary! {
    /// Soil drainage class (Soil Survey Staff, Soil Survey Manual), read from a paleosol's
    /// colours and features.
    Drainage {
        WellDrained => "well drained",
        ModeratelyWellDrained => "moderately well drained",
        SomewhatPoorlyDrained => "somewhat poorly drained",
        PoorlyDrained => "poorly drained",
        VeryPoorlyDrained => "very poorly drained",
    }
}

vocabulary! {
    /// How the section's thicknesses were measured.
    MeasuringMethod {
        JacobsStaff => "jacob's staff",
        Tape => "tape",
        LaserRangefinder => "laser rangefinder",
        Other => "other",
    }
}

vocabulary! {
    /// Where along the traverse a GPS fix was taken.
    FixRole {
        Base => "base",
        Top => "top",
        /// The foot of an offset of a composite traverse (the section moves along a marker bed).
        Offset => "offset",
    }
}

impl Drainage {
    /// True for somewhat poorly drained and wetter.
    pub fn is_poor(self) -> bool {
        self >= Drainage::SomewhatPoorlyDrained
    }
}

impl Indicator {
    /// True for indicators of flow direction (everything but accretion-surface dips).
    pub fn is_flow(self) -> bool {
        self != Indicator::AccretionSurface
    }
}

#[allow(clippy::derivable_impls)]
impl Default for Indicator {
    fn default() -> Self {
        Indicator::Unspecified
    }
}

#[allow(clippy::derivable_impls)]
impl Default for Contact {
    fn default() -> Self {
        Contact::Sharp
    }
}

#[allow(clippy::derivable_impls)]
impl Default for PaleosolDevelopment {
    fn default() -> Self {
        PaleosolDevelopment::None
    }
}

impl PaleosolDevelopment {
    /// True for strong and very strong: a long time without deposition at that spot.
    pub fn is_strong(self) -> bool {
        self >= PaleosolDevelopment::Strong
    }
}

/// Metres in one international foot (1959 agreement; exactly 0.3048 m).
pub const METRES_PER_FOOT: f64 = 0.3048;

impl LengthUnit {
    /// Metres in one of this unit.
    pub fn metres(self) -> f64 {
        match self {
            LengthUnit::Metre => 1.0,
            LengthUnit::Centimetre => 0.01,
            LengthUnit::Foot => METRES_PER_FOOT,
        }
    }

    /// Convert a length in this unit to metres.
    pub fn to_metres(self, value: f64) -> f64 {
        value * self.metres()
    }

    /// Convert a length in metres to this unit.
    pub fn from_metres(self, metres: f64) -> f64 {
        metres / self.metres()
    }

    /// A length held in metres, to be written in this unit: `format!("{}", ft.length(3.048))`
    /// gives "10.00 ft" (two decimals unless the format asks for another precision).
    pub fn length(self, metres: f64) -> Length {
        Length { metres, unit: self }
    }
}

/// A length held in metres and written in a display unit with the unit's symbol ("10.00 ft");
/// see [`LengthUnit::length`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Length {
    pub metres: f64,
    pub unit: LengthUnit,
}

impl Length {
    /// The number alone in the display unit, to at most two decimals without trailing zeros
    /// ("10", "32.81").
    pub fn number_trimmed(self) -> String {
        let s = format!("{:.2}", self.unit.from_metres(self.metres));
        if s.contains('.') {
            s.trim_end_matches('0').trim_end_matches('.').to_string()
        } else {
            s
        }
    }
}

impl fmt::Display for Length {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let digits = f.precision().unwrap_or(2);
        write!(f, "{:.*} {}", digits, self.unit.from_metres(self.metres), self.unit.name())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_term_parses_in_any_spelling() {
        for s in Structure::ALL {
            assert_eq!(Structure::parse(s.name()), Some(*s));
            assert_eq!(Structure::parse(&s.name().to_uppercase().replace(' ', "_")), Some(*s));
            assert_eq!(Structure::parse(&format!("  {}  ", s.name().replace('-', " "))), Some(*s));
        }
        for k in SurfaceKind::ALL {
            assert_eq!(SurfaceKind::parse(&k.name().replace(' ', "-")), Some(*k));
        }
        assert_eq!(PaleosolDevelopment::parse("Very_Strong"), Some(PaleosolDevelopment::VeryStrong));
        assert_eq!(Structure::parse("trough"), None);
        assert_eq!(Contact::parse(""), None);
    }

    #[test]
    fn a_length_is_written_in_its_display_unit() {
        // 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
        assert_eq!(LengthUnit::Foot.length(3.048).to_string(), "10.00 ft");
        assert_eq!(LengthUnit::Metre.length(3.048).to_string(), "3.05 m");
        assert_eq!(format!("{:.1}", LengthUnit::Centimetre.length(0.25)), "25.0 cm");
        assert_eq!(LengthUnit::Metre.length(10.0).number_trimmed(), "10");
        assert_eq!(LengthUnit::Metre.length(12.5).number_trimmed(), "12.5");
        assert_eq!(LengthUnit::Foot.length(10.0).number_trimmed(), "32.81");
    }
}
