//! The entry row's cells: which there are, in Tab order, what each takes and shows, and the
//! row read as a whole into a bed in the compact notation (`aggrade_core::model::shorthand`,
//! the reader of the bed-table CSV too), every cell at fault named with what would read.

use aggrade_core::model::shorthand::{self as sh, known_codes, soil_feature};
use aggrade_core::model::{
    BaseRank, Bed, BedId, FaciesCode, LengthUnit, Lithology, Munsell, PaleosolDevelopment, PaleosolFeature,
    Photo, Section, SoilHorizon, Structure, Surface, SurfaceKind,
};

/// The cells of the entry row, in Tab order: the ones most logs fill first.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Cell {
    Thickness,
    Lithology,
    Grain,
    Paleosol,
    Structures,
    Contact,
    Paleocurrents,
    Surface,
    Rank,
    Colour,
    Fossils,
    Samples,
    Notes,
    // The cells of the optional columns, in the row while their column is shown.
    Facies,
    Bioturbation,
    Munsell,
    Horizon,
    Photos,
}

/// How many cells the row has (the 13 always there and the optional columns').
pub(super) const CELLS: usize = 18;

/// The texts of the row's cells, indexed by [`Cell`].
pub type Texts = [String; CELLS];

impl Cell {
    pub const ALL: [Cell; CELLS] = [
        Cell::Thickness,
        Cell::Lithology,
        Cell::Grain,
        Cell::Paleosol,
        Cell::Structures,
        Cell::Contact,
        Cell::Paleocurrents,
        Cell::Surface,
        Cell::Rank,
        Cell::Colour,
        Cell::Fossils,
        Cell::Samples,
        Cell::Notes,
        Cell::Facies,
        Cell::Bioturbation,
        Cell::Munsell,
        Cell::Horizon,
        Cell::Photos,
    ];

    /// The cells of the optional columns (a line of their own in the row, when shown).
    pub(super) const OPTIONAL: [Cell; 5] =
        [Cell::Facies, Cell::Bioturbation, Cell::Munsell, Cell::Horizon, Cell::Photos];

    /// The cells on each line of the row, with their share of its width.
    pub(super) const LINES: [&'static [(Cell, f32)]; 3] = [
        &[
            (Cell::Thickness, 0.17),
            (Cell::Lithology, 0.19),
            (Cell::Grain, 0.16),
            (Cell::Paleosol, 0.22),
            (Cell::Structures, 0.26),
        ],
        &[(Cell::Contact, 0.16), (Cell::Paleocurrents, 0.3), (Cell::Surface, 0.32), (Cell::Rank, 0.22)],
        &[(Cell::Colour, 0.2), (Cell::Fossils, 0.24), (Cell::Samples, 0.22), (Cell::Notes, 0.34)],
    ];

