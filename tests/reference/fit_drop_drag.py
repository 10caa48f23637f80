#!/usr/bin/env python3
"""How the drop deformation factor in src/physics/trajectory.rs was fitted.

Terminal speeds of water drops in still air, Gunn & Kinzer (1949), about 20 C and
1013 hPa (diameter mm -> m/s), as listed in the project's references.md. The
drag law is Clift & Gauvin (1971) sphere drag times F(d) = c + (d / d0)^b; c, d0
and b are fitted by least squares on the relative terminal-speed error. The
crate uses the rounded values c = 0.94, d0 = 5.74 mm, b = 2.1; this script
prints the fit and the error of the rounded law at every tabulated size.

Run:  python3 tests/reference/fit_drop_drag.py   (needs numpy and scipy)
"""
import numpy as np
from scipy.optimize import brentq, minimize

GK = [(0.5, 2.06), (0.6, 2.47), (0.8, 3.27), (1.0, 4.03), (1.4, 5.17), (1.8, 6.09),
      (2.0, 6.49), (2.4, 7.27), (2.8, 7.82), (3.0, 8.06), (3.4, 8.44), (3.8, 8.72),
      (4.0, 8.83), (4.4, 8.98), (4.8, 9.07), (5.0, 9.09), (5.4, 9.14), (5.8, 9.17)]
T = 293.15
RHO_A = 101300.0 / (287.05 * T)                                   # ideal gas
MU = 1.716e-5 * (T / 273.15) ** 1.5 * (273.15 + 110.4) / (T + 110.4)  # Sutherland
t = 20.0
RHO_W = (999.84847 + 6.337563e-2 * t - 8.523829e-3 * t**2 + 6.943248e-5 * t**3
         - 3.821216e-7 * t**4)                                     # Jones & Harris 1992
G = 9.80665


def clift_gauvin(re):
    return 24 / re * (1 + 0.15 * re**0.687) + 0.42 / (1 + 42500 * re**-1.16)


def terminal(d_m, factor):
    f = lambda v: 3 * RHO_A * clift_gauvin(RHO_A * v * d_m / MU) * factor / (4 * RHO_W * d_m) * v * v - G
    return brentq(f, 1e-6, 100, xtol=1e-12)


def errors(c, d0, b):
    return np.array([terminal(d / 1000, c + (d / d0) ** b) / v - 1 for d, v in GK])


fit = minimize(lambda p: np.sum(errors(*p) ** 2), [0.95, 5.7, 2.1], method="Nelder-Mead",
               options={"xatol": 1e-8, "fatol": 1e-14, "maxiter": 5000})
print("least-squares fit c, d0 (mm), b:", fit.x)
e = errors(0.94, 5.74, 2.1)
for (d, v), err in zip(GK, e):
    print(f"{d:4.1f} mm  measured {v:5.2f} m/s  model {v * (1 + err):5.2f} m/s  {100 * err:+5.2f} %")
print(f"largest error of the rounded law: {100 * np.max(np.abs(e)):.2f} %")
