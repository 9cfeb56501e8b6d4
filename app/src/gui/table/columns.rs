//! The bed table's optional columns (facies, samples, photos, bioturbation index, Munsell colour,
//! soil horizon): which are shown, remembered in Aggrade's data folder, what each shows of a bed,
//! and the entry-row cell it is typed in.

use super::cells::{photos_code, Cell};
use aggrade_core::model::Bed;
use std::path::{Path, PathBuf};

/// An optional column of the bed table.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Extra {
    Facies,
    Samples,
    Photos,
    Bioturbation,
    Munsell,
    Horizon,
}

impl Extra {
    pub const ALL: [Extra; 6] =
        [Extra::Facies, Extra::Samples, Extra::Photos, Extra::Bioturbation, Extra::Munsell, Extra::Horizon];

    /// The word stored in the settings file.
    fn key(self) -> &'static str {
        match self {
            Extra::Facies => "facies",
            Extra::Samples => "samples",
            Extra::Photos => "photos",
            Extra::Bioturbation => "bioturbation_index",
            Extra::Munsell => "munsell",
            Extra::Horizon => "soil_horizon",
        }
    }

    /// The column's heading.
    pub fn heading(self) -> &'static str {
        match self {
            Extra::Facies => "facies",
            Extra::Samples => "samples",
            Extra::Photos => "photos",
            Extra::Bioturbation => "BI",
            Extra::Munsell => "Munsell",
            Extra::Horizon => "horizon",
        }
    }

    /// The name in the Columns menu.
    pub fn menu_name(self) -> &'static str {
        match self {
            Extra::Facies => "Facies code (suggested ones marked ?)",
            Extra::Samples => "Samples",
            Extra::Photos => "Photos",
            Extra::Bioturbation => "Bioturbation index",
            Extra::Munsell => "Munsell colour",
            Extra::Horizon => "Soil horizon",
        }
    }

    /// The column's width, points.
    pub fn width(self) -> f32 {
        match self {
            Extra::Facies => 42.0,
            Extra::Samples => 78.0,
            Extra::Photos => 70.0,
            Extra::Bioturbation => 26.0,
            Extra::Munsell => 66.0,
            Extra::Horizon => 48.0,
        }
    }

    /// The entry-row cell the column's value is typed in.
    pub fn cell(self) -> Cell {
        match self {
            Extra::Facies => Cell::Facies,
            Extra::Samples => Cell::Samples,
            Extra::Photos => Cell::Photos,
            Extra::Bioturbation => Cell::Bioturbation,
            Extra::Munsell => Cell::Munsell,
            Extra::Horizon => Cell::Horizon,
        }
    }

    /// What the column shows of a bed, and whether it is only a suggestion (drawn dimmer). A
    /// suggested facies code carries a "?" (a suggestion is an interpretation, for the geologist
    /// to confirm).
    pub fn shown(self, bed: &Bed) -> (String, bool) {
        match self {
            Extra::Facies => match aggrade_core::rules::facies::facies_of(bed) {
                Some((code, true)) => (format!("{code}?"), true),
                Some((code, false)) => (code.to_string(), false),
                None => (String::new(), false),
            },
            Extra::Samples => {
                (bed.samples.iter().map(|s| s.id.as_str()).collect::<Vec<_>>().join(", "), false)
            }
            Extra::Photos => (photos_code(&bed.photos).replace("; ", ", "), false),
            Extra::Bioturbation => (bed.bioturbation_index.map(|b| b.to_string()).unwrap_or_default(), false),
            Extra::Munsell => (bed.munsell.as_ref().map(|m| m.to_string()).unwrap_or_default(), false),
            Extra::Horizon => (bed.soil_horizon.as_ref().map(|h| h.to_string()).unwrap_or_default(), false),
        }
    }
}

/// The optional columns shown, and where the choice is kept.
#[derive(Debug, Clone, Default)]
pub struct Columns {
    shown: Vec<Extra>,
    /// The settings file (`None`: not kept, as for a table made without a data folder).
    file: Option<PathBuf>,
}

impl Columns {
    /// The settings file's name in the data folder.
    pub const FILE: &'static str = "table_columns.json";

