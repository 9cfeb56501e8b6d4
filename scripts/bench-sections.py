"""Generated sections for the scaling and start-up benchmarks (scripts/bench-scaling.sh,
scripts/bench-startup.sh): the invented demo sections' beds in order, repeated, ids renumbered,
surface names made unique, thickness jittered ±20 % with a fixed seed. Written in the demo file's
own format version, compact. The field-record extras (notes, samples, photos, fossils, Munsell
colour …) are kept on every 100th bed only, and a sample's height in its bed is scaled with the
bed, so 100,000 beds stay valid and under the 32 MiB file limit.

    python3 scripts/bench-sections.py OUT.aggrade BEDS [SECTIONS]
"""
import json
import random
import sys

EXTRAS = ("notes", "samples", "photos", "lag_composition", "body_fossils", "trace_fossils", "fossils",
          "munsell", "drainage", "soil_horizon", "facies", "bioturbation_index", "colour")


def section(pattern, name, n, shift, seed):
    rng = random.Random(seed)
    beds = []
    for i in range(n):
        b = json.loads(json.dumps(pattern[(i + shift) % len(pattern)]))
        b["id"] = i + 1
        # A thickness measured along the slope would no longer match the jittered one.
        b.pop("slope_distance_m", None)
        if i % 100:
            for k in EXTRAS:
                b.pop(k, None)
        f = rng.uniform(0.8, 1.2)
        b["thickness_m"] = round(max(0.01, b["thickness_m"] * f), 3)
        for s in b.get("samples", []):
            if "height_in_bed_m" in s:
                s["height_in_bed_m"] = round(min(s["height_in_bed_m"] * f, b["thickness_m"]), 3)
        # Defaults left out and whole-degree azimuths written without ".0", to keep the file small.
        if b.get("paleosol") == "none":
            del b["paleosol"]
        for r in b.get("paleocurrents", []):
            if float(r.get("azimuth_deg", 0.5)).is_integer():
                r["azimuth_deg"] = int(r["azimuth_deg"])
        if "base_surface" in b:
            b["base_surface"] = dict(b["base_surface"], name=f'{b["base_surface"]["name"]}-{i}')
        beds.append(b)
    return {"name": name, "locality": "Tamsin Ridge badlands (invented)", "beds": beds}


def main():
    out, n = sys.argv[1], int(sys.argv[2])
    count = int(sys.argv[3]) if len(sys.argv) > 3 else 1
    demo = json.load(open("sample_sections/demo.aggrade"))
    pattern = [b for s in demo["sections"] for b in s["beds"]]
    if count == 1:
        sections = [section(pattern, f"Scaling {n}", n, 0, 20261201)]
    else:
        sections = []
        for j in range(count):
            s = section(pattern, f"Panel {j + 1}", n, 7 * j, 20261203 + j)
            s["panel_position_m"] = 1500.0 * j
            sections.append(s)
    with open(out, "w") as f:
        json.dump({"format_version": demo["format_version"], "sections": sections}, f, separators=(",", ":"))
        f.write("\n")


if __name__ == "__main__":
    main()