    /// The cell's name, in its label and in its messages.
    pub fn label(self) -> &'static str {
        match self {
            Cell::Thickness => "thickness",
            Cell::Lithology => "lithology",
            Cell::Grain => "grain",
            Cell::Paleosol => "paleosol",
            Cell::Structures => "structures",
            Cell::Contact => "contact",
            Cell::Paleocurrents => "paleocurrents",
            Cell::Surface => "surface",
            Cell::Rank => "rank",
            Cell::Colour => "colour",
            Cell::Fossils => "fossils",
            Cell::Samples => "samples",
            Cell::Notes => "notes",
            Cell::Facies => "facies",
            Cell::Bioturbation => "BI",
            Cell::Munsell => "Munsell",
            Cell::Horizon => "horizon",
            Cell::Photos => "photos",
        }
    }

    /// Grey text in the empty cell.
    pub(super) fn hint(self, unit: LengthUnit) -> String {
        match self {
            Cell::Thickness => format!("thickness ({})", unit.name()),
            Cell::Lithology => "lithology".into(),
            Cell::Grain => "grain".into(),
            Cell::Paleosol => "paleosol".into(),
            Cell::Structures => "structures".into(),
            Cell::Contact => "contact".into(),
            Cell::Paleocurrents => "paleocurrents °".into(),
            Cell::Surface => "surface at base".into(),
            Cell::Rank => "rank of base".into(),
            Cell::Colour => "colour".into(),
            Cell::Fossils => "fossils".into(),
            Cell::Samples => "samples".into(),
            Cell::Notes => "notes".into(),
            Cell::Facies => "facies".into(),
            Cell::Bioturbation => "BI 0–6".into(),
            Cell::Munsell => "10YR 5/4".into(),
            Cell::Horizon => "Bt".into(),
            Cell::Photos => "photos".into(),
        }
    }

    /// Hover text: what the cell takes, with every code (built from the vocabularies).
    pub(super) fn tip(self, unit: LengthUnit) -> String {
        let u = unit.name();
        match self {
            Cell::Thickness => format!(
                "Thickness in {u} (cm, m or ft after the number for another unit). Its top covered: \
                 4.5 c2 is 4.5 {u} whose top 2 {u} are covered (two beds: the exposed part and a covered interval)"
            ),
            Cell::Lithology => format!(
                "A lithology or its first letters ({}). Empty: the grain size names it (sand: sandstone, \
                 gravel: conglomerate, clay or silt: mudstone)",
                Lithology::ALL.iter().map(|l| format!("{} {}", sh::lithology_code(*l), l.name())).collect::<Vec<_>>().join(", ")
            ),
            Cell::Grain => format!(
                "Grain size: {}; or a measured size (0.3mm, 2phi). Base and top: c-m is coarse fining to medium",
                aggrade_core::model::WentworthClass::ALL
                    .iter()
                    .map(|c| format!("{} {}", c.short_label(), c.name()))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            Cell::Paleosol => format!(
                "Development first ({}), then soil features ({}) and a carbonate stage I–VI: s cn rt III",
                known_codes(PaleosolDevelopment::ALL.iter().copied().filter(|d| *d != PaleosolDevelopment::None)),
                known_codes(PaleosolFeature::ALL.iter().copied())
            ),
            Cell::Structures => format!(
                "Codes separated by spaces: {}. Soil features (root traces, slickensides, carbonate nodules, \
                 mottling) go in the paleosol cell",
                known_codes(Structure::ALL.iter().copied().filter(|s| soil_feature(*s).is_none()))
            ),
            Cell::Contact => format!(
                "Basal contact: s sharp (also when empty), e erosional, g gradational; the erosional relief \
                 in {u} after it: e1.2"
            ),
            Cell::Paleocurrents => {
                "Azimuths in degrees, 0–360, as measured, separated by spaces: 200 215 230; an indicator code \
                 after one (t trough axis, p planar foreset, r ripple, i imbrication, pl parting lineation, \
                 f flute cast, g groove cast, a accretion surface) and /dip: 210t 185p/22"
                    .into()
            }
            Cell::Surface => format!(
                "The name of a surface at the bed's base (RG-E1); its kind in brackets when it is not \
                 inferred from the contact and the soil below: {}",
                known_codes(SurfaceKind::ALL.iter().copied())
            ),
            Cell::Rank => format!(
                "Your rank of the bed's base, overriding the rules: {}; empty leaves it to the rules",
                known_codes(BaseRank::ALL.iter().copied())
            ),
            Cell::Colour => "Colour as logged (10YR 6/4, pale red)".into(),
            Cell::Fossils => "Body and trace fossils".into(),
            Cell::Samples => "Sample names, separated by ;".into(),
            Cell::Notes => "Free notes on the bed".into(),
            Cell::Facies => format!(
                "Your lithofacies code (Miall 1978, 1996): {}. Empty leaves the suggested code in force",
                FaciesCode::valid_list()
            ),
            Cell::Bioturbation => {
                "Bioturbation index 0 (none) to 6 (complete), after Taylor & Goldring (1993); empty if not graded"
                    .into()
            }
            Cell::Munsell => "Munsell colour: hue value/chroma, e.g. 10YR 5/4, or N 7/ for a neutral grey".into(),
            Cell::Horizon => "Soil-horizon designation, e.g. A, Bt, Bk2, Bss, 2Bg".into(),
            Cell::Photos => "Photo references, separated by ; (the image files are set in the Bed tab)".into(),
        }
    }

    /// The text field's id (the same every frame, whatever the layout).
    pub(super) fn id(self) -> egui::Id {
        egui::Id::unique(("aggrade_entry_cell", self as usize))
    }

    /// The cell after this one, or before it, round the row, skipping cells not shown.
    pub(super) fn step(self, forward: bool, shown: impl Fn(Cell) -> bool) -> Cell {
        let mut i = self as usize;
        for _ in 0..CELLS {
            i = if forward { (i + 1) % CELLS } else { (i + CELLS - 1) % CELLS };
            if shown(Cell::ALL[i]) {
                return Cell::ALL[i];
            }
        }
        self
    }

    /// The cell a validation problem of the bed's field belongs to (`beds[0].grain_base` → grain).
    pub(super) fn of_field(location: &str) -> Cell {
        let (index, field) =
            location.strip_prefix("beds[").and_then(|r| r.split_once("].")).unwrap_or(("0", location));
        if index != "0" {
            // The covered top, a bed of its own.
            return Cell::Thickness;
        }
        let field = field.split(['.', '[']).next().unwrap_or(field);
        match field {
            "lithology" => Cell::Lithology,
            "grain_base" | "grain_top" => Cell::Grain,
            "structures" => Cell::Structures,
            "base_contact" | "base_relief_m" => Cell::Contact,
            "paleosol" | "paleosol_features" | "carbonate_stage" => Cell::Paleosol,
            "base_surface" => Cell::Surface,
            "base_rank" => Cell::Rank,
            "colour" => Cell::Colour,
            "paleocurrents" | "paleocurrents_deg" => Cell::Paleocurrents,
            "fossils" => Cell::Fossils,
            "samples" => Cell::Samples,
            "notes" => Cell::Notes,
            "facies" => Cell::Facies,
            "bioturbation_index" => Cell::Bioturbation,
            "munsell" => Cell::Munsell,
            "soil_horizon" => Cell::Horizon,
            "photos" => Cell::Photos,
            _ => Cell::Thickness,
        }
    }
}

