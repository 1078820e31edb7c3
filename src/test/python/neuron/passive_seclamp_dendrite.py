#!/usr/bin/python3
"""A passive soma with one passive dendrite cable under NEURON's SEClamp, written as Tauwatch
voltage-clamp interchange CSVs (t_s,cmd_mV,im_pA).

Run with Debian's python (python3-neuron, python3-scipy):
    /usr/bin/python3 passive_seclamp_dendrite.py OUTDIR

Cell: soma L = diam = 30 µm (nseg 1) and a dendrite cable L = 700 µm, diam = 2 µm, nseg = 141
(odd, ~5 µm segments, far below λ), both with pas g = 5e-5 S/cm², e = -65 mV, cm = 1 µF/cm²
(Hille 2001 — from memory) and axial resistivity Ra = 150 Ω·cm (common practice, 70–200).
λ = sqrt(Rm·d/(4·Ri)) (Rall's cable theory) is computed and stored. SEClamp with series resistance
rs; holding -70 mV, steps of -5 mV for 30 ms every 70 ms, 50 kHz; backward Euler, dt = 0.5 µs.

Truth: Ra = rs; Rt = ΔV/ΔI_ss from NEURON's own steady state, Rin = Rt − rs. The capacitance the
clamp charges: the steady-state stored charge Σ C_seg·ΔV_seg over the soma's ΔV (both from NEURON's
segment voltages at the end of a step against the holding state) — less than the whole membrane's
area × cm, which is stored too ("cm_total_pf").

Variants: dend_clean (unfiltered, noise-free) and dend_filtered_noisy (SciPy analog 4-pole Bessel at
10 kHz, lsim on the dt grid, plus 2 pA rms filter-shaped noise, fixed seed).
"""
import json
import math
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
FIRST_MS, STEP_MS, PERIOD_MS = 10.0, 30.0, 70.0
FC_HZ = 10_000.0
NOISE_PA = 2.0
G_PAS, E_PAS, RI, RS = 5e-5, -65.0, 150.0, 10.0
SOMA_UM = 30.0
DEND_L, DEND_D, NSEG = 700.0, 2.0, 141


