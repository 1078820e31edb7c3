#!/usr/bin/env python3
"""Synthesise voltage-clamp interchange CSVs of passive cells that Tauwatch has never seen.

Each cell is Ra in series with Rm || Cm and a leak reversal E_L, clamped at a holding potential
with a train of test pulses, recorded through the amplifier's analog 4-pole Bessel low-pass
(scipy.signal.bessel(4, 2*pi*fc, analog=True, norm='mag')).

Exactness: the cell's admittance Y(s) = (1 + s*Rm*Cm) / (Ra + Rm + s*Ra*Rm*Cm) cascaded with the
Bessel H(s) is one linear system driven by a piecewise-constant command that changes only on
sample ticks, so its zero-order-hold discretisation (matrix exponential) gives the output at the
sample instants exactly. Row k holds the command first shown at t_k and the current sampled at t_k,
just before that command acts (the interchange timing contract). A fine-grid lsim of the same
system is used as a cross-check.

Noise: white Gaussian noise shaped by the same filter (discretised), scaled to the stated rms.

Output (beside this script's target folder): <cell>_<variant>.csv with header t_s,cmd_mV,im_pA and
<cell>_<variant>.truth.json with the truth and the generator version.
Usage: python3 make_unseen.py OUTDIR
"""
import json
import sys
from pathlib import Path

import numpy as np
import scipy
from scipy import signal

GENERATOR_VERSION = "make_unseen 1"
FS_HZ = 50_000.0
FC_HZ = 10_000.0
HOLD_MV = -70.0
STEP_MV = -5.0
E_L_MV = -60.0
PRE_MS, STEP_MS, POST_MS = 5.0, 10.0, 10.0  # one pulse period is PRE + STEP + POST

# (name, Ra MΩ, Rm MΩ, Cm pF): passive cells within common-practice ranges (CHECKS.md).
CELLS = [
    ("cellA", 8.0, 400.0, 25.0),
    ("cellB", 15.0, 1200.0, 50.0),
    ("cellC", 22.0, 180.0, 35.0),
]
VARIANTS = [("clean", 0.0, 3), ("noisy", 2.5, 12)]  # (name, noise pA rms, pulses)


# Units for conditioning: time in ms, voltage in mV, current in pA, so MΩ·pF = 1e-3 ms and
# mV/MΩ = 1000 pA.
DT_MS = 1e3 / FS_HZ


def cell_system(ra, rm, cm):
    """Admittance I/V of the cell in pA/mV, s in 1/ms, as a transfer function."""
    rmcm = rm * cm * 1e-3
    return [1e3 * rmcm, 1e3], [ra * rmcm, ra + rm]


def bessel_ms():
    return signal.bessel(4, 2 * np.pi * FC_HZ * 1e-3, analog=True, norm="mag")


def recorded_system(ra, rm, cm):
    num_c, den_c = cell_system(ra, rm, cm)
    b, a = bessel_ms()
    return np.polymul(num_c, b), np.polymul(den_c, a)


def command_trace(pulses):
    n_pre = int(round(PRE_MS * 1e-3 * FS_HZ))
    n_step = int(round(STEP_MS * 1e-3 * FS_HZ))
    n_post = int(round(POST_MS * 1e-3 * FS_HZ))
    one = np.concatenate([np.full(n_pre, HOLD_MV), np.full(n_step, HOLD_MV + STEP_MV),
                          np.full(n_post, HOLD_MV)])
    cmd = np.concatenate([one] * pulses + [np.full(n_pre, HOLD_MV)])
    return cmd


def simulate(num, den, cmd_mv):
    """Exact ZOH response at the sample instants; current in pA, starting at steady state."""
    A, B, C, D = signal.tf2ss(num, den)
    Ad, Bd, Cd, Dd, _ = signal.cont2discrete((A, B, C, D), DT_MS, method="zoh")
    u = cmd_mv - E_L_MV  # mV across the cell's leak battery
    x = np.linalg.solve(np.eye(Ad.shape[0]) - Ad, Bd[:, 0] * u[0])
    y = np.empty(len(u))
    u_prev = u[0]
    for k in range(len(u)):
        # Sampled at t_k before u[k] acts: the state holds inputs up to u[k-1].
        y[k] = Cd[0] @ x + Dd[0, 0] * u_prev
        x = Ad @ x + Bd[:, 0] * u[k]
        u_prev = u[k]
    return y


def cross_check(num, den, cmd_mv, y_pa):
    """lsim on a grid 50x finer than the samples must agree with the exact ZOH result."""
    sub = 50
    n = min(len(cmd_mv), 1500)
    t_fine = np.arange(n * sub) * (DT_MS / sub)
    u_fine = np.repeat(cmd_mv[:n] - E_L_MV, sub)
    # Start from steady state at the holding input.
    A, B, C, D = signal.tf2ss(num, den)
    x0 = np.linalg.solve(-A, B[:, 0] * u_fine[0])
    _, y_fine, _ = signal.lsim((A, B, C, D), u_fine, t_fine, X0=x0, interp=False)
    # Fine sample at k*sub sees inputs up to just before t_k with interp=False (ZOH), D = 0 here.
    err = np.max(np.abs(y_fine[::sub][:n] - y_pa[:n]))
    assert err < 1e-6 * np.max(np.abs(y_pa[:n])) + 1e-6, f"lsim disagrees by {err} pA"


def filtered_noise(n, rms, rng):
    # Shaping only (the rms is set afterwards), so the digital Bessel design is close enough.
    b, a = signal.bessel(4, FC_HZ, norm="mag", fs=FS_HZ)
    w = rng.standard_normal(n + 2000)
    y = signal.lfilter(b, a, w)[2000:]
    return y * (rms / np.std(y))


def main(out):
    out.mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(20261201)
    for name, ra, rm, cm in CELLS:
        num, den = recorded_system(ra, rm, cm)
        for variant, noise, pulses in VARIANTS:
            cmd = command_trace(pulses)
            im = simulate(num, den, cmd)
            cross_check(num, den, cmd, im)
            if noise > 0:
                im = im + filtered_noise(len(im), noise, rng)
            t = np.arange(len(cmd)) / FS_HZ
            stem = f"{name}_{variant}"
            with open(out / f"{stem}.csv", "w") as f:
                f.write("t_s,cmd_mV,im_pA\n")
                for k in range(len(t)):
                    f.write(f"{t[k]:.6f},{cmd[k]:.3f},{im[k]:.4f}\n")
            truth = {
                "cell": name, "variant": variant,
                "ra_mohm": ra, "rin_mohm": rm, "cm_pf": cm,
                "tau_ms": ra * rm / (ra + rm) * cm * 1e-3,
                "e_leak_mv": E_L_MV, "holding_mv": HOLD_MV, "step_mv": STEP_MV,
                "hold_pa": 1e3 * (HOLD_MV - E_L_MV) / (ra + rm),
                "sample_rate_hz": FS_HZ, "filter": "analog 4-pole Bessel, norm='mag'",
                "filter_cutoff_hz": FC_HZ, "noise_pa_rms": noise, "pulses": pulses,
                "generator": GENERATOR_VERSION, "script": "src/test/python/unseen/make_unseen.py",
                "scipy": scipy.__version__, "numpy": np.__version__,
            }
            with open(out / f"{stem}.truth.json", "w") as f:
                json.dump(truth, f, indent=2)
                f.write("\n")
            print(stem, len(t), "rows")


if __name__ == "__main__":
    main(Path(sys.argv[1] if len(sys.argv) > 1 else "src/test/resources/fixtures/unseen"))
