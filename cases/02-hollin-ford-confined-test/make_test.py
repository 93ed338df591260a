# Writes test.toml: an invented confined test at Hollin Ford (Theis, 1935, drawdowns from
# scipy.special.exp1 plus 4 mm of Gaussian noise, seed 2), run with /usr/bin/python3.
import numpy as np
from scipy.special import exp1

T, S, Q, stop = 480.0, 1.5e-4, 1800.0, 1.0  # m2/d, -, m3/d, d
rng = np.random.default_rng(2)
times = np.round(np.concatenate([np.logspace(-3.5, 0, 22), stop + np.logspace(-3.5, 0, 14)]), 7)


def s(r, t):
    v = Q / (4 * np.pi * T) * exp1(r * r * S / (4 * T * t))
    if t > stop:
        v -= Q / (4 * np.pi * T) * exp1(r * r * S / (4 * T * (t - stop)))
    return v


with open("test.toml", "w") as f:
    f.write('# Invented: a day of pumping and a day of recovery at Hollin Ford (make_test.py).\n')
    f.write('[test]\ntitle = "Hollin Ford production bore, confined sandstone"\n')
    f.write('length_unit = "m"\ntime_unit = "d"\nmodel = "auto"\n\n')
    f.write('[[pumping]]\ntime = 0.0\nrate = 1800.0\n\n[[pumping]]\ntime = 1.0\nrate = 0.0\n')
    for name, r in (("mill lane piezometer", 35.0), ("chapel field piezometer", 140.0)):
        f.write(f'\n[[well]]\nname = "{name}"\ndistance = {r}\nstatic_level = 42.0\n')
        f.write('times = [' + ', '.join(repr(float(t)) for t in times) + ']\n')
        lv = [42.0 - s(r, t) + rng.normal(0, 0.004) for t in times]
        f.write('water_levels = [' + ', '.join('%.3f' % v for v in lv) + ']\n')
