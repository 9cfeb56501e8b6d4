//! Reading each bed as a depositional element and grouping channel beds into storeys.
//!
//! A storey starts at an erosional base overlain by sand or coarser, or at a run of sharp- or
//! gradational-based sand at least the splay limit thick; it takes in the sand and gravel beds
//! above it and mud drapes thinner than the drape limit, up to the next erosional base or the
//! first fines (paleosol, covered interval, non-clastic bed) that end it.

use super::column::{family, is_sand_or_gravel, usable_thickness_m, Column, TOL};
use super::params::RuleParams;
use super::types::{Element, Storey};
use crate::model::{Contact, LithologyFamily, Section};

/// The element a bed is read as before storeys are known (sand and gravel start as splays and
/// become channel deposits when a storey takes them in).
fn first_reading(section: &Section, i: usize, params: &RuleParams) -> Element {
    let bed = &section.beds[i];
    match family(bed) {
        LithologyFamily::Covered => Element::Covered,
        LithologyFamily::NonClastic => Element::Other,
        LithologyFamily::Fines if bed.paleosol >= params.paleosol_min_development => Element::Paleosol,
        LithologyFamily::Fines => Element::OverbankFines,
        LithologyFamily::Sand | LithologyFamily::Gravel => Element::SplaySand,
    }
}

/// A storey being built during the upward scan.
struct OpenStorey {
    first_bed: usize,
    /// Highest sand or gravel bed taken in so far (drapes above it are not yet part of it).
    last_sand_bed: usize,
    amalgamated_base: bool,
}

/// Elements (one per bed) and storeys (base first) of a section. Linear in the number of beds.
pub fn elements_and_storeys(
    section: &Section,
    column: &Column,
    params: &RuleParams,
) -> (Vec<Element>, Vec<Storey>) {
    let beds = &section.beds;
    let n = beds.len();
    let mut elements: Vec<Element> = (0..n).map(|i| first_reading(section, i, params)).collect();
    let mut storeys = Vec::new();
    let mut open: Option<OpenStorey> = None;
    // Thickness of the fines met since the last sand bed of the open storey.
    let mut drape_m = 0.0;

    let close =
        |open: OpenStorey, last_bed: usize, elements: &mut Vec<Element>, storeys: &mut Vec<Storey>| {
            for el in &mut elements[open.first_bed..=last_bed] {
                *el = Element::ChannelDeposit;
            }
            storeys.push(Storey {
                base_m: column.bounds_m[open.first_bed],
                top_m: column.bounds_m[last_bed + 1],
                first_bed: open.first_bed,
                last_bed,
                amalgamated_base: open.amalgamated_base,
            });
        };

    let mut i = 0;
    while i < n {
        let bed = &beds[i];
        let t = usable_thickness_m(bed);
        if is_sand_or_gravel(bed) {
            if bed.base_contact == Contact::Erosional {
                // Resting on channel sand only when the bed below is the open storey's sand.
                let amalgamated_base = open.as_ref().is_some_and(|o| o.last_sand_bed + 1 == i);
                if let Some(o) = open.take() {
                    // The storey below runs up to this base, drapes included.
                    close(o, i - 1, &mut elements, &mut storeys);
                }
                open = Some(OpenStorey { first_bed: i, last_sand_bed: i, amalgamated_base });
                drape_m = 0.0;
            } else if let Some(o) = open.as_mut() {
                // Continues the storey without a break; drapes below it are taken in.
                o.last_sand_bed = i;
                drape_m = 0.0;
            } else {
                // A run of non-erosional sand inside fines: a splay unless thick enough for a channel.
                let mut j = i;
                let mut run_m = 0.0;
                while j < n
                    && is_sand_or_gravel(&beds[j])
                    && (j == i || beds[j].base_contact != Contact::Erosional)
                {
                    run_m += usable_thickness_m(&beds[j]);
                    j += 1;
                }
                if run_m >= params.splay_limit_m - TOL {
                    open = Some(OpenStorey { first_bed: i, last_sand_bed: j - 1, amalgamated_base: false });
                    drape_m = 0.0;
                }
                i = j;
                continue;
            }
        } else if open.is_some()
            && elements[i] == Element::OverbankFines
            && drape_m + t < params.drape_limit_m - TOL
        {
            drape_m += t;
        } else if let Some(o) = open.take() {
            let last = o.last_sand_bed;
            close(o, last, &mut elements, &mut storeys);
            drape_m = 0.0;
        }
        i += 1;
    }
    if let Some(o) = open.take() {
        let last = o.last_sand_bed;
        close(o, last, &mut elements, &mut storeys);
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
        elements_and_storeys(&s, &col, &RuleParams::default())
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
}
