"""The boundary stresses that peaks are measured by.

On a traction-free boundary the stress state is plane in the tangent plane: in the frame (t, h, n) of
the in-plane tangent t (direction of travel), the out-of-plane or hoop direction h and the outward
normal n, only s_tt, s_hh and s_th remain (s_nn = s_tn = s_hn = 0 up to discretisation error). The
measures, all signed except von Mises:

* ``tangential`` (default): s_tt, the tangential normal stress; tension positive. For plates this is
  the whole boundary stress; it is what Kt charts use.
* ``max_principal`` / ``min_principal``: the larger / smaller principal stress of the surface state
  [[s_tt, s_th], [s_th, s_hh]].
* ``von_mises``: the von Mises equivalent of the surface state (with s_nn = 0), never negative.
"""

from __future__ import annotations

import numpy as np

from ..kinds import Measure
from ..models.base import Stress


def surface_state(stress: Stress, normal: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(s_tt, s_hh, s_th) at boundary points with outward unit normals ``normal`` (2, n)."""
    tx, ty = -normal[1], normal[0]  # material on the left of the direction of travel
    stt = stress.xx * tx * tx + 2 * stress.xy * tx * ty + stress.yy * ty * ty
    sth = stress.xh * tx + stress.yh * ty
    return stt, stress.hh, sth


def measure_values(measure: Measure, stt: np.ndarray, shh: np.ndarray, sth: np.ndarray) -> np.ndarray:
    """The chosen measure of surface states given by their components (arrays of one shape)."""
    measure = Measure(measure)
    if measure == Measure.TANGENTIAL:
        return stt
    c = 0.5 * (stt + shh)
    r = np.hypot(0.5 * (stt - shh), sth)
    if measure == Measure.MAX_PRINCIPAL:
        return c + r
    if measure == Measure.MIN_PRINCIPAL:
        return c - r
    return np.sqrt(np.maximum(stt * stt - stt * shh + shh * shh + 3.0 * sth * sth, 0.0))


def component_measure(quantity: str, stt: np.ndarray, sth: np.ndarray) -> np.ndarray:
    """The stress a single load component's Kt is formed from: the shear s_th for a torque (Kts on the
    shear basis), the tangential normal stress otherwise."""
    return sth if quantity == "torque" else stt
