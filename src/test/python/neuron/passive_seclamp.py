#!/usr/bin/python3
"""A passive single soma under NEURON's SEClamp, written as Tauwatch voltage-clamp interchange CSVs.

Run with Debian's python (python3-neuron, python3-scipy):  /usr/bin/python3 passive_seclamp.py OUTDIR

Cell: one isopotential cylinder (nseg = 1) with the pas mechanism, cm = 1 µF/cm² (specific membrane
capacitance, Hille 2001; Gentet, Stuart & Clements 2000 — from memory), under SEClamp with series
resistance rs. Truth: Ra = rs, Rin = 1/(g_pas·area), Cm = cm·area.

Protocol: holding −70 mV, test pulses of −5 mV for 10 ms every 25 ms, played into SEClamp.amp1.
Integration: NEURON's default backward Euler at dt = 0.5 µs (40 steps per 20 µs sample); its
first-order error lengthens tau by ≈ dt/2 = 0.25 µs (< 0.1 % here).

Timing contract: a command change on row k acts at t_k, and row k's current is sampled at t_k just
before it acts. Each change is played a quarter step before t_k; NEURON delivers a played value at
the nearest step boundary, so it applies to the step (t_k, t_k + dt] and the value recorded at t_k is
still the pre-change current. The script asserts where the current jumps.

Sign: SEClamp.i (nA) is positive when it depolarises the cell, i.e. current flowing from the pipette
into the cell, which an amplifier records as positive (outward membrane current). The script checks
that a depolarising step gives a positive capacitive transient, then writes pA = 1000·i.

Variants: <cell>_clean (unfiltered, noise-free) for each cell, and soma30_filtered_noisy: the same
current through SciPy's analog 4-pole Bessel at 10 kHz (scipy.signal.bessel(4, 2π·fc, analog=True,
norm='mag'), lsim on the 0.5 µs grid) plus 2.5 pA rms filter-shaped Gaussian noise (fixed seed).
Each CSV has a <stem>.json sidecar with NEURON's version, the truth, dt and this script's name.
"""
import json
import sys
from pathlib import Path

import numpy as np
import scipy
from neuron import h
from scipy import signal

h.load_file("stdrun.hoc")

FS_HZ = 50_000.0
SAMPLE_MS = 1e3 / FS_HZ
DT_MS = 0.0005
SUB = int(round(SAMPLE_MS / DT_MS))
HOLD_MV, STEP_MV = -70.0, -5.0
FIRST_MS, STEP_MS, PERIOD_MS = 10.0, 10.0, 25.0
FC_HZ = 10_000.0
NOISE_PA = 2.5

# (name, L = diam µm, g_pas S/cm², e_pas mV, rs MΩ)
CELLS = [
    ("soma30", 30.0, 5e-5, -65.0, 10.0),
    ("soma20", 20.0, 1e-4, -60.0, 20.0),
    ("soma60", 60.0, 1e-4, -68.0, 6.0),
]


def build(diam, g_pas, e_pas, rs):
    soma = h.Section(name="soma")
    soma.L = soma.diam = diam
    soma.nseg = 1
    soma.insert("pas")
    soma.cm = 1.0
    soma.g_pas = g_pas
    soma.e_pas = e_pas
    clamp = h.SEClamp(soma(0.5))
    clamp.rs = rs
    clamp.dur1 = 1e9
    clamp.amp1 = HOLD_MV
    return soma, clamp


def run(clamp, pulses, step_mv, end_ms):
    """Plays the pulse train, returns (row times ms, command mV, current nA) at the sample rate."""
    tv, av = [0.0], [HOLD_MV]
    for p in range(pulses):
        on = FIRST_MS + p * PERIOD_MS
        tv += [on - DT_MS / 4, on + STEP_MS - DT_MS / 4]
        av += [HOLD_MV + step_mv, HOLD_MV]
    tvec, avec = h.Vector(tv), h.Vector(av)
    avec.play(clamp._ref_amp1, tvec, 0)
    rec_i = h.Vector().record(clamp._ref_i)
    h.dt = DT_MS
    h.finitialize(HOLD_MV)
    h.continuerun(end_ms)
    i_fine = np.array(rec_i)
    n_rows = int(round(end_ms / SAMPLE_MS))
    t_rows = np.arange(n_rows) * SAMPLE_MS
    cmd = np.full(n_rows, HOLD_MV)
    for p in range(pulses):
        on = int(round((FIRST_MS + p * PERIOD_MS) / SAMPLE_MS))
        off = int(round((FIRST_MS + p * PERIOD_MS + STEP_MS) / SAMPLE_MS))
        cmd[on:off] = HOLD_MV + step_mv
    avec.play_remove()
    for p in range(pulses):
        k = int(round((FIRST_MS + p * PERIOD_MS) / DT_MS))
        before = abs(i_fine[k] - i_fine[k - 1])
        after = abs(i_fine[k + 1] - i_fine[k])
        assert after > 1000 * before, f"the step does not act right after t = {k * DT_MS} ms"
    return t_rows, cmd, i_fine


