# Writes theis_recovery.toml: a noise-free Theis (1935) test with recovery, the drawdowns
# computed with scipy.special.exp1 (run with /usr/bin/python3, which has scipy).
import numpy as np
from scipy.special import exp1

T, S, Q = 350.0, 2.0e-4, 1200.0  # m2/d, -, m3/d (invented)
stop = 1.0


def s(r, t):
    u = lambda tt: r * r * S / (4 * T * tt)
    v = Q / (4 * np.pi * T) * exp1(u(t))
    if t > stop:  # recovery by superposition (Theis, 1935)
        v -= Q / (4 * np.pi * T) * exp1(u(t - stop))
    return v


times = list(np.round(np.logspace(-4, 0, 25), 8)) + list(np.round(stop + np.logspace(-4, 0, 15), 8))
with open("theis_recovery.toml", "w") as f:
    f.write('# Noise-free Theis (1935) drawdown and recovery, computed with scipy.special.exp1\n')
    f.write('# (tests/data/pumping/README.md): T = 350 m2/d, S = 2e-4, Q = 1200 m3/d for 1 d.\n')
    f.write('[test]\ntitle = "synthetic Theis recovery"\nlength_unit = "m"\ntime_unit = "d"\nmodel = "theis"\n\n')
    f.write('[[pumping]]\ntime = 0.0\nrate = 1200.0\n\n[[pumping]]\ntime = 1.0\nrate = 0.0\n')
    for name, r in (("near", 25.0), ("far", 80.0)):
        f.write(f'\n[[well]]\nname = "{name}"\ndistance = {r}\n')
        f.write('times = [' + ', '.join(repr(float(t)) for t in times) + ']\n')
        f.write('drawdowns = [' + ', '.join('%.10g' % s(r, t) for t in times) + ']\n')
