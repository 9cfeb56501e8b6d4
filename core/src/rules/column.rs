//! Bed heights and prefix sums of channel-deposit and exposed thickness, so that any window's
//! channel-body proportion costs a binary search instead of a scan.

use super::params::RuleParams;
use super::types::Element;
use crate::model::{BaseRank, Bed, BedId, Contact, LithologyFamily, PaleosolDevelopment, Section};
use crate::model::{Structure, SurfaceKind, WentworthClass};

/// Allowance on threshold comparisons of lengths (metres) and proportions: rounding left by unit
/// conversion (e.g. feet to metres) must not flip a call that sits exactly on a threshold.
pub(crate) const TOL: f64 = 1e-9;

/// Family of a bed's lithology (shorthand).
pub(crate) fn family(bed: &Bed) -> LithologyFamily {
    bed.lithology.family()
}

/// True for sandstone, conglomerate and breccia.
pub(crate) fn is_sand_or_gravel(bed: &Bed) -> bool {
    matches!(family(bed), LithologyFamily::Sand | LithologyFamily::Gravel)
}

/// True when a bed was logged as a soil horizon (a paleosol development, soil features, a
/// carbonate stage, a horizon designation or a drainage class).
pub(crate) fn is_horizon(bed: &Bed) -> bool {
    !bed.is_covered()
        && (bed.paleosol != PaleosolDevelopment::None
            || !bed.paleosol_features.is_empty()
            || bed.carbonate_stage.is_some()
            || bed.soil_horizon.is_some()
            || bed.drainage.is_some())
}

/// What the rules read of one bed most often, gathered in a single upward pass. The beds of a
/// long section are tens of megabytes (text, photos, samples …), so every rule pass that read
/// them again went to main memory; this table is a few tens of bytes a bed, and passes over it
/// stay in cache. Anything else a rule needs it reads from the bed itself.
#[derive(Debug, Clone, Copy)]
pub(crate) struct BedFacts {
    pub id: BedId,
    /// [`Bed::usable_thickness_m`].
    pub thickness_m: f64,
    /// The logged base relief, m; NaN when none was logged (every test of it is false for NaN,
    /// as it was for no value).
    pub relief_m: f64,
    pub family: LithologyFamily,
    pub contact: Contact,
    pub base_rank: Option<BaseRank>,
    pub paleosol: PaleosolDevelopment,
    /// Wentworth class of the grain size at the base and at the top, as logged.
    pub grain_base: Option<WentworthClass>,
    pub grain_top: Option<WentworthClass>,
    /// Logged as a soil horizon (see `paleosols`).
    pub horizon: bool,
    /// Logged with a basal-lag structure.
    pub basal_lag: bool,
    /// A named surface at its base, and whether it is tagged an incision surface.
    pub base_surface: bool,
    pub incision_tagged: bool,
}

impl BedFacts {
    /// The facts of one bed.
    pub fn of(bed: &Bed) -> Self {
        BedFacts {
            id: bed.id,
            thickness_m: bed.usable_thickness_m(),
            relief_m: bed.base_relief_m.unwrap_or(f64::NAN),
            family: bed.lithology.family(),
            contact: bed.base_contact,
            base_rank: bed.base_rank,
            paleosol: bed.paleosol,
            grain_base: bed.grain_base.map(|g| g.class()),
            grain_top: bed.grain_top.map(|g| g.class()),
            horizon: is_horizon(bed),
            basal_lag: bed.structures.contains(&Structure::BasalLag),
            base_surface: bed.base_surface.is_some(),
            incision_tagged: bed.base_surface.as_ref().is_some_and(|s| s.kind == SurfaceKind::Incision),
        }
    }

    /// Sandstone, conglomerate or breccia ([`is_sand_or_gravel`]).
    pub fn sand_or_gravel(&self) -> bool {
        matches!(self.family, LithologyFamily::Sand | LithologyFamily::Gravel)
    }

    /// Erosional base relief above zero, m, when logged ([`Bed::base_relief_m`]).
    pub fn erosional_relief_m(&self) -> Option<f64> {
        let r = self.relief_m;
        (r.is_finite() && r > 0.0 && self.contact == Contact::Erosional).then_some(r)
    }

