#!/usr/bin/env python3
"""Independent reference for the time-optimal timing (src/core/analysis/cell/timeOptimal.ts) on a planar 3R arm.

Run by hand with a Python that has numpy and scipy:
    python3 test/core/analysis/cell/make_topp_fixture.py
It writes topp-fixture.json next to this script. The fixture is committed; CI does not run this.

Arm (invented round numbers): a planar 3R, link lengths L1 = 0.5, L2 = 0.4, L3 = 0.1 m, joint angles q1, q2, q3
measured from the previous link (q1 from the x axis). Tool point p = L1 e(q1) + L2 e(q1+q2) + L3 e(q1+q2+q3),
tool angle phi = q1 + q2 + q3, with e(a) = (cos a, sin a).
Path: the tool point on the straight line P0 -> P1 at constant tool angle phi = -90 deg, s = arc length (m), so
|dp/ds| = 1 at every stage. Elbow branch q2 > 0.

Independence from the TypeScript module:
  - closed-form inverse kinematics of the 3R (the wrist point w = p - L3 e(phi), then the 2R cosine rule);
  - analytic path derivatives: dq12/ds = J^-1 dw/ds and d2q12/ds2 = -J^-1 (dJ/ds) dq12/ds (dw/ds is the line's unit
    direction, d2w/ds2 = 0), dq3 = -(dq1 + dq2), ddq3 = -(ddq1 + ddq2); no finite differences;
  - the reachability analysis (Pham & Pham, IEEE T-RO 34(3), 2018) with every per-stage problem solved as a linear
    programme by scipy.optimize.linprog (HiGHS): backward pass, two LPs per stage (min and max of x = sdot^2 over
    (u, x)); forward pass, one LP per stage (max u). Same discretisation: constant u over a stage,
    x_{i+1} = x_i + 2 ds_i u_i, the acceleration limits at both ends of each stage (at s_{i+1} with x_i + 2 ds_i u_i),
    time = sum 2 ds_i / (sqrt x_i + sqrt x_{i+1}).
  - the most used limit per stage is classified here from the analytic derivatives.
A converged value (many stages) is written too, for the discretisation error.
"""
import json
import re
import math
import os
import platform

import numpy as np
import scipy
from scipy.optimize import linprog

L1, L2, L3 = 0.5, 0.4, 0.1
P0 = np.array([0.75, -0.25])
P1 = np.array([0.35, 0.45])
PHI = -math.pi / 2
LENGTH = float(np.linalg.norm(P1 - P0))
DIRECTION = (P1 - P0) / LENGTH

VMAX = np.array([1.5, 2.0, 3.0])  # rad/s
AMAX = np.array([5.0, 8.0, 12.0])  # rad/s^2


def ik(p):
    """Closed-form inverse kinematics, elbow q2 > 0."""
    w = p - L3 * np.array([math.cos(PHI), math.sin(PHI)])
    c2 = (w @ w - L1 * L1 - L2 * L2) / (2 * L1 * L2)
    q2 = math.acos(c2)
    q1 = math.atan2(w[1], w[0]) - math.atan2(L2 * math.sin(q2), L1 + L2 * math.cos(q2))
    return np.array([q1, q2, PHI - q1 - q2])


def derivatives(q):
    """Analytic dq/ds and d2q/ds2 along the line at constant tool angle."""
    q1, q2 = q[0], q[1]
    s1, c1, s12, c12 = math.sin(q1), math.cos(q1), math.sin(q1 + q2), math.cos(q1 + q2)
    jac = np.array([[-L1 * s1 - L2 * s12, -L2 * s12], [L1 * c1 + L2 * c12, L2 * c12]])
    d12 = np.linalg.solve(jac, DIRECTION)
    a, b = d12
    jdot = np.array(
        [
            [-L1 * c1 * a - L2 * c12 * (a + b), -L2 * c12 * (a + b)],
            [-L1 * s1 * a - L2 * s12 * (a + b), -L2 * s12 * (a + b)],
        ]
    )
    dd12 = np.linalg.solve(jac, -jdot @ d12)
    dq = np.array([a, b, -(a + b)])
    ddq = np.array([dd12[0], dd12[1], -(dd12[0] + dd12[1])])
    return dq, ddq


