"""Write a generated bed table (CSV) of N beds for the export benchmark and its plotting-script peer.

The beds are the invented demo section's 21 beds (tests/data/export/tarn_gap.aggrade) cycled in
order, each thickness scaled by 0.237 (at least 0.05 m), so the beds average about 0.36 m and
10,000 beds make a 3.6 km section: the same section `layout::sample::generated_section` builds for
the criterion benchmarks. Both `aggrade export` and `scripts/peer/column_pdf.py` read this file.

Usage: python3 scripts/peer/make_beds.py N OUT.csv
"""
import csv
import json
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
DEMO = os.path.join(HERE, "..", "..", "tests", "data", "export", "tarn_gap.aggrade")

# The bed-table columns `aggrade` reads (sample_sections/*.csv use the same header).
HEADER = ["thickness_m", "lithology", "grain_base", "grain_top", "base_contact", "structures",
          "paleosol", "paleocurrents"]


def words(value):
    """A project file's snake_case term as the bed table writes it ("medium_sand" -> "medium sand")."""
    return "" if value is None else str(value).replace("_", " ")


def rows(n):
    demo = json.load(open(DEMO))["sections"][0]["beds"]
    for i in range(n):
        b = demo[i % len(demo)]
        paleosol = b.get("paleosol")
        yield [
            repr(round(max(b["thickness_m"] * 0.237, 0.05), 6)),
            words(b["lithology"]),
            words(b.get("grain_base")),
            words(b.get("grain_top")),
            words(b.get("base_contact")),
            "; ".join(words(s) for s in b.get("structures") or []),
            "" if paleosol in (None, "none") else words(paleosol),
            ";".join(str(a) for a in b.get("paleocurrents_deg") or []),
        ]


def main():
    if len(sys.argv) != 3:
        sys.exit("usage: make_beds.py N OUT.csv")
    n = int(sys.argv[1])
    with open(sys.argv[2], "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(HEADER)
        w.writerows(rows(n))


if __name__ == "__main__":
    main()
