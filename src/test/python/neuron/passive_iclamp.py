#!/usr/bin/python3
"""A passive single soma under NEURON's IClamp, with the electrode's I·Ra drop added, written as
Tauwatch current-clamp interchange CSVs (t_s,cmd_pA,vm_mV).

Run with Debian's python (python3-neuron, python3-scipy):  /usr/bin/python3 passive_iclamp.py OUTDIR

Cell: one isopotential cylinder (nseg = 1) with the pas mechanism, cm = 1 µF/cm² (Hille 2001;
Gentet, Stuart & Clements 2000 — from memory), a current step train played into IClamp.amp.
Recorded voltage = v(0.5) + I·Ra (the bridge error of an unbalanced bridge: the pipette's drop).
Truth: Rin = 1/(g_pas·area), Cm = cm·area, tau = Rin·Cm, Ra = the electrode's series resistance.

Protocol: holding current 0, steps of -50 pA for 80 ms every 200 ms, at 20 kHz.
Integration: backward Euler at dt = 2.5 µs (20 steps per sample).

Timing contract (as passive_seclamp.py): a command change on row k acts at t_k and row k's voltage
is sampled just before it acts. Each change is played a quarter step before t_k.

Variants: soma25_cc_clean (unfiltered, noise-free) and soma25_cc_filtered_noisy: the recorded
voltage through SciPy's analog 4-pole Bessel at 5 kHz (lsim on the dt grid) plus 0.2 mV rms
filter-shaped Gaussian noise (fixed seed). Each CSV has a <stem>.json sidecar with NEURON's version.
"""
import json
import sys
from pathlib import Path

import numpy as np
import scipy
from neuron import h
from scipy import signal

h.load_file("stdrun.hoc")

FS_HZ = 20_000.0
SAMPLE_MS = 1e3 / FS_HZ
DT_MS = 0.0025
SUB = int(round(SAMPLE_MS / DT_MS))
STEP_PA = -50.0
FIRST_MS, STEP_MS, PERIOD_MS = 40.0, 80.0, 200.0
FC_HZ = 5_000.0
NOISE_MV = 0.2
DIAM_UM, G_PAS, E_PAS, RA_MOHM = 25.0, 8e-5, -68.0, 12.0


def main(out):
    out.mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(2_2_8)
    soma = h.Section(name="soma")
    soma.L = soma.diam = DIAM_UM
    soma.nseg = 1
    soma.insert("pas")
    soma.cm = 1.0
    soma.g_pas = G_PAS
    soma.e_pas = E_PAS
    stim = h.IClamp(soma(0.5))
    stim.delay = 0
    stim.dur = 1e9
    area_cm2 = soma(0.5).area() * 1e-8
    rin = 1.0 / (G_PAS * area_cm2) * 1e-6
    cm_pf = soma.cm * area_cm2 * 1e6
    truth = {"ra_mohm": RA_MOHM, "rin_mohm": rin, "cm_pf": cm_pf, "tau_ms": rin * cm_pf * 1e-3,
             "vrest_mv": E_PAS}

    for stem, pulses, filtered in [("soma25_cc_clean", 3, False),
                                   ("soma25_cc_filtered_noisy", 10, True)]:
        end_ms = FIRST_MS + pulses * PERIOD_MS
        tv, av = [0.0], [0.0]
        for p in range(pulses):
            on = FIRST_MS + p * PERIOD_MS
            tv += [on - DT_MS / 4, on + STEP_MS - DT_MS / 4]
            av += [STEP_PA * 1e-3, 0.0]
        tvec, avec = h.Vector(tv), h.Vector(av)
        avec.play(stim._ref_amp, tvec, 0)
        rec_v = h.Vector().record(soma(0.5)._ref_v)
        rec_i = h.Vector().record(stim._ref_i)
        h.dt = DT_MS
        h.finitialize(E_PAS)
        h.continuerun(end_ms)
        avec.play_remove()
        v = np.array(rec_v)
        i_na = np.array(rec_i)
        # The electrode adds I·Ra (nA·MΩ = mV) to what the amplifier sees.
        vrec = v + i_na * RA_MOHM
        k = int(round(FIRST_MS / DT_MS))
        assert abs(i_na[k]) < 1e-12 and abs(i_na[k + 1] - STEP_PA * 1e-3) < 1e-12, \
            "the step does not act right after t_on"
        n_rows = int(round(end_ms / SAMPLE_MS))
        rows = np.arange(n_rows) * SUB
        cmd = np.zeros(n_rows)
        for p in range(pulses):
            on = int(round((FIRST_MS + p * PERIOD_MS) / SAMPLE_MS))
            off = int(round((FIRST_MS + p * PERIOD_MS + STEP_MS) / SAMPLE_MS))
            cmd[on:off] = STEP_PA
        meta = {"neuron": h.nrnversion(), "neuron_version": __import__("neuron").__version__,
                "script": "src/test/python/neuron/passive_iclamp.py", "scipy": scipy.__version__,
                "dt_ms": DT_MS, "integration": "backward Euler", "sample_rate_hz": FS_HZ,
                "step_pa": STEP_PA, "L_um": DIAM_UM, "diam_um": DIAM_UM, "g_pas_s_per_cm2": G_PAS,
                "e_pas_mv": E_PAS, "cm_uf_per_cm2": soma.cm, "area_um2": soma(0.5).area(),
                "bridge": "unbalanced: recorded = v + I*Ra", "filter_cutoff_hz": 0.0,
                "noise_mv_rms": 0.0, **truth}
        if filtered:
            b, a = signal.bessel(4, 2 * np.pi * FC_HZ * 1e-3, analog=True, norm="mag")
            t = np.arange(len(vrec)) * DT_MS
            _, y, _ = signal.lsim((b, a), vrec - vrec[0], t)
            vrec = y + vrec[0]
            bd, ad = signal.bessel(4, FC_HZ, norm="mag", fs=FS_HZ)
            nz = signal.lfilter(bd, ad, rng.standard_normal(n_rows + 2000))[2000:]
            noise = nz * (NOISE_MV / np.std(nz))
            meta = dict(meta, filter_cutoff_hz=FC_HZ, noise_mv_rms=NOISE_MV,
                        filter="analog 4-pole Bessel, norm='mag', lsim on the dt grid")
        else:
            noise = np.zeros(n_rows)
        vm = vrec[rows] + noise
        with open(out / f"{stem}.csv", "w") as f:
            f.write("t_s,cmd_pA,vm_mV\n")
            for r in range(n_rows):
                f.write(f"{r * SAMPLE_MS * 1e-3:.6f},{cmd[r]:.3f},{vm[r]:.5f}\n")
        with open(out / f"{stem}.json", "w") as f:
            json.dump(meta, f, indent=2)
            f.write("\n")
        print(stem, n_rows, "rows", truth)


if __name__ == "__main__":
    main(Path(sys.argv[1] if len(sys.argv) > 1 else "src/test/resources/fixtures/neuron"))
