#!/usr/bin/python3
"""Writes test.toml: the invented Corvel Moss test, a well screened over the top 12 m of a
confined aquifer 40 m thick, watched by two piezometers and a short screen. Drawdowns from
image sinks integrated by scipy (tests/data/pumping/partial_penetration_reference.py,
independent of the program's Hantush 1961 series) for T = 90 m2/d, S = 3e-4, K_z / K_r = 0.1,
600 m3/d for 1 d then recovery to 2 d, with 3 mm of normal noise (seed 7).
Run: /usr/bin/python3 make_test.py   (writes test.toml beside it)
"""
import math
import os
import random
import sys

here = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(here, "..", "..", "tests", "data", "pumping"))
from partial_penetration_reference import dimensionless_drawdown  # noqa: E402

T, S, RATIO, TOP, BOTTOM, LEVEL = 90.0, 3e-4, 0.1, -8.0, -48.0, 1.5
Q, STOP = 600.0, 1.0
SCREEN = (-8.0, -20.0)
WELLS = [("P1", 6.0, (-40.0, -40.0)), ("OW2", 15.0, (-30.0, -38.0)), ("P3", 40.0, (-14.0, -14.0))]
TIMES = [7e-4 * (2.0 / 7e-4) ** (i / 19) for i in range(20)]


def drawdown(r, screen, t):
    pumped = (TOP - SCREEN[0], TOP - SCREEN[1])
    observed = (TOP - screen[0], TOP - screen[1])
    def unit(tt):
        if tt <= 0.0:
            return 0.0
        return dimensionless_drawdown(T, S, RATIO, TOP - BOTTOM, r, tt, pumped, observed) / (
            4.0 * math.pi * T)
    return Q * (unit(t) - unit(t - STOP))


def main():
    rng = random.Random(7)
    lines = ['[test]', 'title = "Corvel Moss test well CM-1 (invented)"', 'length_unit = "m"',
             'time_unit = "d"', '', '[aquifer]', f'top = {TOP}', f'bottom = {BOTTOM}',
             f'static_level = {LEVEL}', 'anisotropy_ratio = "fit"', '', '[pumped_well]',
             f'screen_top = {SCREEN[0]}', f'screen_bottom = {SCREEN[1]}', '', '[[pumping]]',
             'time = 0.0', f'rate = {Q}', '', '[[pumping]]', f'time = {STOP}', 'rate = 0.0']
    for name, r, screen in WELLS:
        lines += ['', '[[well]]', f'name = "{name}"', f'distance = {r}']
        if screen[0] == screen[1]:
            lines.append(f'piezometer_tip = {screen[0]}')
        else:
            lines += [f'screen_top = {screen[0]}', f'screen_bottom = {screen[1]}']
        s = [drawdown(r, screen, t) + rng.gauss(0.0, 0.003) for t in TIMES]
        lines.append('times = [' + ', '.join(f'{t:.6g}' for t in TIMES) + ']')
        lines.append('drawdowns = [' + ', '.join(f'{v:.4f}' for v in s) + ']')
    with open(os.path.join(here, 'test.toml'), 'w') as f:
        f.write('\n'.join(lines) + '\n')


if __name__ == '__main__':
    main()
