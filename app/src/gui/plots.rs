//! Plots of the interpreted section: channel-body proportion and grain size against height, and a
//! histogram of channel-body thicknesses, every axis named with its quantity and unit, lengths in
//! the section's display unit.

use super::document::Document;
use super::theme;
use aggrade_core::model::{LengthUnit, Section};
use aggrade_core::rules::Interpretation;
use egui_plot::{AxisHints, Bar, BarChart, GridInput, GridMark, Line, Plot, PlotPoints};

/// Ids of the three plots (`egui::Id::unique` of these; their memory holds the bounds shown).
pub const PROPORTION_PLOT: &str = "aggrade_plot_proportion";
pub const GRAIN_PLOT: &str = "aggrade_plot_grain_size";
pub const THICKNESS_PLOT: &str = "aggrade_plot_body_thickness";

/// The unit lengths are plotted in: feet for a section logged in feet, else metres.
pub fn plot_unit(section: &Section) -> LengthUnit {
    match section.display_unit {
        LengthUnit::Foot => LengthUnit::Foot,
        _ => LengthUnit::Metre,
    }
}

/// The names of a plot's axes, each with its quantity and unit.
#[derive(Debug, Clone, PartialEq)]
pub struct AxisNames {
    pub title: String,
    pub x: String,
    pub y: String,
}

/// Axis names of the three plots for a section in `unit`, the proportion window `window_m` long.
pub fn axis_names(unit: LengthUnit, window_m: f64) -> [AxisNames; 3] {
    let u = unit.name();
    [
        AxisNames {
            title: format!("Channel-body proportion, {} moving window", window_text(unit, window_m)),
            x: "channel bodies (% of thickness)".into(),
            y: format!("height ({u})"),
        },
        AxisNames {
            title: "Grain size against height".into(),
            x: "grain size (φ), coarser to the right".into(),
            y: format!("height ({u})"),
        },
        AxisNames {
            title: "Channel-body thicknesses".into(),
            x: format!("channel-body thickness ({u})"),
            y: "number of bodies".into(),
        },
    ]
}

/// "10 m" or "32.8 ft".
fn window_text(unit: LengthUnit, window_m: f64) -> String {
    let v = unit.from_metres(window_m);
    if (v - v.round()).abs() < 0.05 {
        format!("{v:.0} {}", unit.name())
    } else {
        format!("{v:.1} {}", unit.name())
    }
}

/// Bins of a thickness histogram: (bin start, count), with a bin width chosen for the data; the
/// thicknesses and bins in one unit, whatever the caller gives.
pub fn histogram(thicknesses: &[f64]) -> (f64, Vec<(f64, usize)>) {
    let max = thicknesses.iter().copied().fold(0.0, f64::max);
    if thicknesses.is_empty() || max <= 0.0 {
        return (1.0, Vec::new());
    }
    let width = [0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0].into_iter().find(|w| max / w <= 12.0).unwrap_or(100.0);
    let n = (max / width).floor() as usize + 1;
    let mut bins = vec![0usize; n];
    for t in thicknesses {
        bins[((t / width).floor() as usize).min(n - 1)] += 1;
    }
    (width, bins.into_iter().enumerate().map(|(i, c)| (i as f64 * width, c)).collect())
}

/// Fraction of a bin's width a bar fills (a gap between neighbours).
const BAR_FILL: f64 = 0.9;

/// The bars of a histogram: (centre, height, width).
pub fn histogram_bars(width: f64, bins: &[(f64, usize)]) -> Vec<(f64, f64, f64)> {
    bins.iter().map(|(x, c)| (x + width / 2.0, *c as f64, width * BAR_FILL)).collect()
}

/// The x and y ranges a histogram must show whole: from 0 to the right edge of the last bin (so
/// the last bar is never cut off) and from 0 to the tallest bar plus room above it.
pub fn histogram_extent(width: f64, bins: &[(f64, usize)]) -> ([f64; 2], [f64; 2]) {
    let right = bins.last().map(|(x, _)| x + width).unwrap_or(width);
    let top = bins.iter().map(|b| b.1).max().unwrap_or(0).max(1) as f64;
    ([0.0, right], [0.0, top + 0.5])
}

