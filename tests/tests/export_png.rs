//! The PNG writer at true scale, measured by an independent reader: Pillow decodes the file and
//! reports its resolution from the `pHYs` chunk, numpy measures the solid coal beds in pixels,
//! and the lengths must equal thickness ÷ scale × dpi ÷ 25.4 mm per inch (the arithmetic of a
//! 1:N scale) to within a pixel. Python with Pillow and numpy is required (never skipped).

use aggrade_core::export::write_png;
use aggrade_core::layout::{pages, LayoutOptions, Paper, PrintMeta};
use aggrade_core::model::{Bed, BedId, GrainSize, Lithology, Section, WentworthClass};
use aggrade_core::rules::{interpret, RuleParams};
use serde_json::Value;
use std::process::Command;

const MEASURE: &str = r#"
import json, sys
try:
    import numpy as np
    from PIL import Image
except ImportError as e:
    sys.exit("numpy and Pillow are required: " + str(e))
path, x = sys.argv[1], int(sys.argv[2])
img = Image.open(path)
grey = np.asarray(img.convert("L"), dtype=float)
dark = grey[:, x] < 60
runs, start = [], None
for y, d in enumerate(list(dark) + [False]):
    if d and start is None:
        start = y
    elif not d and start is not None:
        if y - start >= 10:
            runs.append([start, y])
        start = None
print(json.dumps({"dpi": list(img.info.get("dpi", [0, 0])), "size": list(img.size), "runs": runs}))
"#;

#[test]
fn coal_beds_measure_their_thickness_at_the_given_dpi() {
    let clay = Some(GrainSize::Class(WentworthClass::Clay));
    let mut s = Section::new("Scale check");
    for (i, (lith, t)) in [
        (Lithology::Mudstone, 1.0),
        (Lithology::Coal, 2.0),
        (Lithology::Mudstone, 1.0),
        (Lithology::Coal, 0.5),
        (Lithology::Mudstone, 1.0),
    ]
    .into_iter()
    .enumerate()
    {
        let g = if lith == Lithology::Coal { None } else { clay };
        s.beds.push(Bed::new(BedId(i as u64 + 1), t, lith, g));
    }
    let interp = interpret(&s, &RuleParams::default());
    let opts = LayoutOptions { scale_denominator: 100.0, paper: Paper::TallSingle, ..Default::default() };
    let page = pages(&s, &interp, &opts, &PrintMeta::default()).remove(0);
    let seg = &page.segments[0];
    let coal = seg.bed_boxes.iter().find(|b| b.bed_index == 1).expect("coal bed drawn");
    for dpi in [150.0, 200.0] {
        let dir = tempfile::tempdir().expect("temp dir");
        let path = dir.path().join("column.png");
        std::fs::write(&path, write_png(&page, dpi).expect("rasterises")).expect("written");
        let x_px = ((coal.rect.x + coal.rect.w / 2.0) * dpi / 25.4).round() as i64;
        let out = Command::new("python3")
            .arg("-c")
            .arg(MEASURE)
            .arg(&path)
            .arg(x_px.to_string())
            .output()
            .unwrap_or_else(|e| {
                panic!("python3 is required for this reference check (pip install numpy pillow): {e}")
            });
        assert!(out.status.success(), "the Python check failed:\n{}", String::from_utf8_lossy(&out.stderr));
        let v: Value = serde_json::from_slice(&out.stdout).expect("JSON");
        // Pillow reads pHYs back as dots per inch; the chunk holds whole pixels per metre, so
        // rounding moves it by at most 0.5 px/m = 0.0127 dpi.
        let read_dpi = v["dpi"][0].as_f64().expect("dpi");
        assert!((read_dpi - dpi).abs() <= 0.0127, "pHYs gives {read_dpi} dpi, want {dpi}");
        let size = &v["size"];
        let want_w = (page.width_mm * dpi / 25.4).ceil();
        assert_eq!(size[0].as_f64(), Some(want_w), "width in pixels");
        let runs: Vec<(f64, f64)> = v["runs"]
            .as_array()
            .expect("runs")
            .iter()
            .map(|r| (r[0].as_f64().expect("start"), r[1].as_f64().expect("end")))
            // Only runs within the column (a letter of the header may lie on the same x).
            .filter(|r| r.0 * 25.4 / dpi >= seg.heights.y_mm(seg.top_m) - 1.0)
            .collect();
        assert_eq!(runs.len(), 2, "two coal beds at x = {x_px} px: {runs:?}");
        // 1:100 → 10 mm of paper per metre; dpi / 25.4 pixels per mm. Upper coal (0.5 m) first.
        let px_per_m = 10.0 * dpi / 25.4;
        let (upper, lower) = (runs[0], runs[1]);
        // A dark run also takes in half of each bounding line's stroke (the bed outlines), so
        // lengths get two pixels of slack; the distance between the runs' centres does not
        // depend on strokes and gets one: 0.25 m + 1 m + 1 m = 2.25 m.
        for (run, t) in [(upper, 0.5), (lower, 2.0)] {
            let got = run.1 - run.0;
            assert!(
                (got - t * px_per_m).abs() <= 2.0,
                "{t} m coal: {got} px at {dpi} dpi, want {}",
                t * px_per_m
            );
        }
        let centres = (lower.0 + lower.1) / 2.0 - (upper.0 + upper.1) / 2.0;
        assert!(
            (centres - 2.25 * px_per_m).abs() <= 1.0,
            "coal centres {centres} px apart, want {}",
            2.25 * px_per_m
        );
        eprintln!(
            "{dpi} dpi: coal 2.0 m = {} px (want {:.2}), 0.5 m = {} px (want {:.2}), centres {centres} px (want {:.2})",
            lower.1 - lower.0,
            2.0 * px_per_m,
            upper.1 - upper.0,
            0.5 * px_per_m,
            2.25 * px_per_m
        );
    }
}
