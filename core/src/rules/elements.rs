//! Reading each bed as a depositional element and grouping channel beds into storeys.
//!
//! Surfaces have ranks (Miall 1985, 1996): set and coset boundaries and scours inside a storey,
//! storey surfaces, channel-body bases. A storey starts at a storey surface: an erosional base of
//! sand or gravel inside a channel body whose sand reaches `min_storey_m` before the next storey
//! surface (thinner ones are scours), a run of sand resting on fines that the channel-or-splay
//! decision table (see [`RuleParams::splay_limit_m`]) reads as a channel, or a base the geologist
//! ranked as a storey surface or body base. A basal lag thinner than `lag_limit_m` is the floor
//! of the storey above it. A storey takes in the sand and gravel above its base and mud drapes
//! thinner than the drape limit, up to the next storey surface, the first fines that end it
//! (paleosol, covered interval, non-clastic bed, fines at least the drape limit thick) or a
//! paleosol profile on its own sandstone top.

use super::bodies::profile;
use super::column::{Column, TOL};
use super::params::RuleParams;
use super::types::{Element, GrainProfile, Storey};
use crate::model::{BaseRank, Bed, Contact, LithologyFamily, Section, Structure};

/// The element a bed is read as before storeys are known (sand and gravel start as splays and
/// become channel deposits when a storey takes them in).
fn first_reading(family: LithologyFamily, in_profile: bool) -> Element {
    match family {
        LithologyFamily::Covered => Element::Covered,
        LithologyFamily::NonClastic => Element::Other,
        LithologyFamily::Fines if in_profile => Element::Paleosol,
        LithologyFamily::Fines => Element::OverbankFines,
        LithologyFamily::Sand | LithologyFamily::Gravel => Element::SplaySand,
    }
}

/// True when the geologist ranked this bed's base a storey surface or a body base.
fn ranked_surface(rank: Option<BaseRank>) -> bool {
    matches!(rank, Some(BaseRank::StoreySurface | BaseRank::BodyBase))
}

/// Signs for a channel and for a splay in the sand run `first..=last` resting on fines (the
/// decision table documented on [`RuleParams::splay_limit_m`]).
pub(crate) fn channel_and_splay_signs(
    section: &Section,
    column: &Column,
    first: usize,
    last: usize,
    params: &RuleParams,
) -> (usize, usize) {
    let beds: Vec<&Bed> = section.beds.range(first..=last).collect();
    let base = beds[0];
    let thickness_m = column.bounds_m[last + 1] - column.bounds_m[first];
    let any = |s: Structure| beds.iter().any(|b| b.structures.contains(&s));
    let mut channel = 0;
    let mut splay = 0;
    let erosional = base.base_contact == Contact::Erosional || base.base_relief_m.is_some_and(|r| r > 0.0);
    if erosional {
        channel += 1;
    } else {
        splay += 1;
    }
    if column.facts[first].is_lag(params) || base.structures.contains(&Structure::BasalLag) {
        channel += 1;
    }
    if any(Structure::TroughCrossBedding) || any(Structure::PlanarCrossBedding) {
        channel += 1;
    }
    if any(Structure::LateralAccretion) || any(Structure::DownstreamAccretion) {
        channel += 1;
    }
    let tractive = [
        Structure::TroughCrossBedding,
        Structure::PlanarCrossBedding,
        Structure::LateralAccretion,
        Structure::DownstreamAccretion,
        Structure::Imbrication,
        Structure::BasalLag,
        Structure::MudClasts,
    ];
    if (any(Structure::RippleCrossLamination) || any(Structure::HorizontalLamination))
        && !tractive.iter().any(|s| any(*s))
    {
        splay += 1;
    }
    match profile(section, first, last, params) {
        GrainProfile::FiningUpward => channel += 1,
        GrainProfile::CoarseningUpward => splay += 1,
        _ => {}
    }
    if thickness_m >= params.splay_limit_m - TOL {
        channel += 1;
    } else {
        splay += 1;
    }
    let coarsest = beds.iter().copied().filter_map(Bed::coarsest_grain).map(|g| g.class()).max();
    if coarsest.is_some_and(|c| c <= params.splay_max_grain) {
        splay += 1;
    }
    (channel, splay)
}

