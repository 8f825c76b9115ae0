"""Load cases on one factorisation, measured: the pipeline time of a case with three load cases (two loads,
combined three ways) against the same part with one load case, and the demo lug bracket (demo data)
with its cosine-bearing and pin-contact cases. Medians of repeats in one run (machines are noisy);
no band (the second mesh would double every number). Writes benchmarks/LOAD_CASES.md itself."""

from __future__ import annotations

import os
import statistics
import sys
import time
import tomllib

from fekt.api import case_from_dict, load_case
from fekt.pipeline import run

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402

PART = """
[parameters]
W = 40
[part]
thickness = 5
outline = [ { x = 0, y = 0, edge = "bottom" }, { x = 320, y = 0, edge = "right" }, { x = 320, y = "W", edge = "top" },
            { x = 0, y = "W", edge = "left" } ]
cutouts = [ { name = "hole", shape = "circle", center = [160, 20], diameter = 12 } ]
[[loads]]
name = "pull"
ends = ["left", "right"]
force = 10000
[[loads]]
name = "bend"
ends = ["left", "right"]
moment = 50000
"""
ONE = PART + '[[load_cases]]\nname = "max"\nfactors = { pull = 1.5, bend = -0.5 }\n'
THREE = ONE + ('[[load_cases]]\nname = "pull only"\nfactors = { pull = 1 }\n'
               '[[load_cases]]\nname = "bend only"\nfactors = { bend = 1 }\n')
REPEATS = 5


def timed(case) -> tuple[float, object]:
    times, solved = [], None
    for _ in range(REPEATS):
        t0 = time.perf_counter()
        solved = run(case)
        times.append(time.perf_counter() - t0)
    return statistics.median(times), solved


def main() -> None:
    one = case_from_dict(tomllib.loads(ONE), "one.toml")
    three = case_from_dict(tomllib.loads(THREE), "three.toml")
    run(one)  # warm-up: imports and first-call costs
    t1, s1 = timed(one)
    t3, s3 = timed(three)
    lug = load_case(os.path.join(HERE, "..", "cases", "demo_lug_bracket.toml"))
    tl, sl = timed(lug)
    r = sl.result
    lines = [
        "# Load cases on one factorisation",
        "",
        "Written by `python benchmarks/load_cases.py` (no band; medians of "
        f"{REPEATS} runs in one process; other work may have been running on the machine).",
        "",
        "| case | load cases | DOFs | pipeline time [s] | ratio to one case |",
        "|---|---|---|---|---|",
        f"| strip with a hole, two loads | 1 | {s1.result.mesh.dofs} | {t1:.3f} | 1.00 |",
        f"| the same, two loads | 3 | {s3.result.mesh.dofs} | {t3:.3f} | {t3 / t1:.2f} |",
        f"| demo lug bracket (cosine bearing, pin contact) | {len(r.load_cases)} | {r.mesh.dofs} | {tl:.3f} | - |",
        "",
        "The three-case run solves the same two right-hand sides on the same factorisation as the one-case "
        "run; the extra time is the post-processing of two more load cases.",
        "",
        "Pin contact in the demo lug bracket (demo data):",
        "",
    ]
    for c in r.contacts or [c for lc in r.load_cases for c in lc.contacts]:
        lines.append(f"- pin '{c.load}' in load case '{c.case}': contact from {c.arc_from:.1f} to {c.arc_to:.1f} deg "
                     f"either side of the force, {c.nodes} nodes, {c.iterations} active-set iterations")
    for lc in r.load_cases:
        lines += ["", f"Load case '{lc.name}' of the demo lug bracket: notch peaks and load-introduction peaks", "",
                  "| # | feature | peak [MPa] | Kt_net | load introduction |", "|---|---|---|---|---|"]
        for h in lc.peaks:
            kt = f"{h.kt_net:.3f}" if h.kt_net is not None else "-"
            lines.append(f"| {h.rank} | {h.feature} | {h.peak:.1f} | {kt} | {h.introduction or '-'} |")
    publish(lines, os.path.join(HERE, "LOAD_CASES.md"))


if __name__ == "__main__":
    main()
