"""Turns the JSON results of qftplan_bench (one file per case, from tools/bench) into one table.

Time is the median of the repetitions (issue 7 judges medians; on a shared virtual machine the
best run is as much luck as the worst). Ratio to target: time / target time (1 s, 2 s or 0.5 s as
issue 7 sets them); for the OpenQASM writing case, 100 MB/s / rate; for the doubling series, the
growth per doubling of n / its limit (4.5 exact, 2.3 approximate). A ratio below 1 meets the target.
Exit status 1 when a target is missed.
"""
import json
import pathlib
import sys

UNIT = {"ns": 1e-9, "us": 1e-6, "ms": 1e-3, "s": 1.0}
DOUBLING_LIMIT = {"doubling_exact": 4.5, "doubling_approx": 2.3}
MIN_RATE = 100e6  # bytes per second of OpenQASM text


def load(folder):
    rows = []
    for path in sorted(pathlib.Path(folder).glob("*.json"), key=lambda p: int(p.stem)):
        data = json.loads(path.read_text())
        runs = [b for b in data["benchmarks"] if b.get("run_type") == "iteration"]
        if not runs:
            continue
        if any(b.get("error_occurred") for b in runs):
            rows.append({"name": runs[0]["run_name"], "error": runs[0].get("error_message", "error")})
            continue
        ordered = sorted(runs, key=lambda b: b["real_time"])
        best = ordered[(len(ordered) - 1) // 2]  # the median run (the lower middle one of an even count)
        name, _, n = best["run_name"].partition("/")
        rows.append({
            "name": name,
            "n": int(n) if n else 0,
            "time": best["real_time"] * UNIT[best["time_unit"]],
            "gates": best.get("gates", 0.0),
            "bytes": best.get("bytes", 0.0),
            "peak": best.get("peak_mib", 0.0),
            "target": best.get("target_s", 0.0),
            "label": best.get("label", ""),
            "reps": len(runs),
        })
    return rows


def judge(rows):
    previous = {}
    for r in rows:
        if "error" in r:
            continue
        r["goal"], r["ratio"] = "", None
        if r["name"] in DOUBLING_LIMIT:
            limit = DOUBLING_LIMIT[r["name"]]
            before = previous.get(r["name"])
            if before and r["n"] == 2 * before["n"]:
                growth = r["time"] / before["time"]
                r["goal"] = f"x{growth:.2f} <= x{limit}"
                r["ratio"] = growth / limit
            previous[r["name"]] = r
        elif r["target"] > 0:
            r["goal"] = f"< {r['target']:g} s"
            r["ratio"] = r["time"] / r["target"]
        elif r["bytes"] > 0:
            rate = r["bytes"] / r["time"]
            r["goal"] = f"{rate / 1e6:.0f} >= 100 MB/s"
            r["ratio"] = MIN_RATE / rate


def human(x):
    for unit, size in (("G", 1e9), ("M", 1e6), ("k", 1e3)):
        if x >= size:
            return f"{x / size:.2f}{unit}"
    return f"{x:.0f}"


def main():
    rows = load(sys.argv[1])
    judge(rows)
    head = ["case", "n", "gates", "time", "gates/s", "peak MiB", "goal", "ratio"]
    table = []
    missed = []
    for r in rows:
        if "error" in r:
            table.append([r["name"], "", "", "", "", "", "ERROR", r["error"]])
            missed.append(r["name"])
            continue
        ratio = "" if r["ratio"] is None else f"{r['ratio']:.2f}"
        if r["ratio"] is not None and r["ratio"] > 1:
            ratio += " MISSED"
            missed.append(f"{r['name']}/{r['n']}")
        table.append([
            r["name"], str(r["n"]), human(r["gates"]) if r["gates"] else "-",
            f"{r['time']:.3f} s", human(r["gates"] / r["time"]) if r["gates"] else "-",
            f"{r['peak']:.0f}", r["goal"], ratio,
        ])
    widths = [max(len(row[i]) for row in [head] + table) for i in range(len(head))]
    right = {1, 2, 3, 4, 5, 7}
    def line(row):
        return "  ".join(c.rjust(w) if i in right else c.ljust(w) for i, (c, w) in enumerate(zip(row, widths)))
    print(line(head))
    print("  ".join("=" * w for w in widths))
    for row in table:
        print(line(row))
    reps = max((r.get("reps", 1) for r in rows), default=1)
    print(f"\ntime: median of {reps} runs, wall clock, one core; ratio < 1 meets the goal of issue 7")
    if missed:
        print("missed: " + ", ".join(missed))
        return 1
    print("every goal met")
    return 0


if __name__ == "__main__":
    sys.exit(main())
