"""Time `aggrade export --pdf` against the matplotlib peer (column_pdf.py) on the same generated beds.

Runs alternate (aggrade, peer, aggrade, peer, ...) so a change in the machine's load falls on
both; each run is timed with GNU time (wall, user, system, peak memory) and the load average is
read before it. Prints, and appends to the results file, a Markdown table per size with the median
of each and the ratio of the medians (peer / aggrade).

Usage: python3 compare.py AGGRADE_BIN PEER_PYTHON OUT_DIR RESULTS.md N:RUNS[:PEER_RUNS] ...
  e.g. N=10000 with 5 runs each: 10000:5; N=100000 with 3 aggrade runs and 1 peer run: 100000:3:1
  (PEER_RUNS 0: aggrade alone).
Called by scripts/bench-export-peer.sh, which makes the beds and the peer's virtual environment.
"""
import os
import statistics
import subprocess
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))


def load():
    return open("/proc/loadavg").read().split()[0]


def timed(cmd, out_dir):
    """Run cmd under GNU time; wall s (the clock around it, finer than GNU time's 10 ms), user s,
    sys s, peak RSS MB and the load average before it."""
    before = load()
    stats = os.path.join(out_dir, "time.txt")
    start = time.perf_counter()
    subprocess.run(["/usr/bin/time", "-o", stats, "-f", "%e %U %S %M"] + cmd, check=True,
                   stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    wall = time.perf_counter() - start
    _, user, system, kb = open(stats).read().split()[-4:]
    return {"wall": wall, "user": float(user), "sys": float(system), "rss_mb": int(kb) / 1000,
            "load": before}


def main():
    aggrade, python, out_dir, results = sys.argv[1:5]
    lines = []
    for spec in sys.argv[5:]:
        parts = [int(p) for p in spec.split(":")]
        n, runs = parts[0], parts[1]
        peer_runs = parts[2] if len(parts) > 2 else runs
        beds = os.path.join(out_dir, f"beds_{n}.csv")
        cmds = {
            "aggrade": [aggrade, "export", beds, "--pdf", os.path.join(out_dir, f"aggrade_{n}.pdf")],
            "peer": [python, os.path.join(HERE, "column_pdf.py"), beds, os.path.join(out_dir, f"peer_{n}.pdf")],
        }
        got = {"aggrade": [], "peer": []}
        for k in range(max(runs, peer_runs)):
            for who, wanted in (("aggrade", runs), ("peer", peer_runs)):
                if k < wanted:
                    r = timed(cmds[who], out_dir)
                    got[who].append(r)
                    print(f"{n} beds, {who} run {k + 1}: {r['wall']:.2f} s wall, {r['user']:.2f} s user, "
                          f"{r['rss_mb']:.0f} MB, load {r['load']}", file=sys.stderr, flush=True)
        got = {who: rs for who, rs in got.items() if rs}
        med = {who: statistics.median(r["wall"] for r in rs) for who, rs in got.items()}
        lines.append(f"### {n} beds")
        lines.append("")
        lines.append("| | runs | wall times (s) | median wall | median user | peak RSS | load average before each run |")
        lines.append("|---|---|---|---|---|---|---|")
        for who, rs in got.items():
            walls = ", ".join("%.3f" % r["wall"] for r in rs)
            loads = ", ".join(r["load"] for r in rs)
            user = statistics.median(r["user"] for r in rs)
            rss = max(r["rss_mb"] for r in rs)
            lines.append(f"| {who} | {len(rs)} | {walls} | {med[who]:.3f} s | {user:.2f} s | {rss:.0f} MB | {loads} |")
        lines.append("")
        if "peer" in med and "aggrade" in med:
            lines.append(f"**peer / aggrade (medians of wall time): {med['peer'] / med['aggrade']:.0f}×**")
            lines.append("")
    text = "\n".join(lines)
    print(text)
    with open(results, "a") as f:
        f.write(text + "\n")


if __name__ == "__main__":
    main()