def lp(c, a_ub, b_ub, bounds):
    res = linprog(c, A_ub=a_ub, b_ub=b_ub, bounds=bounds, method="highs")
    if res.status != 0:
        raise RuntimeError(f"linprog failed: {res.message}")
    return res


def accel_rows(dqs, ddqs, i, j, h):
    """Joint j's acceleration as (coefficient of u, coefficient of x) at the start and at the end of stage i."""
    return [(dqs[i, j], ddqs[i, j]), (dqs[i + 1, j] + 2 * h * ddqs[i + 1, j], ddqs[i + 1, j])]


def topp(s, amax, tool_cap):
    n = len(s)
    dqs, ddqs = zip(*(derivatives(ik(P0 + si * DIRECTION)) for si in s))
    dqs, ddqs = np.array(dqs), np.array(ddqs)
    xcap = np.full(n, np.inf)
    for i in range(n):
        for j in range(3):
            if abs(dqs[i, j]) > 0:
                xcap[i] = min(xcap[i], (VMAX[j] / abs(dqs[i, j])) ** 2)
        if tool_cap is not None:
            xcap[i] = min(xcap[i], tool_cap**2)  # |dp/ds| = 1
    k_lo, k_hi = np.zeros(n), np.zeros(n)
    for i in range(n - 2, -1, -1):
        h = s[i + 1] - s[i]
        # Variables z = (u, x). Acceleration limits at both ends of the stage: -a <= q'_i u + q''_i x <= a and
        # -a <= q'_{i+1} u + q''_{i+1} (x + 2 h u) <= a; reach: k_lo <= x + 2 h u <= k_hi.
        rows, rhs = [], []
        for j in range(3):
            for c, d in accel_rows(dqs, ddqs, i, j, h):
                rows += [[c, d], [-c, -d]]
                rhs += [amax[j], amax[j]]
        rows += [[2 * h, 1.0], [-2 * h, -1.0]]
        rhs += [k_hi[i + 1], -k_lo[i + 1]]
        bounds = [(None, None), (0.0, None if math.isinf(xcap[i]) else xcap[i])]
        k_lo[i] = lp([0, 1], rows, rhs, bounds).x[1]
        k_hi[i] = lp([0, -1], rows, rhs, bounds).x[1]
    assert k_lo[0] <= 1e-9, "rest start not controllable"
    x = np.zeros(n)
    for i in range(n - 1):
        h = s[i + 1] - s[i]
        rows, rhs = [], []
        for j in range(3):
            for c, d in accel_rows(dqs, ddqs, i, j, h):
                rows += [[c], [-c]]
                rhs += [amax[j] - d * x[i], amax[j] + d * x[i]]
        rows += [[2 * h], [-2 * h]]
        rhs += [k_hi[i + 1] - x[i], -(k_lo[i + 1] - x[i])]
        u = lp([-1], rows, rhs, [(None, None)]).x[0]
        x[i + 1] = min(max(x[i] + 2 * h * u, k_lo[i + 1], 0.0), k_hi[i + 1])
    x[-1] = 0.0
    sd = np.sqrt(x)
    dt = 2 * np.diff(s) / (sd[:-1] + sd[1:])
    # Most used limit per stage (speeds at x_i, accelerations with u_i), time share of each.
    share = {}
    worst_speed, worst_accel = 0.0, 0.0
    for i in range(n - 1):
        u = (x[i + 1] - x[i]) / (2 * (s[i + 1] - s[i]))
        uses = {}
        for j in range(3):
            uses[("speed", j)] = sd[i] * abs(dqs[i, j]) / VMAX[j]
            qdd_start = dqs[i, j] * u + ddqs[i, j] * x[i]
            qdd_end = dqs[i + 1, j] * u + ddqs[i + 1, j] * x[i + 1]
            uses[("acceleration", j)] = max(abs(qdd_start), abs(qdd_end)) / amax[j]
        if tool_cap is not None:
            uses[("tool-speed", None)] = sd[i] / tool_cap
        key = max(uses, key=uses.get)
        share[key] = share.get(key, 0.0) + dt[i]
        worst_speed = max(worst_speed, max(v for k, v in uses.items() if k[0] != "acceleration"))
        worst_accel = max(worst_accel, max(v for k, v in uses.items() if k[0] == "acceleration"))
    total = float(dt.sum())
    top = max(share, key=share.get)
    return {
        "timeS": total,
        "sDot": [float(v) for v in sd],
        "limitedBy": {"kind": top[0], "joint": top[1], "shareOfTime": share[top] / total},
        "shares": [{"kind": k[0], "joint": k[1], "shareOfTime": v / total} for k, v in sorted(share.items(), key=str)],
        "maxSpeedUse": worst_speed,
        "maxAccelUse": worst_accel,
    }