/// A bed written out cell by cell in the notation: what the row shows when the bed is loaded
/// to be edited, and reads back to the same bed.
pub fn bed_cells(bed: &Bed, unit: LengthUnit) -> Texts {
    let paleosol = sh::PaleosolEntry {
        development: bed.paleosol,
        features: bed.paleosol_features.clone(),
        carbonate_stage: bed.carbonate_stage,
    };
    let mut t: Texts = Default::default();
    t[Cell::Thickness as usize] = sh::length_code(bed.thickness_m, unit);
    t[Cell::Lithology as usize] = bed.lithology.name().to_string();
    t[Cell::Grain as usize] = sh::grain_range_code(bed.grain_base, bed.grain_top);
    t[Cell::Paleosol as usize] = sh::paleosol_code(&paleosol);
    t[Cell::Structures as usize] = sh::codes(&bed.structures);
    t[Cell::Contact as usize] = sh::contact_code(bed.base_contact, bed.base_relief_m, unit);
    t[Cell::Paleocurrents as usize] = sh::paleocurrents_code(&bed.paleocurrents);
    t[Cell::Surface as usize] =
        bed.base_surface.as_ref().map(|s| sh::surface_code(&s.name, s.kind)).unwrap_or_default();
    t[Cell::Rank as usize] = bed.base_rank.map(sh::short_code).unwrap_or_default();
    t[Cell::Colour as usize] = bed.colour.clone();
    t[Cell::Fossils as usize] = bed.fossils.clone();
    t[Cell::Samples as usize] = sh::samples_code(&bed.samples);
    t[Cell::Notes as usize] = bed.notes.clone();
    t[Cell::Facies as usize] = bed.facies.map(|c| c.code().to_string()).unwrap_or_default();
    t[Cell::Bioturbation as usize] = bed.bioturbation_index.map(|b| b.to_string()).unwrap_or_default();
    t[Cell::Munsell as usize] = bed.munsell.as_ref().map(|m| m.to_string()).unwrap_or_default();
    t[Cell::Horizon as usize] = bed.soil_horizon.as_ref().map(|h| h.to_string()).unwrap_or_default();
    t[Cell::Photos as usize] = photos_code(&bed.photos);
    t
}

