//! Plots of the interpreted section: channel-body proportion and grain size against height, and a
//! histogram of channel-body thicknesses.

use super::document::Document;
use super::theme;
use aggrade_core::rules::Interpretation;
use egui_plot::{Bar, BarChart, Legend, Line, Plot, PlotPoints};

/// Bins of a thickness histogram: (bin start m, count), with a bin width chosen for the data.
pub fn histogram(thicknesses_m: &[f64]) -> (f64, Vec<(f64, usize)>) {
    let max = thicknesses_m.iter().copied().fold(0.0, f64::max);
    if thicknesses_m.is_empty() || max <= 0.0 {
        return (1.0, Vec::new());
    }
    let width = [0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 50.0].into_iter().find(|w| max / w <= 12.0).unwrap_or(100.0);
    let n = (max / width).floor() as usize + 1;
    let mut bins = vec![0usize; n];
    for t in thicknesses_m {
        bins[((t / width).floor() as usize).min(n - 1)] += 1;
    }
    (width, bins.into_iter().enumerate().map(|(i, c)| (i as f64 * width, c)).collect())
}

/// Draw the three plots.
pub fn ui(ui: &mut egui::Ui, doc: &Document, interp: &Interpretation) {
    let h = ((ui.available_height() - 60.0) / 3.0).max(120.0);
    ui.label("Channel-body proportion vs height (m)");
    let curve: Vec<[f64; 2]> =
        interp.proportion_curve.iter().filter_map(|c| c.proportion.map(|p| [p, c.height_m])).collect();
    Plot::new("proportion_plot")
        .height(h)
        .include_x(0.0)
        .include_x(1.0)
        .x_axis_label("proportion")
        .y_axis_label("height (m)")
        .allow_scroll(false)
        .show(ui, |p| {
            p.line(Line::new("proportion", PlotPoints::from(curve)).color(theme::ACCENT).width(1.5))
        });
    ui.label("Grain size vs height");
    let s = doc.section();
    let base = s.base_heights_m();
    let mut pts = Vec::new();
    for (b, h0) in s.beds.iter().zip(&base) {
        if let (Some(gb), gt) = (b.grain_base, b.grain_top.or(b.grain_base)) {
            pts.push([gb.phi(), *h0]);
            pts.push([gt.map(|g| g.phi()).unwrap_or(gb.phi()), h0 + b.thickness_m]);
        }
    }
    Plot::new("grain_plot")
        .height(h)
        .x_axis_label("phi (coarser to the left)")
        .y_axis_label("height (m)")
        .allow_scroll(false)
        .show(ui, |p| {
            p.line(Line::new("grain size (φ)", PlotPoints::from(pts)).color(theme::WARN).width(1.2))
        });
    ui.label("Channel-body thicknesses");
    let th: Vec<f64> = interp.channel_bodies.iter().map(|b| b.thickness_m).collect();
    let (w, bins) = histogram(&th);
    let bars: Vec<Bar> = bins.iter().map(|(x, c)| Bar::new(x + w / 2.0, *c as f64).width(w * 0.9)).collect();
    Plot::new("body_hist")
        .height(h)
        .legend(Legend::default())
        .x_axis_label("thickness (m)")
        .y_axis_label("bodies")
        .allow_scroll(false)
        .show(ui, |p| p.bar_chart(BarChart::new("bodies", bars).color(theme::ACCENT)));
}

#[cfg(test)]
mod tests {
    use super::*;

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
}
