#!/usr/bin/env python3
"""Regenerate the outside reference tables used by the integration tests.

Run from anywhere:  python3 tests/reference/make_reference.py
Needs: iapws, fluids (and mpmath, which fluids uses for the exact Colebrook).
Writes plain CSV files next to this script. Each file starts with one comment
line ("# ...") naming the libraries and versions used, then a header line
naming the columns with their units, then the rows. The files are committed so
that `cargo test` needs no Python.

Tables:
- water.csv       IAPWS-95 density, IAPWS 2008 viscosity, at 101.325 kPa
- air.csv         dry air, Lemmon et al. (2000) equation of state and
                  Lemmon & Jacobsen (2004) viscosity, at 101.325 kPa
- colebrook.csv   Colebrook (1939) Darcy friction factor, exact (fluids,
                  tol=0: mpmath-backed), and Swamee-Jain (1976)
- duct.csv        pressure loss of straight ducts with minor losses, water
- sphere_drag.csv rigid-sphere drag coefficients
"""

import math
import os
import platform

import fluids
import iapws
import mpmath
from fluids.drag import Morsi_Alexander
from fluids.friction import Colebrook, Swamee_Jain_1976
from iapws import IAPWS95
from iapws.humidAir import Air

HERE = os.path.dirname(os.path.abspath(__file__))
P_ATM_PA = 101_325.0
P_ATM_MPA = P_ATM_PA / 1e6  # iapws takes MPa


def versions(*libs):
    parts = ["Python " + platform.python_version()]
    parts += [f"{lib.__name__} {lib.__version__}" for lib in libs]
    return ", ".join(parts)


def write(name, comment, header, rows):
    """Write one table. Floats are written with repr (shortest round-trip)."""
    path = os.path.join(HERE, name)
    with open(path, "w", encoding="utf-8", newline="\n") as out:
        out.write("# " + comment + "\n")
        out.write(",".join(header) + "\n")
        for row in rows:
            out.write(",".join(repr(float(v)) for v in row) + "\n")
    print(f"wrote {path} ({len(rows)} rows)")


def water():
    rows = []
    for t_c in [1, 5, 10, 15, 20, 25, 30, 35, 40, 45]:
        w = IAPWS95(T=t_c + 273.15, P=P_ATM_MPA)
        rows.append((t_c, P_ATM_PA, w.rho, w.mu))
    write(
        "water.csv",
        "liquid water, iapws.IAPWS95 (IAPWS-95 density, IAPWS 2008 viscosity); "
        + versions(iapws),
        ["temperature_c", "pressure_pa", "density_kg_m3", "viscosity_pa_s"],
        rows,
    )


def air():
    rows = []
    for t_c in [0, 10, 20, 30, 40]:
        a = Air(T=t_c + 273.15, P=P_ATM_MPA)
        rows.append((t_c, P_ATM_PA, a.rho, a.mu))
    write(
        "air.csv",
        "dry air, iapws.humidAir.Air (Lemmon et al. 2000 EoS, "
        "Lemmon & Jacobsen 2004 viscosity); " + versions(iapws),
        ["temperature_c", "pressure_pa", "density_kg_m3", "viscosity_pa_s"],
        rows,
    )


def colebrook():
    grid_re = [2e4, 5e4, 1e5, 2e5, 5e5, 1e6, 2e6, 5e6, 1e7]
    grid_rr = [0.0, 1e-5, 1e-4, 1e-3, 1e-2]
    points = [(re, rr) for rr in grid_rr for re in grid_re]
    # The exact points listed in docs references.md (M3, M4).
    for p in [(1e5, 1e-4), (1e4, 0.0), (1e5, 0.0), (1e6, 1e-4), (2e4, 1e-3)]:
        if p not in points:
            points.append(p)
    rows = []
    for re, rr in points:
        rows.append((re, rr, Colebrook(re, rr, tol=0), Swamee_Jain_1976(re, rr)))
    write(
        "colebrook.csv",
        "Darcy friction factor, fluids.friction.Colebrook(tol=0, exact via mpmath) "
        "and fluids.friction.Swamee_Jain_1976; " + versions(fluids, mpmath),
        ["re", "relative_roughness", "colebrook_f", "swamee_jain_f"],
        rows,
    )


def duct():
    # Invented ducts of the sizes a sprinkler meets (arm tube, hose, supply
    # pipe), water at 20 C from IAPWS. Friction: fluids.one_phase_dP with the
    # Colebrook method (fluids takes f = 64/Re below Re = 2040; the cases avoid
    # the transition band 2040..4000 where the two codes blend differently).
    # Minor losses: fluids.dP_from_K.
    w = IAPWS95(T=293.15, P=P_ATM_MPA)
    rho, mu = w.rho, w.mu
    cases = [
        # bore_m, length_m, roughness_m, minor_k, flow_m3_s
        (0.008, 0.15, 1.5e-6, 1.2, 0.30e-3),
        (0.01905, 30.48, 0.0, 1.5, 1.2e-3),
        (0.0266, 50.0, 1.5e-6, 3.0, 2.0e-3),
        (0.020, 10.0, 1.5e-4, 0.0, 1.0e-3),
        (0.004, 1.0, 0.0, 0.0, 2.0e-6),
    ]
    rows = []
    for bore, length, rough, k, q in cases:
        v = q / (math.pi * bore * bore / 4.0)
        re = rho * v * bore / mu
        if 2040.0 <= re <= 4000.0:
            raise SystemExit(f"duct case in the transition band, Re = {re}")
        dp = fluids.one_phase_dP(
            q * rho, rho, mu, bore, roughness=rough, L=length, Method="Colebrook"
        )
        dp += fluids.dP_from_K(k, rho, v)
        rows.append((bore, length, rough, k, q, rho, mu, re, dp))
    write(
        "duct.csv",
        "straight duct + minor losses, water 20 C (iapws.IAPWS95), "
        "fluids.one_phase_dP(Method='Colebrook') + fluids.dP_from_K; "
        + versions(fluids, iapws),
        [
            "bore_m",
            "length_m",
            "roughness_m",
            "minor_k",
            "flow_m3_s",
            "density_kg_m3",
            "viscosity_pa_s",
            "re",
            "loss_pa",
        ],
        rows,
    )


def schiller_naumann(re):
    # fluids 1.3.1 has no Schiller-Naumann function; this is the published
    # formula itself, Schiller & Naumann (1933): C_D = 24/Re (1 + 0.15 Re^0.687).
    return 24.0 / re * (1.0 + 0.15 * re**0.687)


def sphere_drag():
    rows = []
    # Schiller-Naumann is meant for Re <= 1000; stop there.
    for re in [1.0, 10.0, 100.0, 200.0, 500.0, 1000.0]:
        rows.append((re, Morsi_Alexander(re), schiller_naumann(re)))
    write(
        "sphere_drag.csv",
        "rigid-sphere drag, fluids.drag.Morsi_Alexander; Schiller-Naumann (1933) "
        "evaluated from its formula (not in fluids); " + versions(fluids),
        ["re", "morsi_alexander_cd", "schiller_naumann_cd"],
        rows,
    )


if __name__ == "__main__":
    water()
    air()
    colebrook()
    duct()
    sphere_drag()