/// Photo references as the row shows them.
pub fn photos_code(photos: &[Photo]) -> String {
    photos.iter().map(|p| p.reference.as_str()).collect::<Vec<_>>().join("; ")
}

/// Photo references typed in the row, separated by `;`: a photo already on the bed keeps its
/// image file.
fn photos(text: &str, existing: &[Photo]) -> Vec<Photo> {
    text.split(';')
        .map(str::trim)
        .filter(|r| !r.is_empty())
        .map(|r| {
            existing
                .iter()
                .find(|p| p.reference == r)
                .cloned()
                .unwrap_or(Photo { reference: r.into(), file: None })
        })
        .collect()
}

/// A bioturbation index typed as 0–6 ("BI 3" reads too).
fn bioturbation(text: &str) -> Result<Option<u8>, String> {
    let t = text.trim();
    let digits = t.strip_prefix("BI").or_else(|| t.strip_prefix("bi")).unwrap_or(t).trim();
    if digits.is_empty() {
        return Ok(None);
    }
    match digits.parse::<u8>() {
        Ok(v) if v <= 6 => Ok(Some(v)),
        _ => Err(format!(
            "{t:?} is not a bioturbation index: write 0 (none) to 6 (complete), after Taylor & Goldring (1993)"
        )),
    }
}

