#!/usr/bin/python3
"""Writes a test file of noise-free drawdowns around a partially penetrating well, computed by
partial_penetration_reference.py (image sinks integrated by scipy, independent of the
program's series), for tests/scripts/drawdown_fit_screens.sh.

Invented test: a confined aquifer from -5 to -35 m (static level 2 m), T = 200 m2/d,
S = 2e-4, K_z / K_r = 0.2; the pumped well screened from -5 to -15 m, 1000 m3/d for 0.5 d then
recovery to 1 d; a piezometer at 8 m with its tip at -30 m, a well at 20 m screened from -20 to
-26 m.
Run: /usr/bin/python3 write_partial_penetration_test.py OUT.toml [anisotropy_ratio]
"""
import os
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from partial_penetration_reference import dimensionless_drawdown  # noqa: E402

T, S, RATIO, TOP, BOTTOM = 200.0, 2e-4, 0.2, -5.0, -35.0
B = TOP - BOTTOM
Q, STOP = 1000.0, 0.5
PUMPED = (TOP - (-5.0), TOP - (-15.0))  # depths below the top
WELLS = [("piezometer", 8.0, (-30.0, -30.0)), ("deep well", 20.0, (-20.0, -26.0))]
TIMES = [1e-4 * 10 ** (4 * i / 13) for i in range(14)]


def drawdown(r, screen, t):
    observed = (TOP - screen[0], TOP - screen[1])
    def unit(tt):
        if tt <= 0.0:
            return 0.0
        return dimensionless_drawdown(T, S, RATIO, B, r, tt, PUMPED, observed) / (4 * 3.141592653589793 * T)
    return Q * (unit(t) - unit(t - STOP))


def main():
    out = sys.argv[1]
    ratio = sys.argv[2] if len(sys.argv) > 2 else '"fit"'
    lines = ['[test]', 'title = "invented partially penetrating test"', 'length_unit = "m"',
             'time_unit = "d"', '', '[aquifer]', f'top = {TOP}', f'bottom = {BOTTOM}',
             'static_level = 2.0', f'anisotropy_ratio = {ratio}', '', '[pumped_well]',
             'screen_top = -5.0', 'screen_bottom = -15.0', '', '[[pumping]]', 'time = 0.0',
             f'rate = {Q}', '', '[[pumping]]', f'time = {STOP}', 'rate = 0.0']
    for name, r, screen in WELLS:
        lines += ['', '[[well]]', f'name = "{name}"', f'distance = {r}']
        if screen[0] == screen[1]:
            lines.append(f'piezometer_tip = {screen[0]}')
        else:
            lines += [f'screen_top = {screen[0]}', f'screen_bottom = {screen[1]}']
        lines.append('times = [' + ', '.join(f'{t:.10g}' for t in TIMES) + ']')
        lines.append('drawdowns = [' + ', '.join(f'{drawdown(r, screen, t):.10g}' for t in TIMES) + ']')
    with open(out, 'w') as f:
        f.write('\n'.join(lines) + '\n')


if __name__ == '__main__':
    main()