def bessel_filter_fine(i_fine):
    b, a = signal.bessel(4, 2 * np.pi * FC_HZ * 1e-3, analog=True, norm="mag")  # rad/ms
    t = np.arange(len(i_fine)) * DT_MS
    x = i_fine - i_fine[0]  # start from rest at the holding current
    _, y, _ = signal.lsim((b, a), x, t)
    return y + i_fine[0]


def filtered_noise(n, rng):
    b, a = signal.bessel(4, FC_HZ, norm="mag", fs=FS_HZ)
    y = signal.lfilter(b, a, rng.standard_normal(n + 2000))[2000:]
    return y * (NOISE_PA / np.std(y))


def write(out, stem, t_rows, cmd, im_pa, meta):
    with open(out / f"{stem}.csv", "w") as f:
        f.write("t_s,cmd_mV,im_pA\n")
        for k in range(len(t_rows)):
            f.write(f"{t_rows[k] * 1e-3:.6f},{cmd[k]:.3f},{im_pa[k]:.4f}\n")
    with open(out / f"{stem}.json", "w") as f:
        json.dump(meta, f, indent=2)
        f.write("\n")
    print(stem, len(t_rows), "rows")


def main(out):
    out.mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(8_2_2)
    for name, diam, g_pas, e_pas, rs in CELLS:
        soma, clamp = build(diam, g_pas, e_pas, rs)
        area_cm2 = soma(0.5).area() * 1e-8
        truth = {
            "ra_mohm": rs,
            "rin_mohm": 1.0 / (g_pas * area_cm2) * 1e-6,
            "cm_pf": soma.cm * area_cm2 * 1e6,
        }
        truth["tau_ms"] = (truth["ra_mohm"] * truth["rin_mohm"] / (truth["ra_mohm"] + truth["rin_mohm"])
                           * truth["cm_pf"] * 1e-3)

        # Sign check: a depolarising step must give a positive (outward-recorded) transient.
        _, _, i_dep = run(clamp, 1, +5.0, FIRST_MS + PERIOD_MS)
        k_on = int(round(FIRST_MS / DT_MS))
        assert i_dep[k_on + 1] - i_dep[k_on - 1] > 0, "SEClamp.i sign is not outward-positive"

        pulses = 3
        t_rows, cmd, i_fine = run(clamp, pulses, STEP_MV, FIRST_MS + pulses * PERIOD_MS)
        rows = np.arange(len(t_rows)) * SUB
        meta = {
            "neuron": h.nrnversion(), "neuron_version": __import__("neuron").__version__,
            "script": "src/test/python/neuron/passive_seclamp.py",
            "scipy": scipy.__version__, "dt_ms": DT_MS, "integration": "backward Euler",
            "sample_rate_hz": FS_HZ, "holding_mv": HOLD_MV, "step_mv": STEP_MV,
            "L_um": diam, "diam_um": diam, "g_pas_s_per_cm2": g_pas, "e_pas_mv": e_pas,
            "cm_uf_per_cm2": soma.cm, "rs_mohm": rs, "area_um2": soma(0.5).area(),
            "filter_cutoff_hz": 0.0, "noise_pa_rms": 0.0, **truth,
        }
        write(out, f"{name}_clean", t_rows, cmd, 1e3 * i_fine[rows], meta)

        if name == "soma30":
            pulses = 12
            t_rows, cmd, i_fine = run(clamp, pulses, STEP_MV, FIRST_MS + pulses * PERIOD_MS)
            rows = np.arange(len(t_rows)) * SUB
            im = 1e3 * bessel_filter_fine(i_fine)[rows] + filtered_noise(len(rows), rng)
            meta = dict(meta, filter_cutoff_hz=FC_HZ, noise_pa_rms=NOISE_PA,
                        filter="analog 4-pole Bessel, norm='mag', lsim on the dt grid")
            write(out, f"{name}_filtered_noisy", t_rows, cmd, im, meta)
        clamp = None
        soma = None


if __name__ == "__main__":
    main(Path(sys.argv[1] if len(sys.argv) > 1 else "src/test/resources/fixtures/neuron"))