/// The row read as a whole: the bed, and the covered interval above it when the thickness cell
/// gives a covered top. Every cell that does not read is named with what would.
pub fn read_row(
    texts: &Texts,
    template: &Bed,
    changed: &[bool; CELLS],
    unit: LengthUnit,
    paleosol_below: Option<PaleosolDevelopment>,
) -> Result<Vec<Bed>, Vec<(Cell, String)>> {
    let mut bed = template.clone();
    let mut problems: Vec<(Cell, String)> = Vec::new();
    let mut fail = |cell: Cell, why: String| problems.push((cell, format!("{}: {why}", cell.label())));
    let text = |c: Cell| texts[c as usize].as_str();
    let read = |c: Cell| changed[c as usize];
    let mut grain_ok = true;
    if read(Cell::Grain) {
        match sh::grain_range(text(Cell::Grain)) {
            Ok((b, t)) => (bed.grain_base, bed.grain_top) = (b, t),
            Err(e) => {
                grain_ok = false;
                fail(Cell::Grain, e.to_string());
            }
        }
    }
    let mut covered = None;
    if read(Cell::Thickness) {
        match sh::thickness_entry(text(Cell::Thickness), unit) {
            Ok(t) => {
                bed.thickness_m = t.exposed_m();
                covered = t.covered_top_m;
            }
            Err(e) => fail(Cell::Thickness, e.to_string()),
        }
    }
    // An emptied lithology cell is named by the grain size, even if only the grain changed.
    let lithology_empty = text(Cell::Lithology).trim().is_empty();
    if read(Cell::Lithology) || (lithology_empty && read(Cell::Grain)) {
        match sh::lithology_entry(text(Cell::Lithology), bed.grain_base) {
            Ok(l) => bed.lithology = l,
            // The grain cell's own problem says it all.
            Err(_) if lithology_empty && !grain_ok => {}
            Err(_) if lithology_empty => fail(
                Cell::Lithology,
                format!(
                    "type a lithology ({}) or a grain size, which names it",
                    Lithology::ALL.iter().map(|l| sh::lithology_code(*l)).collect::<Vec<_>>().join(", ")
                ),
            ),
            Err(e) => fail(Cell::Lithology, e.to_string()),
        }
    }
    if read(Cell::Paleosol) {
        match sh::paleosol_entry(text(Cell::Paleosol)) {
            Ok(p) => {
                bed.paleosol = p.development;
                bed.paleosol_features = p.features;
                bed.carbonate_stage = p.carbonate_stage;
            }
            Err(e) => fail(Cell::Paleosol, e.to_string()),
        }
    }
    if read(Cell::Structures) {
        match sh::terms_from_codes::<Structure>(text(Cell::Structures), "structure") {
            Ok(s) => bed.structures = s,
            Err(e) => fail(Cell::Structures, e.to_string()),
        }
    }
    if read(Cell::Contact) {
        match sh::contact_entry(text(Cell::Contact), unit) {
            Ok(c) => (bed.base_contact, bed.base_relief_m) = (c.contact, c.relief_m),
            Err(e) => fail(Cell::Contact, e.to_string()),
        }
    }
    if read(Cell::Paleocurrents) {
        match sh::paleocurrents(text(Cell::Paleocurrents)) {
            Ok(p) => bed.paleocurrents = p,
            Err(e) => fail(Cell::Paleocurrents, e.to_string()),
        }
    }
    // After the contact: a surface's kind, when not given, is inferred from it.
    if read(Cell::Surface) || (read(Cell::Contact) && bed.base_surface.is_some()) {
        match sh::surface_entry(text(Cell::Surface)) {
            Ok(s) => {
                bed.base_surface = s.map(|s| Surface {
                    name: s.name,
                    kind: s.kind.unwrap_or_else(|| {
                        aggrade_core::io::infer_surface_kind(bed.base_contact, paleosol_below)
                    }),
                })
            }
            Err(e) => fail(Cell::Surface, e.to_string()),
        }
    }
    if read(Cell::Rank) {
        match sh::rank_entry(text(Cell::Rank)) {
            Ok(r) => bed.base_rank = r,
            Err(e) => fail(Cell::Rank, e.to_string()),
        }
    }
    if read(Cell::Colour) {
        bed.colour = text(Cell::Colour).trim().to_string();
    }
    if read(Cell::Fossils) {
        bed.fossils = text(Cell::Fossils).trim().to_string();
    }
    if read(Cell::Samples) {
        bed.samples = sh::samples(text(Cell::Samples), &bed.samples);
    }
    if read(Cell::Notes) {
        bed.notes = text(Cell::Notes).trim().to_string();
    }
    if read(Cell::Facies) {
        let t = text(Cell::Facies).trim();
        if t.is_empty() {
            bed.facies = None;
        } else {
            match FaciesCode::parse(t) {
                Some(c) => bed.facies = Some(c),
                None => fail(
                    Cell::Facies,
                    format!("{t:?} is not a lithofacies code; valid codes are {}", FaciesCode::valid_list()),
                ),
            }
        }
    }
    if read(Cell::Bioturbation) {
        match bioturbation(text(Cell::Bioturbation)) {
            Ok(b) => bed.bioturbation_index = b,
            Err(e) => fail(Cell::Bioturbation, e),
        }
    }
    if read(Cell::Munsell) {
        let t = text(Cell::Munsell);
        match t.trim().is_empty() {
            true => bed.munsell = None,
            false => match Munsell::parse(t) {
                Ok(m) => bed.munsell = Some(m),
                Err(e) => fail(Cell::Munsell, e.to_string()),
            },
        }
    }
    if read(Cell::Horizon) {
        let t = text(Cell::Horizon);
        match t.trim().is_empty() {
            true => bed.soil_horizon = None,
            false => match SoilHorizon::parse(t) {
                Ok(h) => bed.soil_horizon = Some(h),
                Err(e) => fail(Cell::Horizon, e.to_string()),
            },
        }
    }
    if read(Cell::Photos) {
        bed.photos = photos(text(Cell::Photos), &bed.photos);
    }
    if !problems.is_empty() {
        return Err(problems);
    }
    let mut beds = vec![bed];
    if let Some(c) = covered {
        // An id of its own for the checks below (adding it gives it the section's next id).
        beds.push(Bed::new(BedId(template.id.0.wrapping_add(1)), c, Lithology::Covered, None));
    }
    // The checks a saved file passes (a sandstone needs a grain size, phi within range, text
    // limits …), each named by its cell.
    let mut s = Section::new("entry row");
    s.beds = beds.into();
    let checked: Vec<(Cell, String)> = aggrade_core::io::validate_section(&s)
        .into_iter()
        .map(|p| {
            let cell = Cell::of_field(&p.location);
            let field = p.location.split_once("].").map_or(p.location.as_str(), |(_, f)| f).replace('_', " ");
            (cell, format!("{}: {field}: {}", cell.label(), p.message))
        })
        .collect();
    if checked.is_empty() {
        Ok(s.beds.into_iter().collect())
    } else {
        Err(checked)
    }
}