def main(out):
    out.mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(6_1)
    soma = h.Section(name="soma")
    soma.L = soma.diam = SOMA_UM
    soma.nseg = 1
    dend = h.Section(name="dend")
    dend.L, dend.diam, dend.nseg = DEND_L, DEND_D, NSEG
    dend.connect(soma(1))
    for sec in (soma, dend):
        sec.insert("pas")
        sec.cm = 1.0
        sec.g_pas = G_PAS
        sec.e_pas = E_PAS
        sec.Ra = RI
    clamp = h.SEClamp(soma(0.5))
    clamp.rs = RS
    clamp.dur1 = 1e9
    clamp.amp1 = HOLD_MV
    segs = [soma(0.5)] + [seg for seg in dend]
    caps_pf = [seg.area() * 1e-8 * 1.0 * 1e6 for seg in segs]  # µm² → cm², µF/cm² → pF

    lam_um = math.sqrt((1 / G_PAS) * DEND_D * 1e-4 / (4 * RI)) * 1e4

    for stem, pulses, filtered in [("dend_clean", 3, False), ("dend_filtered_noisy", 10, True)]:
        end_ms = FIRST_MS + pulses * PERIOD_MS
        tv, av = [0.0], [HOLD_MV]
        for p in range(pulses):
            on = FIRST_MS + p * PERIOD_MS
            tv += [on - DT_MS / 4, on + STEP_MS - DT_MS / 4]
            av += [HOLD_MV + STEP_MV, HOLD_MV]
        tvec, avec = h.Vector(tv), h.Vector(av)
        avec.play(clamp._ref_amp1, tvec, 0)
        rec_i = h.Vector().record(clamp._ref_i)
        h.dt = DT_MS
        h.finitialize(HOLD_MV)
        # Settle at holding first (the dendrite starts at the holding potential, not its rest).
        h.continuerun(FIRST_MS - 0.01)
        v_hold = [seg.v for seg in segs]
        i_hold = clamp.i
        h.continuerun(FIRST_MS + STEP_MS - 0.01)
        v_step = [seg.v for seg in segs]
        i_step = clamp.i
        h.continuerun(end_ms)
        avec.play_remove()
        i_fine = np.array(rec_i)
        dv_soma = v_step[0] - v_hold[0]
        stored = sum(c * (b - a) for c, a, b in zip(caps_pf, v_hold, v_step))
        rt = STEP_MV / ((i_step - i_hold) * 1e3) * 1e3  # mV / pA → GΩ → MΩ
        truth = {"ra_mohm": RS, "rt_mohm": rt, "rin_mohm": rt - RS,
                 "cm_charged_pf": stored / dv_soma, "cm_total_pf": sum(caps_pf),
                 "cm_soma_pf": caps_pf[0]}
        n_rows = int(round(end_ms / SAMPLE_MS))
        rows = np.arange(n_rows) * SUB
        cmd = np.full(n_rows, HOLD_MV)
        for p in range(pulses):
            on = int(round((FIRST_MS + p * PERIOD_MS) / SAMPLE_MS))
            off = int(round((FIRST_MS + p * PERIOD_MS + STEP_MS) / SAMPLE_MS))
            cmd[on:off] = HOLD_MV + STEP_MV
        im = 1e3 * i_fine
        meta = {"neuron": h.nrnversion(), "neuron_version": __import__("neuron").__version__,
                "script": "src/test/python/neuron/passive_seclamp_dendrite.py",
                "scipy": scipy.__version__, "dt_ms": DT_MS, "integration": "backward Euler",
                "sample_rate_hz": FS_HZ, "holding_mv": HOLD_MV, "step_mv": STEP_MV,
                "soma_L_um": SOMA_UM, "soma_diam_um": SOMA_UM, "dend_L_um": DEND_L,
                "dend_diam_um": DEND_D, "dend_nseg": NSEG, "Ri_ohm_cm": RI,
                "g_pas_s_per_cm2": G_PAS, "e_pas_mv": E_PAS, "cm_uf_per_cm2": 1.0,
                "lambda_um": lam_um, "electrotonic_length": DEND_L / lam_um, "rs_mohm": RS,
                "filter_cutoff_hz": 0.0, "noise_pa_rms": 0.0, **truth}
        if filtered:
            b, a = signal.bessel(4, 2 * np.pi * FC_HZ * 1e-3, analog=True, norm="mag")
            t = np.arange(len(im)) * DT_MS
            _, y, _ = signal.lsim((b, a), im - im[0], t)
            im = y + im[0]
            bd, ad = signal.bessel(4, FC_HZ, norm="mag", fs=FS_HZ)
            nz = signal.lfilter(bd, ad, rng.standard_normal(n_rows + 2000))[2000:]
            noise = nz * (NOISE_PA / np.std(nz))
            meta = dict(meta, filter_cutoff_hz=FC_HZ, noise_pa_rms=NOISE_PA,
                        filter="analog 4-pole Bessel, norm='mag', lsim on the dt grid")
        else:
            noise = np.zeros(n_rows)
        out_i = im[rows] + noise
        with open(out / f"{stem}.csv", "w") as f:
            f.write("t_s,cmd_mV,im_pA\n")
            for r in range(n_rows):
                f.write(f"{r * SAMPLE_MS * 1e-3:.6f},{cmd[r]:.3f},{out_i[r]:.4f}\n")
        with open(out / f"{stem}.json", "w") as f:
            json.dump(meta, f, indent=2)
            f.write("\n")
        print(stem, n_rows, "rows", truth, "lambda", lam_um)


if __name__ == "__main__":
    main(Path(sys.argv[1] if len(sys.argv) > 1 else "src/test/resources/fixtures/neuron"))