/// The grain-size profile as runs of points (−φ, height in `unit`), base and top of each bed; a
/// bed without a grain size breaks the line.
pub fn grain_runs(section: &Section, unit: LengthUnit) -> Vec<Vec<[f64; 2]>> {
    let mut runs: Vec<Vec<[f64; 2]>> = Vec::new();
    let mut run: Vec<[f64; 2]> = Vec::new();
    for (b, base) in section.beds.iter().zip(section.base_heights_m()) {
        match (b.grain_base.or(b.grain_top), b.grain_top.or(b.grain_base)) {
            (Some(gb), Some(gt)) if !b.is_covered() => {
                run.push([-gb.phi(), unit.from_metres(base)]);
                run.push([-gt.phi(), unit.from_metres(base + b.usable_thickness_m())]);
            }
            _ => {
                if !run.is_empty() {
                    runs.push(std::mem::take(&mut run));
                }
            }
        }
    }
    if !run.is_empty() {
        runs.push(run);
    }
    runs
}

/// Grid marks every `steps[0]`, stronger every `steps[1]` and `steps[2]`.
fn uniform_marks(input: GridInput, steps: [f64; 3]) -> Vec<GridMark> {
    let (lo, hi) = input.bounds;
    let mut marks = Vec::new();
    let first = (lo / steps[0]).ceil() as i64;
    let last = (hi / steps[0]).floor() as i64;
    for k in first..=last.min(first + 2000) {
        let value = k as f64 * steps[0];
        let step_size = steps
            .iter()
            .rev()
            .copied()
            .find(|s| (value / s - (value / s).round()).abs() < 1e-9)
            .unwrap_or(steps[0]);
        marks.push(GridMark { value, step_size });
    }
    marks
}

/// An x axis named `label` whose tick labels may stand closer than the default, so that a narrow
/// plot still numbers its axis.
fn x_axis<'a>(label: &str) -> AxisHints<'a> {
    AxisHints::new_x().label(label.to_string()).label_spacing(28.0..=40.0)
}

fn y_axis<'a>(label: &str) -> AxisHints<'a> {
    AxisHints::new_y().label(label.to_string())
}

/// Draw the three plots.
pub fn ui(ui: &mut egui::Ui, doc: &Document, interp: &Interpretation) {
    let s = doc.section();
    let unit = plot_unit(s);
    let [prop, grain, thick] = axis_names(unit, interp.params.window_m);
    let h = ((ui.available_height() - 90.0) / 3.0).max(120.0);

    ui.label(egui::RichText::new(&prop.title).strong());
    let curve: Vec<[f64; 2]> = interp
        .proportion_curve
        .iter()
        .filter_map(|c| c.proportion.map(|p| [100.0 * p, unit.from_metres(c.height_m)]))
        .collect();
    Plot::new(PROPORTION_PLOT)
        .id(egui::Id::unique(PROPORTION_PLOT))
        .height(h)
        .include_x(0.0)
        .include_x(100.0)
        .x_grid_spacer(|i| uniform_marks(i, [10.0, 20.0, 100.0]))
        .custom_x_axes(vec![x_axis(&prop.x)])
        .custom_y_axes(vec![y_axis(&prop.y)])
        .allow_scroll(false)
        .show(ui, |p| {
            p.line(Line::new("channel bodies (%)", PlotPoints::from(curve)).color(theme::ACCENT).width(1.5))
        });

    ui.label(egui::RichText::new(&grain.title).strong());
    let runs = grain_runs(s, unit);
    Plot::new(GRAIN_PLOT)
        .id(egui::Id::unique(GRAIN_PLOT))
        .height(h)
        .x_grid_spacer(|i| uniform_marks(i, [1.0, 2.0, 4.0]))
        .custom_x_axes(vec![x_axis(&grain.x).formatter(|m, _| format!("{}", -m.value))])
        .custom_y_axes(vec![y_axis(&grain.y)])
        .allow_scroll(false)
        .show(ui, |p| {
            for (k, run) in runs.into_iter().enumerate() {
                p.line(
                    Line::new(format!("grain size {k}"), PlotPoints::from(run)).color(theme::WARN).width(1.2),
                );
            }
        });

    ui.label(egui::RichText::new(&thick.title).strong());
    let th: Vec<f64> = interp.channel_bodies.iter().map(|b| unit.from_metres(b.thickness_m)).collect();
    let (w, bins) = histogram(&th);
    let bars: Vec<Bar> =
        histogram_bars(w, &bins).into_iter().map(|(x, c, bw)| Bar::new(x, c).width(bw)).collect();
    let ([x0, x1], [y0, y1]) = histogram_extent(w, &bins);
    // One series, named by the title: no legend to stand over a bar.
    Plot::new(THICKNESS_PLOT)
        .id(egui::Id::unique(THICKNESS_PLOT))
        .height(h)
        .include_x(x0)
        .include_x(x1)
        .include_y(y0)
        .include_y(y1)
        .custom_x_axes(vec![x_axis(&thick.x)])
        .custom_y_axes(vec![y_axis(&thick.y).formatter(|m, _| {
            // Counts are whole numbers.
            if (m.value - m.value.round()).abs() < 1e-9 {
                format!("{:.0}", m.value)
            } else {
                String::new()
            }
        })])
        .allow_scroll(false)
        .show(ui, |p| p.bar_chart(BarChart::new("bodies", bars).color(theme::ACCENT)));
}

