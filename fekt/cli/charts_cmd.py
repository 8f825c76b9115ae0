"""``fekt charts``: the published chart fits fekt knows, with ranges, sources and confidence."""

from __future__ import annotations

import json


def add_parser(sub) -> None:
    p = sub.add_parser("charts", help="list the chart families, loads, parameters, ranges, sources and confidence")
    p.add_argument("--json", action="store_true", help="print the list as JSON")
    p.set_defaults(run=run)


def run(args) -> int:
    from ..charts.fits import all_fits, chart_gaps
    from ..families import REGISTRY as FAMILIES
    from ..records import CHARTS_SCHEMA

    fits = all_fits()
    if args.json:
        data = {"schema": CHARTS_SCHEMA,
                "families": {k: {"dimensions": list(v.required) + [f"{o} (optional)" for o in v.optional],
                                 "description": v.description} for k, v in FAMILIES.items()},
                "fits": [{"key": f.key, "family": f.family, "load": f.load, "basis": f.basis, "nominal": f.nominal,
                          "ranges": [{"ratio": r.name, "range": r.interval_text(), "why": r.description}
                                     for r in f.ranges],
                          "band": f.band, "confidence": f.confidence, "source": f.source,
                          "from_memory": f.from_memory, "note": f.note} for f in fits],
                "no_chart": [{"family": g.family, "load": g.load, "reason": g.reason} for g in chart_gaps()]}
        print(json.dumps(data, indent=2))
        return 0
    lines = ["Standard shapes for case files ([part] family = ..., dimensions = {...}):"]
    for k, v in FAMILIES.items():
        dims = ", ".join(list(v.required) + [f"{o} (optional)" for o in v.optional])
        lines.append(f"  {k}: {dims}\n      {v.description}")
    lines.append("")
    lines.append("Chart fits (Kt on the stated basis; * = coefficients recalled from memory, not re-read):")
    for f in fits:
        ranges = "; ".join(f"{r.name} in {r.interval_text()}" for r in f.ranges)
        lines.append(f"  {f.key}{'*' if f.from_memory else ''}  [{f.family}, {f.load}]")
        lines.append(f"      Kt_{f.basis}, sigma_nom = {f.nominal}; valid for {ranges}; band +-{100 * f.band:.0f} %, "
                     f"confidence {f.confidence}")
        lines.append(f"      source: {f.source}")
    lines.append("")
    lines.append("No chart:")
    for g in chart_gaps():
        lines.append(f"  {g.family}, {g.load}: {g.reason}")
    lines.append("")
    lines.append("Known differences between these fits and converged FE: docs/known-discrepancies.md")
    print("\n".join(lines))
    return 0