def uniform(n):
    """s_i = LENGTH * i / (n - 1)."""
    return np.linspace(0.0, LENGTH, n)


def graded(n):
    """A nonuniform grid: t + 0.15 sin(2 pi t) / (2 pi) stretched to the line (strictly increasing)."""
    t = np.linspace(0.0, 1.0, n)
    return LENGTH * (t + 0.15 * np.sin(2 * math.pi * t) / (2 * math.pi))


def main():
    assumed = VMAX / 0.25  # a joint without a given acceleration: full speed in 0.25 s
    scenarios = [
        ("joints", AMAX, None),
        ("tool-cap-0.6", AMAX, 0.6),
        ("j1-accel-assumed", np.array([assumed[0], AMAX[1], AMAX[2]]), None),
    ]
    cases = []
    for name, amax, cap in scenarios:
        for grid, n in [("uniform", 101), ("uniform", 201), ("uniform", 401), ("graded", 201)]:
            s = uniform(n) if grid == "uniform" else graded(n)
            r = topp(s, amax, cap)
            cases.append(
                {
                    "scenario": name,
                    "grid": grid,
                    "n": n,
                    "maxAccelSi": [None if name == "j1-accel-assumed" and j == 0 else float(amax[j]) for j in range(3)],
                    "toolCapMPerS": cap,
                    **r,
                }
            )
            print(f"{name:18s} {grid:8s} N={n:4d}  T = {r['timeS']:.9f} s  limited by {r['limitedBy']}")
    converged = []
    for name, amax, cap in scenarios:
        n = 3201
        r = topp(uniform(n), amax, cap)
        converged.append({"scenario": name, "n": n, "timeS": r["timeS"]})
        print(f"{name:18s} converged N={n}  T = {r['timeS']:.9f} s")
    fixture = {
        "generatedBy": "test/core/analysis/cell/make_topp_fixture.py",
        "method": "reachability analysis (Pham & Pham 2018), per-stage LPs by scipy.optimize.linprog (HiGHS); "
        "closed-form IK and analytic path derivatives of a planar 3R",
        "python": platform.python_version(),
        "numpy": np.__version__,
        "scipy": scipy.__version__,
        "arm": {"linkLengthsM": [L1, L2, L3], "elbow": "q2 > 0"},
        "path": {"p0M": P0.tolist(), "p1M": P1.tolist(), "toolAngleRad": PHI, "lengthM": LENGTH},
        "maxSpeedSi": VMAX.tolist(),
        "assumedTimeToTopSpeedS": 0.25,
        "cases": cases,
        "converged": converged,
    }
    out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "topp-fixture.json")
    text = json.dumps(fixture, indent=1)
    # One line per number list, to keep the file short.
    text = re.sub(r"\[\s*([-0-9.e, \n]+?)\s*\]", lambda mt: "[" + re.sub(r"\s+", " ", mt.group(1)) + "]", text)
    with open(out, "w") as f:
        f.write(text + "\n")
    print("wrote", out)


if __name__ == "__main__":
    main()