    /// A basal lag: a gravel bed, or one logged with a basal-lag structure, thinner than the
    /// limit.
    pub fn is_lag(&self, params: &RuleParams) -> bool {
        self.sand_or_gravel()
            && (self.family == LithologyFamily::Gravel || self.basal_lag)
            && self.thickness_m < params.lag_limit_m - TOL
    }
}

/// Bed boundaries and cumulative thicknesses of one section.
#[derive(Debug, Clone)]
pub(crate) struct Column {
    /// Heights of bed boundaries, metres: `bounds_m[i]` is the base of bed i, `bounds_m[n]` the top.
    pub bounds_m: Vec<f64>,
    /// What the rules read of each bed (see [`BedFacts`]), base first.
    pub facts: Vec<BedFacts>,
    /// Channel-deposit thickness below each boundary (same indexing as `bounds_m`).
    channel_cum_m: Vec<f64>,
    /// Exposed (not covered) thickness below each boundary.
    exposed_cum_m: Vec<f64>,
}

impl Column {
    /// Boundaries only; the sums are filled by [`Column::with_elements`].
    pub fn new(section: &Section) -> Self {
        let mut bounds_m = Vec::with_capacity(section.beds.len() + 1);
        let mut facts = Vec::with_capacity(section.beds.len());
        let mut h = 0.0;
        bounds_m.push(h);
        for bed in &section.beds {
            let f = BedFacts::of(bed);
            h += f.thickness_m;
            bounds_m.push(h);
            facts.push(f);
        }
        Column { bounds_m, facts, channel_cum_m: Vec::new(), exposed_cum_m: Vec::new() }
    }

    /// Fill the prefix sums from each bed's element.
    pub fn with_elements(mut self, elements: &[Element]) -> Self {
        let n = self.bounds_m.len() - 1;
        let mut channel = Vec::with_capacity(n + 1);
        let mut exposed = Vec::with_capacity(n + 1);
        let (mut c, mut e) = (0.0, 0.0);
        channel.push(c);
        exposed.push(e);
        for (i, el) in elements.iter().enumerate().take(n) {
            let t = self.bounds_m[i + 1] - self.bounds_m[i];
            if *el != Element::Covered {
                e += t;
            }
            if *el == Element::ChannelDeposit {
                c += t;
            }
            channel.push(c);
            exposed.push(e);
        }
        // Fewer elements than beds cannot happen from `interpret`; pad so lookups stay in range.
        while channel.len() < n + 1 {
            channel.push(c);
            exposed.push(e);
        }
        self.channel_cum_m = channel;
        self.exposed_cum_m = exposed;
        self
    }

    /// Total height of the section, metres.
    pub fn total_m(&self) -> f64 {
        self.bounds_m.last().copied().unwrap_or(0.0)
    }

    /// Thickness of bed `i`, metres.
    pub fn thickness_m(&self, i: usize) -> f64 {
        self.bounds_m[i + 1] - self.bounds_m[i]
    }

    /// Channel-deposit thickness over the whole section.
    pub fn channel_total_m(&self) -> f64 {
        self.channel_cum_m.last().copied().unwrap_or(0.0)
    }

    /// Exposed thickness over the whole section.
    pub fn exposed_total_m(&self) -> f64 {
        self.exposed_cum_m.last().copied().unwrap_or(0.0)
    }

    /// Clamp a height into the section (NaN to the base).
    fn clamp_m(&self, h_m: f64) -> f64 {
        if h_m.is_nan() {
            0.0
        } else {
            h_m.clamp(0.0, self.total_m())
        }
    }

    /// Number of beds whose top is at or below `h` (they count in full below h), by bisection.
    fn beds_below(&self, h: f64) -> usize {
        self.bounds_m[1..].partition_point(|&top| top <= h)
    }

    /// Same as [`Column::beds_below`], walking up from a count known to be no higher: used by
    /// sweeps whose heights only rise, so that a whole sweep costs one pass over the beds.
    fn beds_below_from(&self, mut k: usize, h: f64) -> usize {
        let n = self.bounds_m.len() - 1;
        while k < n && self.bounds_m[k + 1] <= h {
            k += 1;
        }
        k
    }

