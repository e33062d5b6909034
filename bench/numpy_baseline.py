#!/usr/bin/env python3
"""NumPy baseline for bench/core.ts: the sampled path, vectorised carefully.

Reads a JSON list of compiled cases on stdin (geometry in body axes, stroke as a series or a
triangle, constant body motion, n points per beat, K harmonics), and for each one times the same
work as beatforce's sampled path: stroke and its exact derivatives, kinematics, the seven load
components in body axes and the organ frame, and lines of orders 0..K by a real FFT
(numpy.fft.rfft, NumPy's fastest route to them). Prints a JSON list
[{ name, sampled (CPU s per evaluation, median of batches), sampledWall, pq (the lines, for an agreement check) }].

NumPy has no Bessel functions, so the closed-form path has no NumPy counterpart; the bench compares
it against this sampled route, which is NumPy's best way to the same lines.
"""
import json
import sys
import time

import numpy as np


def stroke(w, u, omega):
    """s, ds/dt, d2s/dt2 on the phase grid u (exact derivatives)."""
    if w is None:
        z = np.zeros_like(u)
        return z, z, z
    if w["kind"] == "triangle":
        k = np.cos(np.pi * w["rounding"] / 2)
        ak = np.arcsin(k)
        sn = np.sin(u)
        q = 1 - k * k * sn * sn
        sq = np.sqrt(q)
        amp = w["amplitude"]
        return (w["mean"] + amp * np.arcsin(k * sn) / ak,
                amp * omega * k * np.cos(u) / (ak * sq),
                -amp * omega * omega * k * (1 - k * k) * sn / (ak * q * sq))
    a = np.asarray(w["cos"])
    b = np.asarray(w["sin"])
    kk = np.arange(1, a.size + 1)
    ku = np.outer(kk, u)
    c, s = np.cos(ku), np.sin(ku)
    kw = kk * omega
    return (w["mean"] + a @ c + b @ s,
            (kw * b) @ c - (kw * a) @ s,
            -((kw * kw * a) @ c + (kw * kw * b) @ s))


def lines(case):
    n, K = case["n"], case["K"]
    omega = 2 * np.pi * case["frequency"]
    u = 2 * np.pi * np.arange(n) / n
    e1, e2, e3 = (np.asarray(case[k])[:, None] for k in ("e1", "e2", "e3"))
    M, mu = case["mass"], case["moment"]
    h = M * np.asarray(case["hinge"])[:, None]
    s, sd, sdd = stroke(case["stroke"], u, omega)
    if case["drive"] == "linear":
        R = h + mu * s * e1
        V = mu * sd * e1
        A = mu * sdd * e1
        E = np.broadcast_to(np.stack([e1, e2, e3]), (3, 3, n))
    else:
        th, thd, thdd = stroke(case["deviation"], u, omega)
        C, S = np.cos(s), np.sin(s)
        q = C * e1 + S * e2
        p = C * e2 - S * e1
        ct, st = np.cos(th), np.sin(th)
        er = ct * q + st * e3
        en = ct * e3 - st * q
        R = h + mu * er
        V = mu * ((-thd * st) * q + (ct * sd) * p + (thd * ct) * e3)
        A = mu * ((-thdd * st - thd * thd * ct - ct * sd * sd) * q + (ct * sdd - 2 * thd * sd * st) * p + (thdd * ct - thd * thd * st) * e3)
        E = np.stack([er, p, en])
    W = np.asarray(case["omega"])[:, None]
    Wd = np.asarray(case["omegaDot"])[:, None]
    loads = np.empty((7, 3, n))
    loads[0] = -A
    loads[1] = R * (W * W).sum() - W * (W * R).sum(axis=0)
    loads[2] = -np.cross(Wd, R, axis=0)
    loads[3] = -2 * np.cross(W, V, axis=0)
    loads[4] = (-M * np.asarray(case["accel"]))[:, None]
    loads[5] = (M * np.asarray(case["gravity"]))[:, None]
    loads[6] = loads[:6].sum(axis=0)
    organ = np.einsum("cin,fin->cfn", loads, E)
    allx = np.concatenate([loads, organ], axis=1)  # (7, 6, n)
    F = np.fft.rfft(allx, axis=-1)[..., : K + 1]
    p = 2 * F.real / n
    q = -2 * F.imag / n
    p[..., 0] /= 2
    q[..., 0] = 0
    return np.stack([p, q], axis=-1)  # (7, 6, K+1, 2)


def median_time(fn, warmup=0.3, batch=0.03, batches=15):
    """Median (CPU, wall) seconds per call over timed batches after a warm-up (as bench/run.ts)."""
    t0 = time.perf_counter()
    calls = 0
    while time.perf_counter() - t0 < warmup or calls < 5:
        fn()
        calls += 1
    per = (time.perf_counter() - t0) / calls
    it = max(1, round(batch / per))
    cpu, wall = [], []
    for _ in range(batches):
        c, w = time.process_time(), time.perf_counter()
        for _ in range(it):
            fn()
        cpu.append((time.process_time() - c) / it)
        wall.append((time.perf_counter() - w) / it)
    cpu.sort()
    wall.sort()
    return cpu[len(cpu) // 2], wall[len(wall) // 2]


def main():
    cases = json.load(sys.stdin)
    out = []
    for case in cases:
        pq = lines(case)
        cpu, wall = median_time(lambda: lines(case))
        out.append({"name": case["name"], "sampled": cpu, "sampledWall": wall, "pq": pq.ravel().tolist()})
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
