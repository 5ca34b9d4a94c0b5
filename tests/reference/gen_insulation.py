#!/usr/bin/env python3
"""Reference values for the whole-build-up insulation check (warning W110): the heat loss of a
radial build-up against the bare pipe's, and the break-even radius where thickening the
outermost insulating shell brings the loss back to the bare pipe's.

Shell resistances from ht.conduction.R_cylinder; the outer film by Newton's law of cooling at
its radius; the break-even radius by scipy.optimize.brentq. Writes
tests/reference/insulation/break_even.json, read by compiler/tests/physics_diagnostics.rs.

Run from anywhere:  python3 tests/reference/gen_insulation.py
"""

import json
import math
import os

import ht
import scipy
from scipy.optimize import brentq

HERE = os.path.dirname(os.path.abspath(__file__))


def film(h, r, length):
    return 1.0 / (h * 2 * math.pi * r * length)


def steel_foam_aluminium():
    """A small hot-water tube: steel 6→8 mm, foam 3 mm (k = 0.2), aluminium jacket 0.5 mm,
    h = 10 W/(m²·K), 2 m, 80 °C inside and 20 °C outside (our own numbers)."""
    length, h, dt = 2.0, 10.0, 60.0
    r_steel = ht.conduction.R_cylinder(0.012, 0.016, 50.0, length)

    def total(x):  # the foam's outer radius x; the jacket keeps its 0.5 mm
        return (
            r_steel
            + ht.conduction.R_cylinder(0.016, 2 * x, 0.2, length)
            + ht.conduction.R_cylinder(2 * x, 2 * (x + 0.0005), 200.0, length)
            + film(h, x + 0.0005, length)
        )

    r_bare = r_steel + film(h, 0.008, length)
    r_insulated = total(0.011)
    return {
        "name": "steel_foam_aluminium",
        "extra_loss_W": dt / r_insulated - dt / r_bare,
        "extra_loss_percent": 100 * (r_bare / r_insulated - 1),
        "break_even_radius_m": brentq(lambda x: total(x) - r_bare, 0.02, 1.0, xtol=1e-15, rtol=1e-14),
    }


def main():
    out = {
        "generated_by": f"tests/reference/gen_insulation.py with ht {ht.__version__}, scipy {scipy.__version__}",
        "cases": [steel_foam_aluminium()],
    }
    os.makedirs(os.path.join(HERE, "insulation"), exist_ok=True)
    with open(os.path.join(HERE, "insulation", "break_even.json"), "w", encoding="utf-8") as f:
        json.dump(out, f, indent=2)
        f.write("\n")


if __name__ == "__main__":
    main()