    /// Channel and exposed thickness below height `h` (already clamped), `k` beds lying fully
    /// below it; linear inside the bed that `h` cuts.
    fn sums_at(&self, k: usize, h: f64) -> (f64, f64) {
        let (c, e) = (&self.channel_cum_m, &self.exposed_cum_m);
        if k + 1 >= self.bounds_m.len() {
            return (c[k], e[k]);
        }
        let t = self.thickness_m(k);
        let part = if t > 0.0 { (h - self.bounds_m[k]).clamp(0.0, t) / t } else { 0.0 };
        (c[k] + (c[k + 1] - c[k]) * part, e[k] + (e[k + 1] - e[k]) * part)
    }

    /// Channel-deposit and exposed thickness between two heights (clipped to the section).
    pub fn window_m(&self, base_m: f64, top_m: f64) -> (f64, f64) {
        let (a, b) = (self.clamp_m(base_m), self.clamp_m(top_m));
        self.sums_between((self.beds_below(a), a), (self.beds_below(b), b))
    }

    /// Channel and exposed thickness between two clamped heights, each with its count of beds
    /// fully below it.
    fn sums_between(&self, (ka, a): (usize, f64), (kb, b): (usize, f64)) -> (f64, f64) {
        let (ca, ea) = self.sums_at(ka, a);
        let (cb, eb) = self.sums_at(kb, b);
        ((cb - ca).max(0.0), (eb - ea).max(0.0))
    }

    /// A cursor for windows whose ends rise from one call to the next.
    pub fn rising_windows(&self) -> RisingWindows<'_> {
        RisingWindows { column: self, below_base: 0, below_top: 0 }
    }

    /// Channel-body proportion between two heights; `None` when that stretch has no exposure.
    pub fn proportion(&self, base_m: f64, top_m: f64) -> Option<f64> {
        let (c, e) = self.window_m(base_m, top_m);
        proportion_of(c, e)
    }
}

/// Windows looked up in rising order: each end walks up from where the last window's end was,
/// so a pass of rising windows costs one pass over the beds instead of a bisection per window
/// (an end that falls is found by bisection, so any order gives the same sums).
pub(crate) struct RisingWindows<'a> {
    column: &'a Column,
    /// Beds fully below the last window's base and top.
    below_base: usize,
    below_top: usize,
}

impl RisingWindows<'_> {
    /// Beds fully below `h`, starting from a count `k` found for an earlier height.
    fn below(&self, k: usize, h: f64) -> usize {
        let c = self.column;
        if h >= c.bounds_m[k] {
            c.beds_below_from(k, h)
        } else {
            c.beds_below(h)
        }
    }

    /// Same as [`Column::window_m`].
    pub fn window_m(&mut self, base_m: f64, top_m: f64) -> (f64, f64) {
        let c = self.column;
        let (a, b) = (c.clamp_m(base_m), c.clamp_m(top_m));
        self.below_base = self.below(self.below_base, a);
        self.below_top = self.below(self.below_top, b);
        c.sums_between((self.below_base, a), (self.below_top, b))
    }

    /// Same as [`Column::proportion`].
    pub fn proportion(&mut self, base_m: f64, top_m: f64) -> Option<f64> {
        let (c, e) = self.window_m(base_m, top_m);
        proportion_of(c, e)
    }
}