    /// The choice kept in `data_dir` (none shown when there is none, or it does not read).
    pub fn load(data_dir: &Path) -> Self {
        let file = data_dir.join(Self::FILE);
        let keys: Vec<String> = std::fs::read_to_string(&file)
            .ok()
            .and_then(|t| serde_json::from_str(&t).ok())
            .unwrap_or_default();
        let shown = Extra::ALL.into_iter().filter(|e| keys.iter().any(|k| k == e.key())).collect();
        Columns { shown, file: Some(file) }
    }

    /// The columns shown, in table order.
    pub fn shown(&self) -> impl Iterator<Item = Extra> + '_ {
        Extra::ALL.into_iter().filter(|e| self.shown.contains(e))
    }

    pub fn is_shown(&self, e: Extra) -> bool {
        self.shown.contains(&e)
    }

    /// Whether an entry-row cell is on show: the 13 always, an optional column's while shown.
    pub fn cell_shown(&self, c: Cell) -> bool {
        !Cell::OPTIONAL.contains(&c) || self.shown().any(|e| e.cell() == c)
    }

    /// Show or hide a column and keep the choice; an error says why it could not be kept (the
    /// column is shown or hidden all the same).
    pub fn set(&mut self, e: Extra, on: bool) -> Result<(), String> {
        self.shown.retain(|x| *x != e);
        if on {
            self.shown.push(e);
        }
        let Some(file) = &self.file else { return Ok(()) };
        let keys: Vec<&str> = self.shown().map(Extra::key).collect();
        let json = serde_json::to_string(&keys).map_err(|e| e.to_string())?;
        let write = || -> std::io::Result<()> {
            if let Some(dir) = file.parent() {
                std::fs::create_dir_all(dir)?;
            }
            let tmp = file.with_extension(format!("json.{}.tmp", std::process::id()));
            std::fs::write(&tmp, json)?;
            std::fs::rename(&tmp, file)
        };
        write().map_err(|err| format!("the choice of columns could not be kept in {}: {err}", file.display()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{BedId, FaciesCode, GrainSize, Lithology, Structure, WentworthClass};

    #[test]
    fn the_choice_of_columns_is_kept_in_the_data_folder() {
        let dir = tempfile::tempdir().expect("temp dir");
        let mut c = Columns::load(dir.path());
        assert_eq!(c.shown().count(), 0);
        assert!(!c.cell_shown(Cell::Munsell) && c.cell_shown(Cell::Notes));
        c.set(Extra::Munsell, true).expect("kept");
        c.set(Extra::Facies, true).expect("kept");
        let again = Columns::load(dir.path());
        assert_eq!(again.shown().collect::<Vec<_>>(), [Extra::Facies, Extra::Munsell], "table order");
        assert!(again.cell_shown(Cell::Munsell) && again.cell_shown(Cell::Facies));
        let mut c = again;
        c.set(Extra::Facies, false).expect("kept");
        assert_eq!(Columns::load(dir.path()).shown().collect::<Vec<_>>(), [Extra::Munsell]);
        // A data folder that is a file: not kept, but shown.
        let blocked = dir.path().join("not-a-folder");
        std::fs::write(&blocked, "x").expect("write");
        let mut c = Columns::load(&blocked);
        assert!(c.set(Extra::Horizon, true).expect_err("cannot keep").contains("not-a-folder"));
        assert!(c.is_shown(Extra::Horizon));
    }

    #[test]
    fn a_suggested_facies_code_is_marked_and_the_geologists_is_not() {
        let mut b =
            Bed::new(BedId(1), 1.0, Lithology::Sandstone, Some(GrainSize::Class(WentworthClass::MediumSand)));
        b.structures = vec![Structure::TroughCrossBedding];
        let suggested =
            aggrade_core::rules::facies::suggest(&b).expect("a trough cross-bedded sand has a code");
        assert_eq!(Extra::Facies.shown(&b), (format!("{suggested}?"), true));
        b.facies = Some(FaciesCode::Sp);
        assert_eq!(Extra::Facies.shown(&b), ("Sp".to_string(), false));
    }
}
