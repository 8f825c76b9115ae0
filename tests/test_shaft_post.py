"""Shaft stress peaks through the whole pipeline: the combined load case around the circumference, the
compressive side of bending, Kt per component against single-load solves, the shaft chart cross-check.

References: nominal stresses of round bars 4F/(pi d^2), 32M/(pi d^3), 16T/(pi d^3) (any strength of
materials text, e.g. Timoshenko, Strength of Materials, 1955); a superposition of linear solutions is
exact; the combined Kt definition (the peak's principal stress over the nominal principal stress at the
same angle) is our own convention (docs/conventions.md).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

from fekt.api import load_case, solve  # the public entry points
from fekt.api import case_from_dict  # noqa: F811

SHOULDER = """
[case]
name = "shoulder shaft"
[parameters]
D = 30
d = 20
r = 2
[part]
model = "axisymmetric"
family = "shaft_shoulder"
[part.dimensions]
D = "D"
d = "d"
r = "r"
[mesh]
elements_per_radius = 6
[load]
{load}
"""


def _solve(load: str, full: bool = False):
    import tomllib

    from fekt.api import solve_full

    case = case_from_dict(tomllib.loads(SHOULDER.replace("{load}", load)), "shoulder.toml")
    solved = solve_full(case, estimate=False)
    return solved if full else solved.result


def _fillet(result, tensile=True):
    hs = [h for h in result.peaks if h.feature_kind == "fillet" and (h.peak > 0) == tensile]
    return max(hs, key=lambda h: abs(h.peak))


LOADS = (("force", 3000), ("moment", 40000), ("torque", 50000))


@pytest.fixture(scope="module")
def combined_full():
    return _solve("\n".join(f"{q} = {v}" for q, v in LOADS), full=True)


@pytest.fixture(scope="module")
def combined(combined_full):
    return combined_full.result


@pytest.fixture(scope="module")
def singles_full():
    return {q: _solve(f"{q} = {v}", full=True) for q, v in LOADS}


@pytest.fixture(scope="module")
def singles(singles_full):
    return {q: s.result for q, s in singles_full.items()}


def test_components_equal_single_load_solves(combined_full, singles_full):
    # superposition: every component of the combined solve is the solve of that load alone (same mesh)
    for q, s in singles_full.items():
        a = combined_full.samples.components[q]
        b = s.samples.components[q]
        for x, y in zip(a.components(), b.components()):
            assert float(np.max(np.abs(x - y))) <= 1e-9 * float(np.max(np.abs(b.components()[0])) + 1e-300) + \
                1e-9 * float(max(np.max(np.abs(c)) for c in b.components()))
    # and each component's Kt at the combined peak is its own stress over its own nominal stress
    top = _fillet(combined_full.result)
    for c in top.components:
        assert c.kt_net == pytest.approx(c.stress / c.sigma_nom_net, rel=1e-12)


def test_nominal_stresses_are_the_round_bar_formulas(singles):
    # the net section's radius comes from an exact cut of the curved outline (to ~1e-9 of the size)
    d = 20.0
    F, M, T = 3000.0, 40000.0, 50000.0
    assert _fillet(singles["force"]).sigma_nom_net == pytest.approx(4 * F / (math.pi * d ** 2), rel=1e-8)
    assert _fillet(singles["moment"]).sigma_nom_net == pytest.approx(32 * M / (math.pi * d ** 3), rel=1e-8)
    # torque alone: the measure is the signed principal stress, the nominal its value for pure shear
    assert _fillet(singles["torque"]).sigma_nom_net == pytest.approx(16 * T / (math.pi * d ** 3), rel=1e-8)
    assert singles["torque"].measure == "principal" and singles["force"].measure == "tangential"


def test_bending_has_a_compressive_peak_at_the_opposite_side(singles):
    r = singles["moment"]
    t, c = _fillet(r, True), _fillet(r, False)
    assert (t.x, t.y) == (c.x, c.y)
    assert t.theta == pytest.approx(0.0, abs=1e-6) and abs(c.theta) == pytest.approx(180.0, abs=1e-6)
    assert c.peak == pytest.approx(-t.peak, rel=1e-9)
    assert c.kt_net == pytest.approx(t.kt_net, rel=1e-9) and c.kt_net > 1


def test_reversed_moment_swaps_the_sides_not_the_numbers(singles):
    rev = _solve("moment = -40000")
    t, t0 = _fillet(rev, True), _fillet(singles["moment"], True)
    assert abs(t.theta) == pytest.approx(180.0, abs=1e-6)
    assert t.peak == pytest.approx(t0.peak, rel=1e-9) and t.kt_net == pytest.approx(t0.kt_net, rel=1e-9)


def test_combined_peak_is_the_largest_principal_around_the_axis(combined):
    # the combined peak at theta: sigma = N/A + (M r/I) cos(theta) plus shear; at least as large as the
    # axial + bending stress on the drawn side, which has no shear
    top = _fillet(combined)
    by = {c.quantity: c for c in top.components}
    assert top.peak >= by["force"].stress + by["moment"].stress - 1e-9
    assert -30.0 < top.theta < 30.0
    d = 20.0
    sig = 4 * 3000 / (math.pi * d ** 2) + 32 * 40000 / (math.pi * d ** 3) * math.cos(math.radians(top.theta))
    tau = 16 * 50000 / (math.pi * d ** 3)
    assert top.sigma_nom_net == pytest.approx(sig / 2 + math.hypot(sig / 2, tau), rel=1e-8)
    assert top.kt_net == pytest.approx(top.peak / top.sigma_nom_net, rel=1e-12)


def test_demo_shaft_solves_with_shoulder_chart(capsys):
    from fekt.cli.main import main

    case = load_case("cases/demo_shaft.toml")
    case = dataclasses.replace(case, mesh=dataclasses.replace(case.mesh, elements_per_radius=6))
    r = solve(case, estimate=False)
    shoulder = next(h for h in r.peaks if h.feature == "fillet at vertex 7" and h.peak > 0)
    fits = {c.component: c.fit for c in shoulder.component_charts}
    assert fits == {"force": "shaft-shoulder/tension/cubic-sqrt-fit", "moment": "shaft-shoulder/bending/cubic-sqrt-fit",
                    "torque": "shaft-shoulder/torsion/cubic-sqrt-fit"}
    # the narrowest cut is found by a search: its width to ~1e-9
    assert shoulder.component_charts[0].dims == pytest.approx({"D": 40.0, "d": 30.0, "r": 1.5}, rel=1e-8)
    assert main(["solve", "cases/demo_shaft.toml", "--no-estimate", "--elements-per-radius", "6"]) == 0
    out = capsys.readouterr().out
    assert "at (z, r), theta" in out and "thickness" not in out.splitlines()[2]
