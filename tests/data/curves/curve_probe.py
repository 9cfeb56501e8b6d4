"""Read a PDF with pdfplumber (PyPI) and print its stroked paths, straight lines, filled shapes
and words as JSON, for the measured-curve track checks.

Usage: python3 curve_probe.py FILE.pdf
Output: {"pages": [{"width", "height",
                    "paths": [{"pts": [[x, top], ...], "stroke": [r, g, b]}],
                    "lines": [{"x0", "x1", "top", "bottom", "stroke": [...]}],
                    "fills": [{"x0", "x1", "top", "bottom", "fill": [...]}],
                    "words": [{"text", "x0", "x1", "top", "bottom"}],
                    "chars": [{"text", "x0", "x1", "top", "upright"}]}]}
All positions in PDF points from the page's top-left corner (pdfplumber's "top" convention).
Exits 3 with a message if pdfplumber is missing, so the calling test fails clearly.
"""
import json
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))
from probe_common import colour, require  # noqa: E402

pdfplumber, = require('pdfplumber')


pages = []
with pdfplumber.open(sys.argv[1]) as pdf:
    for p in pdf.pages:
        paths, lines, fills = [], [], []
        for o in p.curves + p.lines:
            if o.get("stroke"):
                paths.append({"pts": [[float(x), float(y)] for x, y in o["pts"]],
                              "stroke": colour(o.get("stroking_color"))})
        for o in p.lines:
            lines.append({"x0": float(o["x0"]), "x1": float(o["x1"]), "top": float(o["top"]),
                          "bottom": float(o["bottom"]), "stroke": colour(o.get("stroking_color"))})
        for o in p.rects + p.curves:
            if o.get("fill"):
                fills.append({"x0": float(o["x0"]), "x1": float(o["x1"]), "top": float(o["top"]),
                              "bottom": float(o["bottom"]), "fill": colour(o.get("non_stroking_color"))})
        words = [{"text": w["text"], "x0": float(w["x0"]), "x1": float(w["x1"]),
                  "top": float(w["top"]), "bottom": float(w["bottom"])}
                 for w in p.extract_words(keep_blank_chars=False)]
        chars = [{"text": c["text"], "x0": float(c["x0"]), "x1": float(c["x1"]), "top": float(c["top"]),
                  "upright": bool(c.get("upright", True))} for c in p.chars]
        pages.append({"width": float(p.width), "height": float(p.height), "paths": paths,
                      "lines": lines, "fills": fills, "words": words, "chars": chars})
json.dump({"pages": pages}, sys.stdout)
