#!/usr/bin/env python3
"""Writes the step response of SciPy's 4-pole analog low-pass Bessel filter (norm='mag', -3 dB at
fc) sampled at a few rates, as fixtures for tauwatch.sim.BesselFilterAgainstScipyTest.

Run from the repository root:  python3 src/test/python/scipy/bessel_fixture.py
The Java tests read the CSV files only; they never run Python.
"""
import os

import numpy as np
import scipy
from scipy import signal

OUT = os.path.join("src", "test", "resources", "fixtures", "scipy")
# (cutoff Hz, sample rate Hz, samples)
CASES = [(10_000.0, 50_000.0, 100), (2_000.0, 20_000.0, 100), (5_000.0, 100_000.0, 200)]


def main():
    os.makedirs(OUT, exist_ok=True)
    for fc, fs, n in CASES:
        b, a = signal.bessel(4, 2 * np.pi * fc, btype="low", analog=True, norm="mag")
        t = np.arange(n) / fs
        _, y = signal.step((b, a), T=t)
        name = os.path.join(OUT, "bessel4_fc%d_fs%d.csv" % (fc, fs))
        with open(name, "w") as f:
            f.write("# scipy %s, numpy %s\n" % (scipy.__version__, np.__version__))
            f.write("# signal.bessel(4, 2*pi*%g, btype='low', analog=True, norm='mag'); "
                    "signal.step at t = k/%g\n" % (fc, fs))
            f.write("# b = %s\n" % " ".join(repr(float(v)) for v in np.atleast_1d(b)))
            f.write("# a = %s\n" % " ".join(repr(float(v)) for v in a))
            f.write("t_s,step\n")
            for ti, yi in zip(t, y):
                f.write("%r,%r\n" % (float(ti), float(yi)))
        print("wrote", name)


if __name__ == "__main__":
    main()
