"""The peer of `aggrade export --pdf` in the export benchmark: a measured section drawn the way a
geologist would script it with matplotlib, so the command line's speed has something to be
compared with.

One rectangle per bed, as wide as its grain size (Wentworth classes, clay narrowest), filled with a
colour for its lithology and outlined; the section cut into segments of the height an A4 page holds
at 1:100 (24 m in a 240 mm column), one page per segment, heights in metres on the left, grain-size
classes along the bottom, the segment's range and the page number in the title; all pages written to
one PDF with matplotlib's PdfPages. It reads the same bed-table CSV as `aggrade export`
(scripts/peer/make_beds.py writes one).

Needs matplotlib (PyPI), in a virtual environment of its own: scripts/bench-export-peer.sh makes one
under target/. Not part of the test suite.

Usage: python3 scripts/peer/column_pdf.py BEDS.csv OUT.pdf
"""
import bisect
import csv
import sys

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
from matplotlib.backends.backend_pdf import PdfPages  # noqa: E402
from matplotlib.patches import Rectangle  # noqa: E402

# Wentworth (1922) grain-size classes, finest first: the column's width steps.
CLASSES = ["clay", "silt", "very fine sand", "fine sand", "medium sand", "coarse sand",
           "very coarse sand", "granule", "pebble", "cobble", "boulder"]
WIDTH = {name: k + 1 for k, name in enumerate(CLASSES)}
# Beds with no grain size (coal, limestone, covered intervals...) are drawn this wide.
NO_GRAIN = 1.5
COLOURS = {
    "sandstone": "#f2d16b", "conglomerate": "#e89b3c", "breccia": "#d9822b", "siltstone": "#c8b99a",
    "mudstone": "#9b8b7a", "claystone": "#8a7f8d", "shale": "#6f6f6f", "limestone": "#9ec9e2",
    "dolostone": "#b5d3c8", "marl": "#b9c7a3", "coal": "#222222", "tuff": "#e0b4d6",
    "evaporite": "#f4f0fa", "covered": "#ffffff",
}

MM = 1 / 25.4  # inches per millimetre
SCALE = 100  # 1:100 — 1 m of section is 10 mm of paper
PAGE_W_MM, PAGE_H_MM = 210.0, 297.0
COLUMN_MM = 240.0
LEFT_MM, BOTTOM_MM, COLUMN_W_MM = 30.0, 35.0, 110.0
METRES_PER_PAGE = COLUMN_MM / 1000.0 * SCALE


def read_beds(path):
    beds = []
    with open(path, newline="") as f:
        for row in csv.DictReader(f):
            beds.append((float(row["thickness_m"]), row["lithology"], row["grain_base"]))
    return beds


def main():
    beds_path, out_path = sys.argv[1], sys.argv[2]
    beds = read_beds(beds_path)
    bases = []
    h = 0.0
    for thickness, _, _ in beds:
        bases.append(h)
        h += thickness
    total = h
    n_pages = max(1, int(-(-total // METRES_PER_PAGE)))
    with PdfPages(out_path) as pdf:
        for page in range(n_pages):
            lo = page * METRES_PER_PAGE
            hi = lo + METRES_PER_PAGE
            fig = plt.figure(figsize=(PAGE_W_MM * MM, PAGE_H_MM * MM))
            ax = fig.add_axes([LEFT_MM / PAGE_W_MM, BOTTOM_MM / PAGE_H_MM,
                               COLUMN_W_MM / PAGE_W_MM, COLUMN_MM / PAGE_H_MM])
            first = max(0, bisect.bisect_right(bases, lo) - 1)
            last = bisect.bisect_left(bases, hi)
            for k in range(first, last):
                thickness, lithology, grain = beds[k]
                ax.add_patch(Rectangle((0, bases[k]), WIDTH.get(grain, NO_GRAIN), thickness,
                                       facecolor=COLOURS.get(lithology, "#cccccc"),
                                       edgecolor="black", linewidth=0.4))
            ax.set_xlim(0, len(CLASSES))
            ax.set_ylim(lo, hi)
            ax.set_xticks([k + 1 for k in range(len(CLASSES))])
            ax.set_xticklabels(CLASSES, rotation=90, fontsize=6)
            ax.set_ylabel("height above section base (m)")
            ax.set_title(f"{lo:.2f}\u2013{min(hi, total):.2f} m   (1:{SCALE}, page {page + 1} of {n_pages})",
                         fontsize=8)
            pdf.savefig(fig)
            plt.close(fig)
    print(f"wrote {out_path} ({n_pages} pages)", file=sys.stderr)


if __name__ == "__main__":
    main()
