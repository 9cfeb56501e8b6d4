//! Lithofacies codes of fluvial deposits (Miall 1977, 1978, 1996): the code a geologist gives a
//! bed, as a closed list with each code's meaning.

use serde::{Deserialize, Deserializer, Serialize, Serializer};
use std::fmt;

macro_rules! facies_codes {
    ($($variant:ident => $code:literal, $meaning:literal;)+) => {
        /// A lithofacies code (Miall 1996, Table 5.1; `Se` from Miall 1978).
        #[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
        pub enum FaciesCode { $($variant),+ }

        impl FaciesCode {
            /// Every code, gravels first, then sands, fines, coal and paleosol carbonate.
            pub const ALL: &'static [FaciesCode] = &[$(FaciesCode::$variant),+];

            /// The code as written ("St", "Fsm").
            pub fn code(self) -> &'static str {
                match self { $(FaciesCode::$variant => $code),+ }
            }

            /// What the code stands for, in Miall's words shortened.
            pub fn meaning(self) -> &'static str {
                match self { $(FaciesCode::$variant => $meaning),+ }
            }
        }
    };
}

facies_codes! {
    Gmm => "Gmm", "matrix-supported, massive gravel";
    Gmg => "Gmg", "matrix-supported gravel, inverse to normal grading";
    Gci => "Gci", "clast-supported gravel, inverse grading";
    Gcm => "Gcm", "clast-supported, massive gravel";
    Gh => "Gh", "clast-supported, crudely bedded gravel, imbrication";
    Gt => "Gt", "gravel, trough cross-bedded";
    Gp => "Gp", "gravel, planar cross-bedded";
    St => "St", "sand, fine to very coarse, may be pebbly, trough cross-beds";
    Sp => "Sp", "sand, fine to very coarse, may be pebbly, planar cross-beds";
    Sr => "Sr", "sand, very fine to coarse, ripple cross-lamination";
    Sh => "Sh", "sand, very fine to coarse, horizontal lamination";
    Sl => "Sl", "sand, very fine to coarse, low-angle (<15°) cross-beds";
    Ss => "Ss", "sand, fine to very coarse, broad shallow scours";
    Se => "Se", "erosional scours with intraclasts";
    Sm => "Sm", "sand, fine to coarse, massive or faint lamination";
    Fl => "Fl", "sand, silt, mud: fine lamination, very small ripples";
    Fsm => "Fsm", "silt, mud: massive";
    Fm => "Fm", "mud, silt: massive, desiccation cracks";
    Fr => "Fr", "mud, silt: massive, roots, bioturbation";
    C => "C", "coal, carbonaceous mud";
    P => "P", "paleosol carbonate (calcite, siderite)";
}

impl FaciesCode {
    /// Read a code; the case of the first letter is forgiven ("st" reads as St), the rest must
    /// match since the codes differ only there ("Fsm").
    pub fn parse(text: &str) -> Option<FaciesCode> {
        let t = text.trim();
        Self::ALL
            .iter()
            .copied()
            .find(|c| c.code() == t)
            .or_else(|| Self::ALL.iter().copied().find(|c| c.code().eq_ignore_ascii_case(t)))
    }

    /// All codes joined for "valid codes are …" messages.
    pub fn valid_list() -> String {
        Self::ALL.iter().map(|c| c.code()).collect::<Vec<_>>().join(", ")
    }
}

impl fmt::Display for FaciesCode {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.code())
    }
}

impl Serialize for FaciesCode {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.code())
    }
}

impl<'de> Deserialize<'de> for FaciesCode {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let text = String::deserialize(d)?;
        FaciesCode::parse(&text).ok_or_else(|| {
            serde::de::Error::custom(format!(
                "unknown lithofacies code {text:?}; valid codes are {}",
                FaciesCode::valid_list()
            ))
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_code_reads_back_and_codes_are_distinct_ignoring_case() {
        for c in FaciesCode::ALL {
            assert_eq!(FaciesCode::parse(c.code()), Some(*c));
            assert_eq!(FaciesCode::parse(&c.code().to_lowercase()), Some(*c));
        }
        assert_eq!(FaciesCode::parse("Sx"), None);
        assert_eq!(serde_json::to_string(&FaciesCode::Fsm).expect("a code serialises"), "\"Fsm\"");
        assert!(serde_json::from_str::<FaciesCode>("\"Q\"").is_err());
    }
}
