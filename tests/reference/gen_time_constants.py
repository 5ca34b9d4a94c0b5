#!/usr/bin/env python3
"""Reference time constants of a small network with capacities (our own numbers: a loaded
board, its case top, a joint without capacity and a chassis, all to ambient air).

The free nodes' conductance matrix G and capacity matrix C are assembled here; the node
without capacity is eliminated by the Schur complement (numpy), and scipy.linalg.eigh solves
the generalised symmetric problem G_red·v = λ·C·v. As a second check the slowest time constant
is compared with the decay of scipy.integrate.solve_ivp of C·dT/dt = −G_red·T started on the
slowest mode. Writes tests/reference/time_constants/small_network.json, read by
compiler/tests/time_constants.rs.

Run from anywhere:  python3 tests/reference/gen_time_constants.py
"""

import json
import os

import numpy as np
import scipy
from scipy import integrate, linalg

HERE = os.path.dirname(os.path.abspath(__file__))

# Free nodes: board, case_top, joint, chassis; resistances in K/W, capacities in J/K.
NODES = ["board", "case_top", "joint", "chassis"]
CAP = {"board": 1000.0, "case_top": 500.0, "joint": 0.0, "chassis": 2000.0}
LINKS = [
    ("board", "case_top", 0.5),
    ("case_top", "joint", 0.2),
    ("joint", "chassis", 0.3),
    ("joint", "ambient", 1.0),
    ("chassis", "ambient", 2.0),
    ("board", "ambient", 4.0),
]


def main():
    idx = {n: i for i, n in enumerate(NODES)}
    g = np.zeros((4, 4))
    for a, b, r in LINKS:
        for n in (a, b):
            if n in idx:
                g[idx[n], idx[n]] += 1 / r
        if a in idx and b in idx:
            g[idx[a], idx[b]] -= 1 / r
            g[idx[b], idx[a]] -= 1 / r
    c = [i for i, n in enumerate(NODES) if CAP[n] > 0]
    z = [i for i, n in enumerate(NODES) if CAP[n] == 0]
    g_red = g[np.ix_(c, c)] - g[np.ix_(c, z)] @ np.linalg.solve(g[np.ix_(z, z)], g[np.ix_(z, c)])
    cm = np.diag([CAP[NODES[i]] for i in c])
    lam, vec = linalg.eigh(g_red, cm)
    slowest, fastest = 1 / lam[0], 1 / lam[-1]
    # The slowest mode decays as exp(−t/τ): integrate it for one τ and compare.
    sol = integrate.solve_ivp(lambda t, x: -np.linalg.solve(cm, g_red @ x), (0, slowest), vec[:, 0], rtol=1e-12, atol=1e-14)
    ratio = sol.y[:, -1] / vec[:, 0]
    assert np.allclose(ratio, np.exp(-1), rtol=1e-8), ratio
    out = {
        "generated_by": f"tests/reference/gen_time_constants.py with numpy {np.__version__}, scipy {scipy.__version__}",
        "slowest_s": slowest,
        "fastest_s": fastest,
        "modes": len(c),
    }
    os.makedirs(os.path.join(HERE, "time_constants"), exist_ok=True)
    with open(os.path.join(HERE, "time_constants", "small_network.json"), "w", encoding="utf-8") as f:
        json.dump(out, f, indent=2)
        f.write("\n")


if __name__ == "__main__":
    main()
