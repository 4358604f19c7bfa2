#!/usr/bin/env python3
"""The signal-referred noise of a state-space model written the way a NumPy user writes it.

Bench row: the engine exports a set-up's model (A, B, C, D, N, the signal column, the readout
rows, the referral factor at each frequency, and each classical noise input's PSD at each frequency, which
replaces that input's placeholder entry of N) as JSON; this script computes the total one-sided
PSD over all frequencies at once with numpy.linalg.solve batched over frequencies:

    M(Ω) = −iΩ I − A,  H = C_r M⁻¹ B + D_r,  h = C_r M⁻¹ b_s + d_s,
    S_y = H N Hᴴ,      S = factor / Re(hᴴ S_y⁻¹ h)   (= factor · S_y / |h|² for one output),

and prints the totals and the median time of repeated runs as JSON on stdout. Usage:
    python3 numpy_budget.py model.json
"""
import json
import sys
import time

import numpy as np


def load(path):
    with open(path, encoding="utf-8") as f:
        d = json.load(f)
    n, m = d["nStates"], d["nInputs"]
    rows = d["readoutRows"]
    A = np.array(d["A"], dtype=float).reshape(n, n)
    B = np.array(d["B"], dtype=float).reshape(n, m)
    C = np.array(d["C"], dtype=float).reshape(-1, n)[rows]
    D = np.array(d["D"], dtype=float).reshape(-1, m)[rows]
    N = np.array(d["N"], dtype=float).reshape(m, m)
    bs = np.array(d["signalB"], dtype=float)
    ds = np.array(d["signalD"], dtype=float)[rows]
    f = np.array(d["frequencies"], dtype=float)
    factor = np.array(d["factors"], dtype=float)
    # N at each frequency: the white inputs' constant entries, each classical input's own spectrum.
    Nf = np.broadcast_to(N, (len(f), m, m)).copy()
    for c in d.get("classical", []):
        Nf[:, c["column"], c["column"]] = np.array(c["psd"], dtype=float)
    return A, B, C, D, Nf, bs, ds, f, factor


def total_psd(A, B, C, D, N, bs, ds, f, factor):
    n = A.shape[0]
    omega = 2 * np.pi * f
    # One (n × n) system per frequency, solved for the inputs' and the signal's columns at once.
    M = -1j * omega[:, None, None] * np.eye(n) - A
    rhs = np.concatenate([B, bs[:, None]], axis=1).astype(complex)
    G = np.linalg.solve(M, np.broadcast_to(rhs, (len(f),) + rhs.shape))
    H = C @ G[:, :, :-1] + D
    h = C @ G[:, :, -1:] + ds[:, None]
    Sy = H @ N @ np.conj(np.swapaxes(H, 1, 2))
    q = np.real(np.conj(np.swapaxes(h, 1, 2)) @ np.linalg.solve(Sy, h))[:, 0, 0]
    return factor / q


def main():
    model = load(sys.argv[1])
    with np.errstate(divide="ignore"):
        total = total_psd(*model)
    times = []
    deadline = time.perf_counter() + 1.0
    while len(times) < 5 or (time.perf_counter() < deadline and len(times) < 2000):
        t0 = time.perf_counter()
        total_psd(*model)
        times.append(time.perf_counter() - t0)
    times.sort()
    # JSON has no infinity: a blind frequency (no signal response) is written as null.
    totals = [float(v) if np.isfinite(v) else None for v in total]
    json.dump({"numpy": np.__version__, "total": totals, "seconds": times[len(times) // 2], "runs": len(times)}, sys.stdout)


if __name__ == "__main__":
    main()