/// True when the sand run `first..=last` on fines reads as a channel deposit.
fn reads_as_channel(
    section: &Section,
    column: &Column,
    first: usize,
    last: usize,
    params: &RuleParams,
) -> bool {
    let (channel, splay) = channel_and_splay_signs(section, column, first, last, params);
    let thickness_m = column.bounds_m[last + 1] - column.bounds_m[first];
    channel > splay || (channel == splay && thickness_m >= params.splay_limit_m - TOL)
}

/// A storey being built during the upward scan.
struct OpenStorey {
    first_bed: usize,
    /// Highest sand or gravel bed taken in so far (drapes above it are not yet part of it).
    last_sand_bed: usize,
    amalgamated_base: bool,
}

/// What the rules need to know about each bed before the upward scan.
struct Reading<'a> {
    column: &'a Column,
    params: &'a RuleParams,
    profile_of: &'a [Option<usize>],
}

impl Reading<'_> {
    /// A sand bed with a paleosol profile on it that does not go on into the next sand bed: the
    /// storey ends with it (a soil on a sandstone top).
    fn capped(&self, i: usize) -> bool {
        let facts = &self.column.facts;
        self.profile_of[i].is_some()
            && (i + 1 >= facts.len()
                || !facts[i + 1].sand_or_gravel()
                || self.profile_of[i + 1] != self.profile_of[i])
    }

    /// The base of sand bed `i` rests on a basal lag.
    fn rests_on_lag(&self, i: usize) -> bool {
        i > 0 && self.column.facts[i - 1].is_lag(self.params)
    }

    /// For each bed, whether its base is a storey surface when met inside a storey: ranked so by
    /// the geologist, or an erosional base (not resting on a lag) whose sand reaches the minimum
    /// storey thickness before the next such surface. One downward pass.
    fn storey_surfaces(&self) -> Vec<bool> {
        let beds = &self.column.facts;
        let n = beds.len();
        let bounds = &self.column.bounds_m;
        let p = self.params;
        let mut surface = vec![false; n];
        // Top of the last sand bed reached from each bed's base, through lag-resting and
        // non-erosional beds, scours and thin drapes.
        let mut reach_m = vec![0.0; n];
        // Thickness of the run of overbank fines starting at each bed, and the bed above it.
        let mut fines_m = vec![0.0; n + 1];
        let mut after_fines = vec![n; n + 1];
        let is_fines = |j: usize| {
            !beds[j].sand_or_gravel()
                && self.profile_of[j].is_none()
                && beds[j].family == LithologyFamily::Fines
        };
        for i in (0..n).rev() {
            if is_fines(i) {
                let above = if i + 1 < n && is_fines(i + 1) {
                    (fines_m[i + 1], after_fines[i + 1])
                } else {
                    (0.0, i + 1)
                };
                fines_m[i] = beds[i].thickness_m + above.0;
                after_fines[i] = above.1;
            }
            if !beds[i].sand_or_gravel() {
                continue;
            }
            let breaks = |k: usize| ranked_surface(beds[k].base_rank) || surface[k];
            let next = if self.capped(i) || i + 1 >= n {
                None
            } else if beds[i + 1].sand_or_gravel() {
                Some(i + 1)
            } else if is_fines(i + 1) && fines_m[i + 1] < p.drape_limit_m - TOL {
                Some(after_fines[i + 1]).filter(|&k| k < n && beds[k].sand_or_gravel())
            } else {
                None
            };
            reach_m[i] = match next.filter(|&k| !breaks(k)) {
                Some(k) => reach_m[k],
                None => bounds[i + 1],
            };
            let bed = &beds[i];
            surface[i] = match bed.base_rank {
                Some(BaseRank::StoreySurface | BaseRank::BodyBase) => true,
                Some(BaseRank::WithinStorey) => false,
                None => {
                    bed.contact == Contact::Erosional
                        && !self.rests_on_lag(i)
                        && reach_m[i] - bounds[i] >= p.min_storey_m - TOL
                }
            };
        }
        surface
    }
}

