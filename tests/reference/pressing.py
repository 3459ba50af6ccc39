#!/usr/bin/env python3
"""Independent reference for Kneepoint's pressing integration.

Integrates, in the time domain with SciPy's solve_ivp, the pressing stroke of
the workshop-press demo design: the oil in the cap end and lines is first
compressed at a standing piston from the approach pressure to the pressure
the first pressing force needs, then the piston moves against a force rising
linearly with travel while the pressure follows the force and the oil keeps
compressing:

    rise:    dp/dt = beta * Q(p) / V(x0)                    until p = p_eq(F(x0))
    travel:  dx/dt = Q(p) / (A + V(x)/beta * dp_eq/dx),  p = p_eq(F(x))

with V(x) = V_dead + A*x. Q(p) is the power unit's delivery (two fixed pumps
with laminar leakage, check valve, unloading valve with a linear band, relief
with a linear override); p_eq(F) solves p = p_req(F, Q(p)) with brentq, where
p_req adds the directional-valve, lumped-line and hose (Darcy-Weisbach)
losses and the rod-end back-pressure reflected through the area ratio. Written
from the equations (docs/cycle.md), not from the Rust code.

Writes JSON to the path given as the first argument (default
target/reference/pressing.json) and prints the median solve time.
"""

import json
import math
import statistics
import sys
import time

import numpy as np
import scipy
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

BAR = 1e5
LPM = 1e-3 / 60.0
RTOL = 1e-6

# The workshop-press demo design (SI). The Rust test checks these against
# kneepoint_engine::design::workshop_press().
D = {
    "speed_rpm": 1450.0,
    "large_displacement_m3": 16e-6,
    "large_eta_v": 0.92,
    "large_rated_pa": 50 * BAR,
    "small_displacement_m3": 4e-6,
    "small_eta_v": 0.92,
    "small_rated_pa": 200 * BAR,
    "check_cracking_pa": 0.5 * BAR,
    "check_drop_pa": 1.5 * BAR,
    "check_flow_m3s": 40 * LPM,
    "unloading_pa": 30 * BAR,
    "unloading_band_fraction": 0.05,
    "back_pressure_pa": 4 * BAR,
    "back_pressure_flow_m3s": 23 * LPM,
    "relief_cracking_pa": 160 * BAR,
    "relief_full_pa": 168 * BAR,
    "valve_flow_m3s": 60 * LPM,
    "valve_drop_pa": 5 * BAR,
    "line_pressure_drop_pa": 1 * BAR,
    "line_return_drop_pa": 1 * BAR,
    "line_flow_m3s": 30 * LPM,
    "pressure_hose_bore_m": 0.0127,
    "pressure_hose_length_m": 2.0,
    "return_hose_bore_m": 0.019,
    "return_hose_length_m": 2.0,
    "density_kg_m3": 870.0,
    "viscosity_m2s": 46e-6,
    "bulk_modulus_pa": 1.0e9,
    "bore_m": 0.100,
    "rod_m": 0.056,
    "dead_volume_m3": 0.8e-3,
    "approach_m": 0.360,
    "approach_force_n": 1500.0,
    "pressing_m": 0.040,
    "pressing_from_n": 20e3,
    "pressing_to_n": 100e3,
}

n = D["speed_rpm"] / 60.0
QTH_L = D["large_displacement_m3"] * n
QTH_S = D["small_displacement_m3"] * n
K_L = (1 - D["large_eta_v"]) * QTH_L / D["large_rated_pa"]
K_S = (1 - D["small_eta_v"]) * QTH_S / D["small_rated_pa"]
A_CAP = math.pi * D["bore_m"] ** 2 / 4
A_ANN = math.pi * (D["bore_m"] ** 2 - D["rod_m"] ** 2) / 4
PHI = A_CAP / A_ANN
P_U = D["unloading_pa"]
BAND = D["unloading_band_fraction"] * P_U
P_RC, P_RF = D["relief_cracking_pa"], D["relief_full_pa"]
BETA = D["bulk_modulus_pa"]


def quad(dp, q):
    return dp / q**2


K_CV = quad(D["check_drop_pa"], D["check_flow_m3s"])
K_BP = quad(D["back_pressure_pa"], D["back_pressure_flow_m3s"])
K_VALVE = quad(D["valve_drop_pa"], D["valve_flow_m3s"])
K_PLINE = quad(D["line_pressure_drop_pa"], D["line_flow_m3s"])
K_RLINE = quad(D["line_return_drop_pa"], D["line_flow_m3s"])


def closed_fraction(p):
    """Share of the large pump still sent to the system at pilot pressure p."""
    if p <= P_U:
        return 1.0
    if p >= P_U + BAND:
        return 0.0
    return 1.0 - (p - P_U) / BAND


def relief_share(p):
    if p <= P_RC:
        return 0.0
    if p >= P_RF:
        return 1.0
    return (p - P_RC) / (P_RF - P_RC)


def large_delivery(p, f):
    """Large-pump delivery: Q = Qth - K*p_L with p_L blended across the band."""

    def outlet(q):
        return f * (p + D["check_cracking_pa"] + K_CV * (f * q) ** 2) + (1 - f) * K_BP * (
            (1 - f) * q
        ) ** 2

    def r(q):
        return q - (QTH_L - K_L * outlet(q))

    if r(0.0) >= 0.0:
        return 0.0
    return brentq(r, 0.0, QTH_L, xtol=1e-16, rtol=1e-14)


