#!/usr/bin/python3
"""Reference fixture from Orocos KDL (Debian python3-pykdl) for the generic 6R test arm of CHECKS.md section 0.

Run by hand with the SYSTEM python (PyKDL is built for Debian's python3):
    apt-get install -y python3-pykdl
    /usr/bin/python3 test/reference/make_kdl_fixture.py
It writes test/reference/kdl-fixture.json next to this script. The fixture is committed; CI does not run this.

Arm (invented round numbers, standard DH, A_i = Rz(theta_i) Tz(d_i) Tx(a_i) Rx(alpha_i), theta offsets 0):
    a = (0.2, 1.0, 0.2, 0, 0, 0) m, alpha = (-90, 0, -90, +90, -90, 0) deg, d = (0.5, 0, 0, 1.0, 0, 0.1) m.
KDL: each segment is Segment(Joint(RotZ), Frame.DH(a, alpha, d, theta)), so its pose is Rz(q) * DH(a, alpha, d, 0).
Jacobian: ChainJntToJacSolver, rows (vx, vy, vz, wx, wy, wz) in the base frame, reference point = chain tip.
"""
import json
import math
import os
import platform
import subprocess

import PyKDL as kdl

DH = [  # (a m, alpha rad, d m, theta rad)
    (0.2, -math.pi / 2, 0.5, 0.0),
    (1.0, 0.0, 0.0, 0.0),
    (0.2, -math.pi / 2, 0.0, 0.0),
    (0.0, math.pi / 2, 1.0, 0.0),
    (0.0, -math.pi / 2, 0.0, 0.0),
    (0.0, 0.0, 0.1, 0.0),
]

POSES = [
    [0.3, -0.7, 0.4, 1.1, 0.8, -0.2],  # q* of CHECKS section 0
    [0.1, 0.2, -0.3, 0.4, -0.5, 0.6],
    [-1.2, 0.5, 1.0, -2.0, 1.3, 2.5],
    [2.0, -1.5, -0.8, 0.7, -2.2, -1.0],
]


def det(m):
    """Determinant by Gaussian elimination with partial pivoting (plain Python, so the script needs only PyKDL)."""
    a = [row[:] for row in m]
    n = len(a)
    result = 1.0
    for k in range(n):
        p = max(range(k, n), key=lambda r: abs(a[r][k]))
        if a[p][k] == 0.0:
            return 0.0
        if p != k:
            a[k], a[p] = a[p], a[k]
            result = -result
        result *= a[k][k]
        for r in range(k + 1, n):
            f = a[r][k] / a[k][k]
            for c in range(k, n):
                a[r][c] -= f * a[k][c]
    return result


def package_version(name):
    try:
        return subprocess.run(["dpkg-query", "-W", "-f=${Version}", name], capture_output=True, text=True, check=True).stdout
    except (OSError, subprocess.CalledProcessError):
        return None


def main():
    chain = kdl.Chain()
    for a, alpha, d, theta in DH:
        chain.addSegment(kdl.Segment(kdl.Joint(kdl.Joint.RotZ), kdl.Frame.DH(a, alpha, d, theta)))
    fk = kdl.ChainFkSolverPos_recursive(chain)
    jac_solver = kdl.ChainJntToJacSolver(chain)
    cases = []
    for q in POSES:
        qa = kdl.JntArray(6)
        for i, v in enumerate(q):
            qa[i] = v
        frame = kdl.Frame()
        fk.JntToCart(qa, frame)
        jac = kdl.Jacobian(6)
        jac_solver.JntToJac(qa, jac)
        t = [[frame.M[r, c] for c in range(3)] + [frame.p[r]] for r in range(3)] + [[0.0, 0.0, 0.0, 1.0]]
        j = [[jac[r, c] for c in range(6)] for r in range(6)]
        cases.append({
            "qRad": q,
            "baseFromFlange": [x for row in t for x in row],
            "jacobian": [x for row in j for x in row],
            "detJacobian": det(j),
        })
    fixture = {
        "description": "Orocos KDL reference for the generic 6R of CHECKS.md section 0 (standard DH, invented). "
                       "baseFromFlange: row-major 4x4, m. jacobian: row-major 6x6, rows (vx, vy, vz, wx, wy, wz), "
                       "base frame, reference point at the flange. detJacobian: its determinant by Gaussian elimination with partial pivoting.",
        "generator": "test/reference/make_kdl_fixture.py",
        "versions": {
            "PyKDL": getattr(kdl, "__version__", None),
            "python3-pykdl (dpkg)": package_version("python3-pykdl"),
            "python": platform.python_version(),
        },
        "dh": [{"a": a, "alpha": alpha, "d": d, "theta": theta} for a, alpha, d, theta in DH],
        "cases": cases,
    }
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "kdl-fixture.json")
    with open(path, "w", encoding="utf-8") as f:
        json.dump(fixture, f, indent=1, sort_keys=True)
        f.write("\n")
    print("wrote", path)


if __name__ == "__main__":
    main()