#[cfg(test)]
mod tests {
    use super::*;
    use aggrade_core::model::{Bed, BedId, GrainSize, Lithology, WentworthClass};

    #[test]
    fn histogram_counts_every_body_once() {
        let th = [0.4, 1.2, 1.9, 2.0, 7.5, 3.3];
        let (w, bins) = histogram(&th);
        assert_eq!(w, 1.0);
        assert_eq!(bins.iter().map(|b| b.1).sum::<usize>(), th.len());
        assert_eq!(bins[1], (1.0, 2));
        assert_eq!(bins[2], (2.0, 1));
        assert_eq!(histogram(&[]).1.len(), 0);
    }

    #[test]
    fn the_extent_holds_the_last_bar_whole() {
        let (w, bins) = histogram(&[0.4, 1.2, 4.3]);
        let ([x0, x1], [y0, y1]) = histogram_extent(w, &bins);
        let bars = histogram_bars(w, &bins);
        let (c, h, bw) = bars[bars.len() - 1];
        assert!(x0 <= 0.0 && x1 >= c + bw / 2.0, "the last bar's right edge {} inside {x1}", c + bw / 2.0);
        assert!(y0 <= 0.0 && y1 > h);
        assert_eq!(bars.iter().filter(|b| b.1 > 0.0).count(), 3);
    }

    #[test]
    fn axes_name_their_unit_and_lengths_follow_the_display_unit() {
        let [p, g, t] = axis_names(LengthUnit::Foot, 10.0);
        assert_eq!(p.y, "height (ft)");
        assert_eq!(g.y, "height (ft)");
        assert_eq!(t.x, "channel-body thickness (ft)");
        // 10 m = 32.8 ft (1 ft = 0.3048 m exactly).
        assert!(p.title.contains("32.8 ft moving window"), "{}", p.title);
        assert!(axis_names(LengthUnit::Metre, 10.0)[0].title.contains("10 m moving window"));
        for a in axis_names(LengthUnit::Metre, 10.0) {
            assert!(!a.x.is_empty() && !a.y.is_empty(), "{a:?}");
        }
        // A foot section: heights in feet; a covered bed breaks the grain-size line.
        let mut s = Section::new("Feet");
        s.display_unit = LengthUnit::Foot;
        let sand = Some(GrainSize::Class(WentworthClass::MediumSand));
        s.beds.push(Bed::new(BedId(1), 3.048, Lithology::Sandstone, sand));
        s.beds.push(Bed::new(BedId(2), 1.0, Lithology::Covered, None));
        s.beds.push(Bed::new(BedId(3), 0.3048, Lithology::Sandstone, sand));
        let runs = grain_runs(&s, plot_unit(&s));
        assert_eq!(runs.len(), 2);
        assert!((runs[0][1][1] - 10.0).abs() < 1e-9, "top of bed 1 at 10 ft: {:?}", runs[0]);
        // Medium sand is 1–2 φ (Wentworth 1922), drawn at −φ so that coarser is to the right.
        assert!(runs[0][0][0] <= -1.0 && runs[0][0][0] >= -2.0, "{:?}", runs[0]);
    }
}