/// Elements (one per bed) and storeys (base first) of a section, given the paleosol profile each
/// bed belongs to. Linear in the number of beds. Storeys' `body` is filled by the body rules.
pub fn elements_and_storeys(
    section: &Section,
    column: &Column,
    profile_of: &[Option<usize>],
    params: &RuleParams,
) -> (Vec<Element>, Vec<Storey>) {
    let beds = &column.facts;
    let n = beds.len();
    let reading = Reading { column, params, profile_of };
    let mut elements: Vec<Element> = (0..n)
        .map(|i| first_reading(beds[i].family, profile_of.get(i).copied().flatten().is_some()))
        .collect();
    let surfaces = reading.storey_surfaces();
    let mut storeys = Vec::new();
    let mut open: Option<OpenStorey> = None;
    // Thickness of the fines met since the last sand bed of the open storey.
    let mut drape_m = 0.0;

    let close = |open: OpenStorey,
                 last_bed: usize,
                 capped: bool,
                 elements: &mut Vec<Element>,
                 storeys: &mut Vec<Storey>| {
        for el in &mut elements[open.first_bed..=last_bed] {
            *el = Element::ChannelDeposit;
        }
        storeys.push(Storey {
            base_m: column.bounds_m[open.first_bed],
            top_m: column.bounds_m[last_bed + 1],
            first_bed: open.first_bed,
            last_bed,
            amalgamated_base: open.amalgamated_base,
            capped_by_paleosol: capped,
            body: 0,
        });
    };

    let mut i = 0;
    while i < n {
        let bed = &beds[i];
        let t = bed.thickness_m;
        if bed.sand_or_gravel() {
            if let Some(o) = open.as_mut() {
                if surfaces[i] {
                    // Resting on channel sand only when the bed below is the open storey's sand.
                    let amalgamated_base = o.last_sand_bed + 1 == i;
                    if let Some(o) = open.take() {
                        // The storey below runs up to this base, drapes included.
                        close(o, i - 1, false, &mut elements, &mut storeys);
                    }
                    open = Some(OpenStorey { first_bed: i, last_sand_bed: i, amalgamated_base });
                } else {
                    // A scour, set boundary or non-erosional base: the storey goes on, drapes
                    // below it included.
                    o.last_sand_bed = i;
                }
                drape_m = 0.0;
                if reading.capped(i) {
                    if let Some(o) = open.take() {
                        close(o, i, true, &mut elements, &mut storeys);
                    }
                }
                i += 1;
                continue;
            }
            // A run of sand resting on fines: the beds above its base up to the next storey
            // surface the geologist ranked, a soil on its top or an erosional base not on a lag.
            let mut j = i + 1;
            while j < n
                && beds[j].sand_or_gravel()
                && !reading.capped(j - 1)
                && !ranked_surface(beds[j].base_rank)
                && (beds[j].contact != Contact::Erosional
                    || reading.rests_on_lag(j)
                    || beds[j].base_rank == Some(BaseRank::WithinStorey))
            {
                j += 1;
            }
            if ranked_surface(bed.base_rank) || reads_as_channel(section, column, i, j - 1, params) {
                let o = OpenStorey { first_bed: i, last_sand_bed: j - 1, amalgamated_base: false };
                drape_m = 0.0;
                if reading.capped(j - 1) {
                    close(o, j - 1, true, &mut elements, &mut storeys);
                } else {
                    open = Some(o);
                }
            }
            i = j;
            continue;
        } else if open.is_some()
            && elements[i] == Element::OverbankFines
            && drape_m + t < params.drape_limit_m - TOL
        {
            drape_m += t;
        } else if let Some(o) = open.take() {
            let last = o.last_sand_bed;
            close(o, last, false, &mut elements, &mut storeys);
            drape_m = 0.0;
        }
        i += 1;
    }
    if let Some(o) = open.take() {
        let last = o.last_sand_bed;
        close(o, last, false, &mut elements, &mut storeys);
    }
    (elements, storeys)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Bed, BedId, GrainSize, Lithology, PaleosolDevelopment, WentworthClass};

    fn bed(t: f64, lith: Lithology, contact: Contact) -> Bed {
        let grain = match lith.family() {
            LithologyFamily::Fines => Some(GrainSize::Class(WentworthClass::Silt)),
            LithologyFamily::Sand => Some(GrainSize::Class(WentworthClass::MediumSand)),
            LithologyFamily::Gravel => Some(GrainSize::Class(WentworthClass::Pebble)),
            _ => None,
        };
        let mut b = Bed::new(BedId(0), t, lith, grain);
        b.base_contact = contact;
        b
    }

    fn run(beds: Vec<Bed>) -> (Vec<Element>, Vec<Storey>) {
        let mut s = Section::new("t");
        for (i, mut b) in beds.into_iter().enumerate() {
            b.id = BedId(i as u64 + 1);
            s.beds.push(b);
        }
        let col = Column::new(&s);
        let params = RuleParams::default();
        let profiles = super::super::paleosols::profiles(&s, &col, &params);
        let of = super::super::paleosols::profile_of_bed(s.beds.len(), &profiles);
        elements_and_storeys(&s, &col, &of, &params)
    }

    use Contact::{Erosional as E, Gradational as G, Sharp as S};
    use Lithology::{Conglomerate as Cg, Mudstone as Md, Sandstone as Ss};

    #[test]
    fn drape_kept_thick_fines_end_storey() {
        // Md 2 | Ss 2 (E) | Md 0.3 | Ss 1 (S) | Md 0.6 | Ss 0.5 (S)
        // Storey: beds 1–3 (0.3 m drape < 0.5 m kept); 0.6 m fines end it; last sand is a splay.
        let (el, st) = run(vec![
            bed(2.0, Md, S),
            bed(2.0, Ss, E),
            bed(0.3, Md, S),
            bed(1.0, Ss, S),
            bed(0.6, Md, S),
            bed(0.5, Ss, S),
        ]);
        assert_eq!(st.len(), 1);
        assert_eq!((st[0].first_bed, st[0].last_bed, st[0].base_m, st[0].top_m), (1, 3, 2.0, 5.3));
        assert_eq!(el[2], Element::ChannelDeposit);
        assert_eq!(el[4], Element::OverbankFines);
        assert_eq!(el[5], Element::SplaySand);
    }

    #[test]
    fn erosional_base_on_sand_is_amalgamated() {
        // Cg 1 (E) | Ss 2 (G) | Ss 3 (E) | Md 1 | Ss 2 (E)
        let (_, st) =
            run(vec![bed(1.0, Cg, E), bed(2.0, Ss, G), bed(3.0, Ss, E), bed(1.0, Md, S), bed(2.0, Ss, E)]);
        assert_eq!(st.len(), 3);
        assert_eq!((st[0].first_bed, st[0].last_bed, st[0].amalgamated_base), (0, 1, false));
        assert_eq!((st[1].first_bed, st[1].last_bed, st[1].amalgamated_base), (2, 2, true));
        assert_eq!((st[2].first_bed, st[2].amalgamated_base), (4, false));
    }

    #[test]
    fn thick_sharp_based_sand_run_is_a_channel_thin_one_a_splay() {
        // Two sharp 0.6 m sands in a row make 1.2 m ≥ 1.0 m: a storey. A lone 0.9 m sand: splay.
        let (el, st) = run(vec![
            bed(3.0, Md, S),
            bed(0.6, Ss, S),
            bed(0.6, Ss, S),
            bed(3.0, Md, S),
            bed(0.9, Ss, S),
            bed(3.0, Md, S),
        ]);
        assert_eq!(st.len(), 1);
        assert_eq!((st[0].first_bed, st[0].last_bed), (1, 2));
        assert_eq!(el[4], Element::SplaySand);
    }

    #[test]
    fn paleosol_ends_storey_even_when_thin() {
        let mut soil = bed(0.2, Md, S);
        soil.paleosol = PaleosolDevelopment::Weak;
        let (el, st) = run(vec![bed(2.0, Ss, E), soil, bed(2.0, Ss, S)]);
        assert_eq!(el[1], Element::Paleosol);
        // The sharp sand above the paleosol is a new run ≥ 1 m: its own storey.
        assert_eq!(st.len(), 2);
        assert_eq!(st[0].last_bed, 0);
    }

    /// Md 2 | Cg 0.3 (E, lag) | Ss 2 (E) | Ss 0.6 (E) | Ss 1.5 (E) | Md 2.
    fn lag_and_scour() -> Vec<Bed> {
        vec![
            bed(2.0, Md, S),
            bed(0.3, Cg, E),
            bed(2.0, Ss, E),
            bed(0.6, Ss, E),
            bed(1.5, Ss, E),
            bed(2.0, Md, S),
        ]
    }

    #[test]
    fn a_lag_is_the_floor_of_the_storey_above_and_thin_scours_stay_inside() {
        // Miall 1996: a basal lag floors the storey; scours and set boundaries rank below storey
        // surfaces. Md 2 | Cg 0.3 (E, lag) | Ss 2 (E) | Ss 0.6 (E, scour) | Ss 1.5 (E) | Md 2.
        // Working: the lag (0.3 < 0.5 m) and the sand on it make one storey; the 0.6 m scour fill
        // is followed by a 1.5 m erosional sand, so it reaches only 0.6 m (< 1 m): no new storey;
        // the 1.5 m sand is a storey of its own, amalgamated. Two storeys: 2–4.9, 4.9–6.4 m.
        let (_, st) = run(lag_and_scour());
        let got: Vec<(usize, usize, bool)> =
            st.iter().map(|s| (s.first_bed, s.last_bed, s.amalgamated_base)).collect();
        assert_eq!(got, vec![(1, 3, false), (4, 4, true)]);
    }

    #[test]
    fn the_geologists_rank_overrides_the_rules() {
        // The same beds, with the 0.6 m scour ranked a storey surface and the 1.5 m base ranked
        // within the storey: storeys 2–4.3 and 4.3–6.4 m.
        let mut beds = lag_and_scour();
        beds[3].base_rank = Some(BaseRank::StoreySurface);
        beds[4].base_rank = Some(BaseRank::WithinStorey);
        let (_, st) = run(beds);
        let got: Vec<(usize, usize)> = st.iter().map(|s| (s.first_bed, s.last_bed)).collect();
        assert_eq!(got, vec![(1, 2), (3, 4)]);
    }

    #[test]
    fn a_soil_on_a_sandstone_top_caps_the_storey() {
        // Ss 2 (E) with a weak soil logged on the sand itself, then Ss 2 (E): two storeys, the
        // first capped by the paleosol (Retallack 2001: a soil marks a break in deposition).
        let mut top = bed(2.0, Ss, E);
        top.paleosol = PaleosolDevelopment::Weak;
        let (_, st) = run(vec![bed(1.0, Md, S), top, bed(2.0, Ss, E), bed(1.0, Md, S)]);
        assert_eq!(st.len(), 2);
        assert!(st[0].capped_by_paleosol && !st[1].capped_by_paleosol);
    }
}
