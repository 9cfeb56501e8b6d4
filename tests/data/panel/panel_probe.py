"""Read a correlation-panel PDF with independent libraries (pypdf, pdfplumber from PyPI) and print
its page sizes, text and drawn shapes (with fill and stroke colours and points) as JSON.

Usage: python3 panel_probe.py FILE.pdf
Exits 3 with a message if a library is missing, so the calling test fails clearly.
"""
import json
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), ".."))
from probe_common import colour, require  # noqa: E402

pdfplumber, pypdf = require('pdfplumber', 'pypdf')


def shape(o):
    return {
        "x0": o["x0"], "x1": o["x1"], "top": o["top"], "bottom": o["bottom"],
        "fill": bool(o.get("fill")), "stroke": bool(o.get("stroke")),
        "fill_colour": colour(o.get("non_stroking_color")),
        "stroke_colour": colour(o.get("stroking_color")),
        # Points with y measured from the page top, as "top"/"bottom" are.
        "pts": [[float(x), float(y)] for (x, y) in (o.get("pts") or [])],
    }


path = sys.argv[1]
reader = pypdf.PdfReader(path)
out = {"pypdf": {"pages": [[float(p.mediabox.width), float(p.mediabox.height)] for p in reader.pages],
                 "text": [p.extract_text() for p in reader.pages]}}
pages = []
with pdfplumber.open(path) as pdf:
    for p in pdf.pages:
        pages.append({
            "width": float(p.width), "height": float(p.height),
            "chars": "".join(c["text"] for c in p.chars),
            "words": [{"text": w["text"], "x0": float(w["x0"]), "x1": float(w["x1"]),
                       "top": float(w["top"]), "bottom": float(w["bottom"])} for w in p.extract_words()],
            "rects": [shape(r) for r in p.rects],
            "curves": [shape(c) for c in p.curves],
            "lines": [shape(l) for l in p.lines],
        })
out["pages"] = pages
json.dump(out, sys.stdout)
