# Writes test.toml and near.csv: an invented water-table test at Brackwater (Neuman, 1974).
# Independent of aquiledger's code: the Laplace series is summed here with scipy (brentq roots,
# kv) and inverted by this script's own Stehfest (12 terms); 2 mm of noise, seed 3.
import math
import numpy as np
from scipy.optimize import brentq
from scipy.special import kv

T, S, SY, LV, Q = 150.0, 5e-4, 0.12, 200.0, 650.0  # m2/d, -, -, m, m3/d


def sbar(r, p):
    a = SY * p * LV * LV / T
    tot = 0.0
    for n in range(400):
        lo, hi = n * math.pi, n * math.pi + math.pi / 2
        e = brentq(lambda x: x * math.sin(x) - a * math.cos(x), lo + 1e-15 if n == 0 else lo, hi - 1e-15, xtol=1e-15)
        w = 2 * math.sin(e) ** 2 / (e * (e + math.sin(e) * math.cos(e)))
        term = w * kv(0, r * math.sqrt(e * e / LV / LV + S * p / T))
        tot += term
        if n > 2 and term < 1e-13 * tot:
            break
    return tot / (2 * math.pi * T * p)


def stehfest(F, t, N=12):
    tot = 0.0
    for k in range(1, N + 1):
        v = 0.0
        for j in range((k + 1) // 2, min(k, N // 2) + 1):
            v += j ** (N // 2) * math.factorial(2 * j) / (math.factorial(N // 2 - j) * math.factorial(j) * math.factorial(j - 1) * math.factorial(k - j) * math.factorial(2 * j - k))
        v *= (-1) ** (k + N // 2)
        tot += v * F(k * math.log(2) / t)
    return tot * math.log(2) / t


rng = np.random.default_rng(3)
times = np.round(np.logspace(-3.5, 1, 40), 7)
with open("test.toml", "w") as f:
    f.write('# Invented: three days of pumping a shallow gravel aquifer at Brackwater (make_test.py).\n')
    f.write('[test]\ntitle = "Brackwater gravel pit, water-table aquifer"\n')
    f.write('length_unit = "m"\ntime_unit = "d"\nmodel = "neuman"\n\n')
    f.write('[[pumping]]\ntime = 0.0\nrate = 650.0\n')
    f.write('\n[[well]]\nname = "near"\ndistance = 6.0\nseries = { file = "near.csv" }\n')
    f.write('\n[[well]]\nname = "far"\ndistance = 20.0\n')
    f.write('times = [' + ', '.join(repr(float(t)) for t in times) + ']\n')
    f.write('drawdowns = [' + ', '.join('%.4f' % (Q * stehfest(lambda p: sbar(20.0, p), t) + rng.normal(0, 0.002)) for t in times) + ']\n')
with open("near.csv", "w") as f:
    f.write("time,drawdown\n")
    for t in times:
        f.write('%r,%.4f\n' % (float(t), Q * stehfest(lambda p: sbar(6.0, p), t) + rng.normal(0, 0.002)))