def delivery(p):
    """Flow from the power unit to the directional valve at system pressure p."""
    # Trial stages of the integrator may step outside 0..p_rf; clamp them.
    p = min(max(p, 0.0), P_RF)
    q_s = max(QTH_S - K_S * p, 0.0)
    f = closed_fraction(p)
    q_l = large_delivery(p, f) if f > 0 else 0.0
    return (q_s + f * q_l) * (1.0 - relief_share(p))


def hose_drop(bore, length, q):
    if q <= 0:
        return 0.0
    area = math.pi * bore**2 / 4
    v = q / area
    re = v * bore / D["viscosity_m2s"]
    if re < 2300:
        f = 64 / re
    elif re <= 4000:
        lo, hi = 64 / 2300, 0.316 * 4000**-0.25
        f = lo + (re - 2300) / 1700 * (hi - lo)
    else:
        f = 0.316 * re**-0.25
    return f * length / bore * D["density_kg_m3"] * v**2 / 2


def required(force, q):
    """Pump pressure that moves `force` extending with q into the cap end."""
    q_ret = q / PHI
    rod = (K_VALVE + K_RLINE) * q_ret**2 + hose_drop(
        D["return_hose_bore_m"], D["return_hose_length_m"], q_ret
    )
    cap = (force + rod * A_ANN) / A_CAP
    return (
        cap
        + (K_VALVE + K_PLINE) * q**2
        + hose_drop(D["pressure_hose_bore_m"], D["pressure_hose_length_m"], q)
    )


def p_eq(force):
    g = lambda p: p - required(force, delivery(p))  # noqa: E731
    return brentq(g, 0.0, P_RF, xtol=1e-9, rtol=1e-15)


def force_law(x):
    s = (x - D["approach_m"]) / D["pressing_m"]
    return D["pressing_from_n"] + s * (D["pressing_to_n"] - D["pressing_from_n"])


def volume(x):
    return D["dead_volume_m3"] + A_CAP * x


def dp_eq_dx(x, p):
    """dp/dx along the force law: dF/dx over dF/dp at steady motion."""
    h = 1e-3 * BAR
    force_at = lambda q: (q - required(0.0, delivery(q))) * A_CAP  # noqa: E731
    dfdp = (force_at(p + h) - force_at(p - h)) / (2 * h)
    slope = (D["pressing_to_n"] - D["pressing_from_n"]) / D["pressing_m"]
    return slope / dfdp


def solve(rtol=RTOL):
    x0 = D["approach_m"]
    p_a = p_eq(D["approach_force_n"])
    p_1 = p_eq(force_law(x0))
    v0 = volume(x0)

    def reach(t, y):
        return y[0] - p_1

    reach.terminal = True
    rise = solve_ivp(
        lambda t, y: [BETA * delivery(y[0]) / v0],
        (0.0, 100.0),
        [p_a],
        method="RK45",
        rtol=rtol,
        atol=1e-3,
        events=reach,
    )
    t_rise = rise.t_events[0][0]

    x_end = x0 + D["pressing_m"]

    def move(t, y):
        x = min(y[0], x_end)
        p = p_eq(force_law(x))
        return [delivery(p) / (A_CAP + volume(x) / BETA * dp_eq_dx(x, p))]

    def done(t, y):
        return y[0] - x_end

    done.terminal = True
    travel = solve_ivp(
        move, (0.0, 1000.0), [x0], method="RK45", rtol=rtol, atol=1e-12, events=done
    )
    t_travel = travel.t_events[0][0]
    return {
        "rise_time_s": t_rise,
        "travel_time_s": t_travel,
        "pressing_time_s": t_rise + t_travel,
        "approach_pressure_pa": p_a,
        "final_pressure_pa": p_eq(force_law(x_end)),
        "rhs_evaluations": int(rise.nfev + travel.nfev),
    }


def main():
    out = sys.argv[1] if len(sys.argv) > 1 else "target/reference/pressing.json"
    result = solve()
    # A much tighter run shows how much of any difference is SciPy's own error.
    result["pressing_time_tight_s"] = solve(1e-10)["pressing_time_s"]
    result["rtol_tight"] = 1e-10
    runs = []
    for _ in range(7):
        t0 = time.perf_counter()
        solve()
        runs.append(time.perf_counter() - t0)
    result.update(
        {
            "design": D,
            "rtol": RTOL,
            "method": "scipy.integrate.solve_ivp RK45 with events; brentq for p_eq",
            "solve_time_median_s": statistics.median(runs),
            "runs": len(runs),
            "scipy_version": scipy.__version__,
            "numpy_version": np.__version__,
        }
    )
    with open(out, "w") as f:
        json.dump(result, f, indent=2)
    print(
        "reference: pressing %.6f s (rise %.6f s), final %.3f bar; "
        "SciPy solve median %.3f ms over %d runs -> %s"
        % (
            result["pressing_time_s"],
            result["rise_time_s"],
            result["final_pressure_pa"] / BAR,
            1e3 * result["solve_time_median_s"],
            len(runs),
            out,
        )
    )


if __name__ == "__main__":
    main()
