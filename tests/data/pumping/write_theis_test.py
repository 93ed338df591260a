# Writes a pumping-test file of noise-free Theis (1935) drawdowns, s = Q / (4 pi T)
# E1(r^2 S / (4 T t)) with scipy.special.exp1, for T = 120 m2/d, S = 5e-4, Q = 800 m3/d for
# 1 d, 24 times over 3 decades, plus the image wells of up to two perpendicular straight lines
# (Ferris et al., 1962, USGS Water-Supply Paper 1536-E): a barrier's image pumps (+), a
# recharge line's injects (-), and the image of an image has the product of the signs.
# Independent of the program's own well function. Used by tests/scripts/drawdown_fit_*.sh.
#   /usr/bin/python3 write_theis_test.py OUT TITLE --well R[:BEARING] ...
#                    [--barrier D:BEARING] [--recharge D:BEARING]
import argparse
import math

from scipy.special import exp1

T, S, Q = 120.0, 5.0e-4, 800.0
times = [10 ** (-3 + 3 * i / 23) for i in range(24)]

parser = argparse.ArgumentParser()
parser.add_argument("out")
parser.add_argument("title")
parser.add_argument("--well", action="append", required=True)
parser.add_argument("--barrier", action="append", default=[])
parser.add_argument("--recharge", action="append", default=[])
args = parser.parse_args()
lines = [("barrier", *map(float, b.split(":"))) for b in args.barrier] + \
        [("recharge", *map(float, b.split(":"))) for b in args.recharge]
assert len(lines) <= 2, "at most two lines, perpendicular to each other"


def unit(bearing):  # degrees clockwise from north -> (east, north)
    return math.sin(math.radians(bearing)), math.cos(math.radians(bearing))


def reflect(p, line):
    _, d, bearing = line
    n = unit(bearing)
    k = 2 * (d - (p[0] * n[0] + p[1] * n[1]))
    return p[0] + k * n[0], p[1] + k * n[1]


# The pumped well at the origin and its images, each with its sign.
wells = [((0.0, 0.0), 1.0)]
for line in lines:
    sign = 1.0 if line[0] == "barrier" else -1.0
    wells += [(reflect(p, line), s * sign) for p, s in wells]


def theis(r, t):
    return Q / (4 * math.pi * T) * exp1(r * r * S / (4 * T * t))


with open(args.out, "w") as f:
    f.write(f'[test]\ntitle = "{args.title}"\nmodel = "numerical"\n\n'
            "[[pumping]]\ntime = 0.0\nrate = 800.0\n\n")
    for kind, d, bearing in lines:
        f.write(f'[[boundary]]\nkind = "{kind}"\ndistance = {d!r}\nbearing = {bearing!r}\n\n')
    for spec in args.well:
        r, *rest = map(float, spec.split(":"))
        bearing = rest[0] if rest else 0.0
        x, y = r * unit(bearing)[0], r * unit(bearing)[1]
        s = [sum(sign * theis(math.hypot(px - x, py - y), t) for (px, py), sign in wells)
             for t in times]
        f.write(f'[[well]]\nname = "at {r:g} m"\ndistance = {r!r}\n')
        if rest:
            f.write(f"bearing = {bearing!r}\n")
        f.write(f"times = [{', '.join(map(repr, times))}]\n"
                f"drawdowns = [{', '.join(map(repr, s))}]\n\n")