/// The bed in words, for the row's live reading and a table row's hover text.
pub fn describe(bed: &Bed, unit: LengthUnit) -> String {
    let mut parts =
        vec![format!("{} {} {}", sh::length_code(bed.thickness_m, unit), unit.name(), bed.lithology)];
    match (bed.grain_base, bed.grain_top) {
        (Some(b), Some(t)) if b != t => parts.push(format!("{b} to {t}")),
        (Some(g), _) | (None, Some(g)) => parts.push(g.to_string()),
        (None, None) => {}
    }
    if bed.paleosol != PaleosolDevelopment::None
        || !bed.paleosol_features.is_empty()
        || bed.carbonate_stage.is_some()
    {
        let mut p = format!("paleosol {}", bed.paleosol);
        let features: Vec<&str> = bed.paleosol_features.iter().map(|f| f.name()).collect();
        if !features.is_empty() {
            p.push_str(&format!(" ({})", features.join(", ")));
        }
        if let Some(st) = bed.carbonate_stage.filter(|s| (1..=6).contains(s)) {
            p.push_str(&format!(
                ", carbonate stage {}",
                ["I", "II", "III", "IV", "V", "VI"][st as usize - 1]
            ));
        }
        parts.push(p);
    }
    if !bed.structures.is_empty() {
        parts.push(bed.structures.iter().map(|s| s.name()).collect::<Vec<_>>().join(", "));
    }
    if bed.base_contact != aggrade_core::model::Contact::Sharp || bed.base_relief_m.is_some() {
        let mut c = format!("{} base", bed.base_contact);
        if let Some(r) = bed.base_relief_m {
            c.push_str(&format!(" with {} {} relief", sh::length_code(r, unit), unit.name()));
        }
        parts.push(c);
    }
    if !bed.paleocurrents.is_empty() {
        parts.push(format!("paleocurrents {}°", sh::paleocurrents_code(&bed.paleocurrents)));
    }
    if let Some(s) = &bed.base_surface {
        parts.push(format!("surface {} ({}) at its base", s.name, s.kind));
    }
    if let Some(r) = bed.base_rank {
        parts.push(format!("base ranked {r}"));
    }
    parts.join(", ")
}

