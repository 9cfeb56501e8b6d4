"""Parse an SVG with Python's xml.etree (standard library) and print element counts and text as JSON.

Usage: python3 svg_probe.py FILE.svg
"""
import json
import sys
import xml.etree.ElementTree as ET

root = ET.parse(sys.argv[1]).getroot()
ns = "{http://www.w3.org/2000/svg}"
counts = {}
texts = []
for el in root.iter():
    tag = el.tag.replace(ns, "")
    counts[tag] = counts.get(tag, 0) + 1
    if tag == "text":
        texts.append(el.text or "")
json.dump({"root": root.tag.replace(ns, ""), "width": root.get("width"), "height": root.get("height"),
           "viewBox": root.get("viewBox"), "counts": counts, "texts": texts}, sys.stdout)
