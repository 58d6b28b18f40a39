#!/usr/bin/python3
"""Reference poses of URDF chains from Orocos KDL (Debian python3-pykdl), read with Python's own XML parser.

Run by hand with the SYSTEM python (PyKDL is built for Debian's python3):
    apt-get install -y python3-pykdl
    /usr/bin/python3 test/reference/make_urdf_kdl_fixture.py
It writes test/reference/urdf-kdl-fixture.json. The fixture is committed; CI does not run this script.

Inputs: every test/reference/urdf/*.urdf. handmade-7j.urdf is an invented arm written by hand (fixed joints, a side
branch, axes other than z, a prismatic joint, a mimic joint, a tool frame); the other files are `armdex export urdf`
of the demo arms, refreshed with
    for a in arms/*.json; do npx armdex export urdf $a > test/reference/urdf/$(basename $a .json).urdf; done
Nothing of the project's code computes these poses: xml.etree reads the attributes, KDL builds the chain.
Each URDF joint becomes two KDL segments: a fixed one carrying the origin (Frame(Rotation.RPY(r, p, y), Vector)),
then one whose joint turns about (or slides along) the axis through the origin, in that frame. Fixed URDF joints
are just the first part. Mimic joints get multiplier * master + offset, as URDF defines them.
"""
import json
import math
import os
import platform
import random
import subprocess
import xml.etree.ElementTree as ET

import PyKDL as kdl

HERE = os.path.dirname(os.path.abspath(__file__))
CHAINS = {"handmade-7j.urdf": ("world", "tool0")}  # others: base → flange
SAMPLES = 6


def nums(text, default):
    return [float(v) for v in text.split()] if text is not None else default


def chain_joints(root_el, root, tip):
    by_child = {j.find("child").get("link"): j for j in root_el.findall("joint")}
    path, link = [], tip
    while link != root:
        j = by_child[link]
        path.append(j)
        link = j.find("parent").get("link")
    return list(reversed(path))


def build(joints):
    chain = kdl.Chain()
    movable = []
    for j in joints:
        o = j.find("origin")
        xyz = nums(o.get("xyz") if o is not None else None, [0, 0, 0])
        rpy = nums(o.get("rpy") if o is not None else None, [0, 0, 0])
        chain.addSegment(kdl.Segment(kdl.Joint(kdl.Joint.Fixed), kdl.Frame(kdl.Rotation.RPY(*rpy), kdl.Vector(*xyz))))
        kind = j.get("type")
        if kind == "fixed":
            continue
        a = j.find("axis")
        axis = kdl.Vector(*nums(a.get("xyz") if a is not None else None, [1, 0, 0]))
        jt = kdl.Joint.TransAxis if kind == "prismatic" else kdl.Joint.RotAxis
        chain.addSegment(kdl.Segment(kdl.Joint(j.get("name"), kdl.Vector(0, 0, 0), axis, jt), kdl.Frame.Identity()))
        lim = j.find("limit")
        mimic = j.find("mimic")
        movable.append(
            {
                "name": j.get("name"),
                "lower": float(lim.get("lower", "-3.14")) if lim is not None else -3.14,
                "upper": float(lim.get("upper", "3.14")) if lim is not None else 3.14,
                "mimic": None
                if mimic is None
                else (mimic.get("joint"), float(mimic.get("multiplier", "1")), float(mimic.get("offset", "0"))),
            }
        )
    return chain, movable


def package_version(name):
    try:
        return subprocess.run(["dpkg-query", "-W", "-f=${Version}", name], capture_output=True, text=True).stdout
    except OSError:
        return None


def main():
    rng = random.Random(20261204)
    cases = []
    for fname in sorted(os.listdir(os.path.join(HERE, "urdf"))):
        if not fname.endswith(".urdf"):
            continue
        root, tip = CHAINS.get(fname, ("base", "flange"))
        tree = ET.parse(os.path.join(HERE, "urdf", fname)).getroot()
        chain, movable = build(chain_joints(tree, root, tip))
        solver = kdl.ChainFkSolverPos_recursive(chain)
        samples = []
        for _ in range(SAMPLES):
            values = {}
            for m in movable:  # masters come before their mimics in these chains
                if m["mimic"] is None:
                    lo, hi = max(m["lower"], -3.2), min(m["upper"], 3.2)
                    values[m["name"]] = lo + (hi - lo) * rng.random()
                else:
                    master, mult, off = m["mimic"]
                    values[m["name"]] = mult * values[master] + off
            q = kdl.JntArray(len(movable))
            for i, m in enumerate(movable):
                q[i] = values[m["name"]]
            f = kdl.Frame()
            solver.JntToCart(q, f)
            pose = [[f.M[r, c] for c in range(3)] + [f.p[r]] for r in range(3)] + [[0.0, 0.0, 0.0, 1.0]]
            driven = {m["name"]: values[m["name"]] for m in movable if m["mimic"] is None}
            samples.append({"driven": driven, "pose": pose})
        cases.append({"file": fname, "root": root, "tip": tip, "samples": samples})
    fixture = {
        "generator": "test/reference/make_urdf_kdl_fixture.py",
        "units": "driven joint values in rad or m (URDF units); pose = base-from-tip 4x4 in m",
        "versions": {
            "PyKDL": getattr(kdl, "__version__", None),
            "python3-pykdl (dpkg)": package_version("python3-pykdl"),
            "python": platform.python_version(),
        },
        "cases": cases,
    }
    with open(os.path.join(HERE, "urdf-kdl-fixture.json"), "w") as f:
        json.dump(fixture, f, indent=1, sort_keys=True)
        f.write("\n")


if __name__ == "__main__":
    main()