/// Channel thickness over exposed thickness in 0–1; `None` without exposure. Exposure below a
/// nanometre is treated as none, so rounding left over from subtraction never divides.
pub(crate) fn proportion_of(channel_m: f64, exposed_m: f64) -> Option<f64> {
    if exposed_m > 1e-9 {
        Some((channel_m / exposed_m).clamp(0.0, 1.0))
    } else {
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{BedId, Lithology};

    #[test]
    fn the_facts_table_reads_each_bed_as_the_bed_does() {
        use crate::model::{GrainSize, Surface};
        let p = RuleParams::default();
        let mut beds = Vec::new();
        for (k, lith) in
            [Lithology::Conglomerate, Lithology::Sandstone, Lithology::Mudstone, Lithology::Covered]
                .into_iter()
                .enumerate()
        {
            // Thicknesses either side of the lag limit; relief none, not a number, negative,
            // positive; both contacts; a lag structure and a tagged surface on some.
            for (j, t) in
                [p.lag_limit_m - 0.01, p.lag_limit_m, p.lag_limit_m + 0.01, f64::NAN].into_iter().enumerate()
            {
                let mut b = Bed::new(BedId((k * 10 + j) as u64), t, lith, Some(GrainSize::Phi(1.2)));
                b.base_relief_m = [None, Some(f64::NAN), Some(-0.5), Some(0.7)][j];
                b.base_contact = if j == 1 { Contact::Sharp } else { Contact::Erosional };
                if j == 1 {
                    b.structures.push(Structure::BasalLag);
                    b.base_surface = Some(Surface { name: "S1".into(), kind: SurfaceKind::Incision });
                }
                beds.push(b);
            }
        }
        for b in &beds {
            let f = BedFacts::of(b);
            let lag = is_sand_or_gravel(b)
                && (family(b) == LithologyFamily::Gravel || b.structures.contains(&Structure::BasalLag))
                && b.usable_thickness_m() < p.lag_limit_m - TOL;
            assert_eq!(f.is_lag(&p), lag, "{b:?}");
            assert_eq!(f.sand_or_gravel(), is_sand_or_gravel(b));
            let relief =
                b.base_relief_m.filter(|r| r.is_finite() && *r > 0.0 && b.base_contact == Contact::Erosional);
            assert_eq!(f.erosional_relief_m(), relief, "{b:?}");
            assert_eq!(f.thickness_m.to_bits(), b.usable_thickness_m().to_bits());
            assert_eq!(f.incision_tagged, b.base_surface.is_some());
            assert_eq!(f.grain_base, Some(crate::model::WentworthClass::MediumSand));
        }
        assert!(beds.iter().any(|b| BedFacts::of(b).is_lag(&p)), "some bed is a lag");
        assert!(beds.iter().any(|b| BedFacts::of(b).erosional_relief_m().is_some()), "some relief counts");
    }

    fn section(beds: &[(f64, Lithology)]) -> Section {
        let mut s = Section::new("t");
        for (i, (t, l)) in beds.iter().enumerate() {
            s.beds.push(Bed::new(BedId(i as u64 + 1), *t, *l, None));
        }
        s
    }

    #[test]
    fn window_sums_interpolate_inside_beds() {
        // 0–2 channel, 2–5 covered, 5–6 fines. Window 1–5.5: channel 1, exposed 1 + 0.5.
        let s =
            section(&[(2.0, Lithology::Sandstone), (3.0, Lithology::Covered), (1.0, Lithology::Mudstone)]);
        let col = Column::new(&s).with_elements(&[
            Element::ChannelDeposit,
            Element::Covered,
            Element::OverbankFines,
        ]);
        let (c, e) = col.window_m(1.0, 5.5);
        assert!((c - 1.0).abs() < 1e-12 && (e - 1.5).abs() < 1e-12, "{c} {e}");
        assert_eq!(col.proportion(2.0, 5.0), None);
        assert_eq!(col.proportion(-10.0, 100.0), Some(2.0 / 3.0));
    }

    #[test]
    fn rising_windows_agree_with_separate_windows_even_when_heights_fall() {
        let s = section(&[
            (2.0, Lithology::Sandstone),
            (3.0, Lithology::Covered),
            (1.0, Lithology::Mudstone),
            (4.0, Lithology::Sandstone),
        ]);
        let els =
            [Element::ChannelDeposit, Element::Covered, Element::OverbankFines, Element::ChannelDeposit];
        let col = Column::new(&s).with_elements(&els);
        let heights = [0.0, 0.7, 2.0, 4.9, 5.0, 9.5, 3.0, 1.0, 10.0, 12.0];
        let mut windows = col.rising_windows();
        for h in heights {
            assert_eq!(windows.proportion(h - 1.5, h + 1.5), col.proportion(h - 1.5, h + 1.5), "at {h} m");
        }
    }

    #[test]
    fn bad_thicknesses_count_as_zero() {
        let s = section(&[
            (f64::NAN, Lithology::Sandstone),
            (-1.0, Lithology::Mudstone),
            (1.0, Lithology::Mudstone),
        ]);
        let col = Column::new(&s);
        assert_eq!(col.bounds_m, vec![0.0, 0.0, 0.0, 1.0]);
    }
}