/// A new bed's fields before its cells are read.
pub(super) fn new_template() -> Bed {
    Bed::new(BedId(0), 1.0, Lithology::Mudstone, None)
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{Contact, GrainSize, WentworthClass as W};

    fn row(cells: &[(Cell, &str)]) -> Texts {
        let mut t: Texts = Default::default();
        for (c, text) in cells {
            t[*c as usize] = text.to_string();
        }
        t
    }

    fn read_new(cells: &[(Cell, &str)]) -> Result<Vec<Bed>, Vec<(Cell, String)>> {
        read_row(&row(cells), &new_template(), &[true; CELLS], LengthUnit::Metre, None)
    }

    #[test]
    fn every_field_of_a_bed_reads_from_its_cell() {
        use Cell as C;
        let beds = read_new(&[
            (C::Thickness, "0.4"),
            (C::Lithology, "co"),
            (C::Grain, "pbl-gr"),
            (C::Paleosol, "w rt II"),
            (C::Structures, "bl i"),
            (C::Contact, "e1.2"),
            (C::Paleocurrents, "210 225"),
            (C::Surface, "RG-E1"),
            (C::Rank, "bb"),
            (C::Colour, "10YR 6/4"),
            (C::Fossils, "wood"),
            (C::Samples, "CW-1; CW-2"),
            (C::Notes, " lag of mud clasts "),
        ])
        .expect("reads");
        let b = &beds[0];
        assert_eq!((b.thickness_m, b.lithology), (0.4, Lithology::Conglomerate));
        assert_eq!(
            (b.grain_base, b.grain_top),
            (Some(GrainSize::Class(W::Pebble)), Some(GrainSize::Class(W::Granule)))
        );
        assert_eq!((b.paleosol, b.carbonate_stage), (PaleosolDevelopment::Weak, Some(2)));
        assert_eq!(b.paleosol_features, vec![PaleosolFeature::RootTraces]);
        assert_eq!(b.structures, vec![Structure::BasalLag, Structure::Imbrication]);
        assert_eq!((b.base_contact, b.base_relief_m), (Contact::Erosional, Some(1.2)));
        assert_eq!(b.azimuths().collect::<Vec<_>>(), vec![210.0, 225.0]);
        // An erosional base: the surface is an incision surface unless said otherwise.
        assert_eq!(b.base_surface, Some(Surface { name: "RG-E1".into(), kind: SurfaceKind::Incision }));
        assert_eq!(b.base_rank, Some(BaseRank::BodyBase));
        assert_eq!(
            (b.colour.as_str(), b.fossils.as_str(), b.notes.as_str()),
            ("10YR 6/4", "wood", "lag of mud clasts")
        );
        assert_eq!(aggrade_core::model::shorthand::samples_code(&b.samples), "CW-1; CW-2");
        // The bed written back cell by cell reads back to the same bed.
        let again = read_row(
            &bed_cells(b, LengthUnit::Metre),
            &new_template(),
            &[true; CELLS],
            LengthUnit::Metre,
            None,
        )
        .expect("reads back");
        assert_eq!(&again[0], b);
    }

    #[test]
    fn a_covered_top_becomes_a_covered_interval_and_an_empty_lithology_is_named_by_the_grain() {
        let beds = read_new(&[(Cell::Thickness, "4.5 c2"), (Cell::Grain, "si")]).expect("reads");
        assert_eq!(beds.len(), 2);
        assert_eq!((beds[0].thickness_m, beds[0].lithology), (2.5, Lithology::Mudstone));
        assert_eq!(
            (beds[1].thickness_m, beds[1].lithology, beds[1].grain_base),
            (2.0, Lithology::Covered, None)
        );
        let beds = read_new(&[(Cell::Thickness, "2.1"), (Cell::Grain, "c-m")]).expect("reads");
        assert_eq!(beds[0].lithology, Lithology::Sandstone);
    }

    #[test]
    fn the_row_names_every_cell_at_fault_and_what_would_read() {
        use Cell as C;
        let problems = read_new(&[
            (C::Thickness, "x"),
            (C::Lithology, "zz"),
            (C::Grain, "m"),
            (C::Structures, "m"),
            (C::Paleocurrents, "400"),
        ])
        .expect_err("four cells at fault");
        let cells: Vec<Cell> = problems.iter().map(|p| p.0).collect();
        assert_eq!(cells, [C::Thickness, C::Lithology, C::Structures, C::Paleocurrents]);
        let text = |c: Cell| problems.iter().find(|p| p.0 == c).map(|p| p.1.clone()).unwrap_or_default();
        assert!(
            text(C::Thickness).starts_with("thickness: \"x\" is not a number; expected a thickness in m > 0"),
            "{}",
            text(C::Thickness)
        );
        assert!(
            text(C::Lithology).starts_with("lithology:") && text(C::Lithology).contains("sandstone"),
            "{}",
            text(C::Lithology)
        );
        assert!(text(C::Structures).contains("massive or mottling"), "{}", text(C::Structures));
        assert!(text(C::Paleocurrents).contains("0 to 360°"), "{}", text(C::Paleocurrents));
        // The file's checks, named by their cell: a sandstone needs a grain size; no bed is over
        // 1,000 m; a covered interval takes none.
        let p = read_new(&[(C::Thickness, "1"), (C::Lithology, "sa")]).expect_err("grain required");
        assert_eq!(p[0].0, C::Grain);
        assert!(p[0].1.starts_with("grain: grain base: required for sandstone"), "{}", p[0].1);
        assert_eq!(
            read_new(&[(C::Thickness, "1001"), (C::Grain, "cl")]).expect_err("too thick")[0].0,
            C::Thickness
        );
        assert_eq!(
            read_new(&[(C::Thickness, "2"), (C::Lithology, "cov"), (C::Grain, "m")]).expect_err("covered")[0]
                .0,
            C::Grain
        );
        assert!(read_new(&[(C::Thickness, "2"), (C::Lithology, "cov")]).is_ok());
        // Nothing names the rock.
        let p = read_new(&[(C::Thickness, "2")]).expect_err("no lithology, no grain");
        assert_eq!(p[0].0, C::Lithology);
    }

    #[test]
    fn an_edit_reads_only_the_cells_that_changed() {
        let mut bed = Bed::new(BedId(7), 1.0, Lithology::Sandstone, Some(GrainSize::Phi(2.473_912_3)));
        bed.base_relief_m = None;
        let unit = LengthUnit::Metre;
        let loaded = bed_cells(&bed, unit);
        let mut texts = loaded.clone();
        texts[Cell::Structures as usize] = "tcb".into();
        let changed: [bool; CELLS] = std::array::from_fn(|k| texts[k] != loaded[k]);
        let got = read_row(&texts, &bed, &changed, unit, None).expect("reads");
        // The measured grain size keeps every digit (its cell, shown to 4 decimals, was not read).
        assert_eq!(got[0].grain_base, Some(GrainSize::Phi(2.473_912_3)));
        assert_eq!(got[0].structures, vec![Structure::TroughCrossBedding]);
        // Emptying the lithology names it from the grain size.
        texts[Cell::Lithology as usize].clear();
        let changed: [bool; CELLS] = std::array::from_fn(|k| texts[k] != loaded[k]);
        assert_eq!(
            read_row(&texts, &bed, &changed, unit, None).map(|b| b[0].lithology),
            Ok(Lithology::Sandstone)
        );
    }

    #[test]
    fn the_optional_columns_cells_read_the_field_record_and_name_what_is_wrong() {
        use aggrade_core::model::FaciesCode;
        use Cell as C;
        let beds = read_new(&[
            (C::Thickness, "1.2"),
            (C::Grain, "m"),
            (C::Facies, "st"),
            (C::Bioturbation, "BI 3"),
            (C::Munsell, "10yr 6/4"),
            (C::Horizon, "Bk2"),
            (C::Photos, "IMG_2041; roll 3 #12"),
        ])
        .expect("reads");
        let b = &beds[0];
        assert_eq!(b.facies, Some(FaciesCode::St));
        assert_eq!(b.bioturbation_index, Some(3));
        assert_eq!(b.munsell.as_ref().map(|m| m.to_string()).as_deref(), Some("10YR 6/4"));
        assert_eq!(b.soil_horizon.as_ref().map(|h| h.as_str()), Some("Bk2"));
        assert_eq!(photos_code(&b.photos), "IMG_2041; roll 3 #12");
        // Written back cell by cell, the bed reads back the same.
        let again = read_row(
            &bed_cells(b, LengthUnit::Metre),
            &new_template(),
            &[true; CELLS],
            LengthUnit::Metre,
            None,
        )
        .expect("reads back");
        assert_eq!(&again[0], b);
        // Taylor & Goldring (1993) grade 0 to 6; Munsell hue value/chroma; Miall's codes.
        let p = read_new(&[
            (C::Thickness, "1"),
            (C::Grain, "m"),
            (C::Facies, "Sx"),
            (C::Bioturbation, "7"),
            (C::Munsell, "red"),
            (C::Horizon, "bt"),
        ])
        .expect_err("four cells at fault");
        let cells: Vec<Cell> = p.iter().map(|x| x.0).collect();
        assert_eq!(cells, [C::Facies, C::Bioturbation, C::Munsell, C::Horizon]);
        assert!(p[0].1.contains("valid codes are") && p[1].1.contains("0 (none) to 6"), "{p:?}");
        // Only the row's 13 cells and the optional columns shown are visited by Tab.
        assert_eq!(C::Notes.step(true, |c| !Cell::OPTIONAL.contains(&c)), C::Thickness);
        assert_eq!(C::Notes.step(true, |c| c != C::Facies), C::Bioturbation);
        assert_eq!(C::Thickness.step(false, |c| !Cell::OPTIONAL.contains(&c) || c == C::Horizon), C::Horizon);
    }
}
