"""The boundary stresses that peaks are measured by.

On a traction-free boundary the stress state is plane in the tangent plane: in the frame (t, h, n) of
the in-plane tangent t (direction of travel), the out-of-plane or hoop direction h and the outward
normal n, only s_tt, s_hh and s_th remain (s_nn = s_tn = s_hn = 0 up to discretisation error). The
measures, all signed except von Mises:

* ``tangential`` (default): s_tt, the tangential normal stress; tension positive. For plates this is
  the whole boundary stress; it is what Kt charts use.
* ``max_principal`` / ``min_principal``: the larger / smaller principal stress of the surface state
  [[s_tt, s_th], [s_th, s_hh]].
* ``principal``: whichever of the two principal stresses has the larger magnitude, with its sign (a
  tensile peak and a compressive peak are both found; pure shear counts as tension). The default for
  loads with a torque, whose tangential stress is zero.
* ``von_mises``: the von Mises equivalent of the surface state (with s_nn = 0), never negative.

Loads whose components are circumferential harmonics (a shaft in bending: harmonic 1) have a state that
varies with the angle theta around the axis: every measure is then taken where it is most extreme
around the circumference (:func:`measure_over_angle`), and that angle is reported with the peak.
"""

from __future__ import annotations

import numpy as np

from collections.abc import Sequence

from ..kinds import Measure
from ..models.base import SurfaceStress, maximise_over_angle


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
    if measure == Measure.PRINCIPAL:
        return np.where(np.abs(c - r) > np.abs(c + r), c - r, c + r)
    return np.sqrt(np.maximum(stt * stt - stt * shh + shh * shh + 3.0 * sth * sth, 0.0))


def component_measure(quantity: str, stt: np.ndarray, sth: np.ndarray) -> np.ndarray:
    """The stress a single load component's Kt is formed from: the shear s_th for a torque (Kts on the
    shear basis), the tangential normal stress otherwise."""
    return sth if quantity == "torque" else stt


def measure_over_angle(parts: Sequence[tuple[float, SurfaceStress]], measure: Measure
                       ) -> tuple[np.ndarray, np.ndarray]:
    """The measure of a load case given as (factor, component surface stress) parts, at its most extreme
    angle around the axis, and that angle (radians; 0 when no part depends on the angle).

    Signed measures (tangential, principal) take the larger magnitude of their maximum and minimum over
    the angle (a tie counts as tension); max_principal and von_mises their maximum, min_principal its
    minimum."""
    measure = Measure(measure)

    def of(which: Measure):
        return lambda st: measure_values(which, *st)

    if measure in (Measure.MAX_PRINCIPAL, Measure.VON_MISES):
        return maximise_over_angle(parts, of(measure))
    if measure == Measure.MIN_PRINCIPAL:
        v, t = maximise_over_angle(parts, lambda st: -measure_values(Measure.MIN_PRINCIPAL, *st))
        return -v, t
    high_measure = Measure.TANGENTIAL if measure == Measure.TANGENTIAL else Measure.MAX_PRINCIPAL
    low_measure = Measure.TANGENTIAL if measure == Measure.TANGENTIAL else Measure.MIN_PRINCIPAL
    hi, th = maximise_over_angle(parts, of(high_measure))
    lo, tl = maximise_over_angle(parts, lambda st: -measure_values(low_measure, *st))
    lo = -lo
    low_wins = np.abs(lo) > np.abs(hi)
    return np.where(low_wins, lo, hi), np.where(low_wins, tl, th)
