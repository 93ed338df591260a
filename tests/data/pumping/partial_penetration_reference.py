#!/usr/bin/python3
"""Drawdown around a partially penetrating well in a confined anisotropic aquifer, computed
independently of Hantush's (1961) cosine series: the continuous point sink in an infinite
medium (Carslaw and Jaeger, 1959, 10.2, from memory), s = q / (4 pi K R) erfc(R / (2 sqrt(K t /
Ss))), stretched in z for K_z / K_r (R^2 = r^2 + (z - z0)^2 K_r / K_z, strength sqrt(K_r / K_z)),
spread uniformly along the pumped screen, with image sinks at +-z0 + 2 m b for the impervious
top and base (method of images), averaged over the observation screen (or at a piezometer).
The two averages over the screens reduce to one integral over zeta = z -+ z0 with the
trapezoidal density of a sum of two uniform variables; scipy.integrate.quad does it.

Prints 4 pi T s / Q for the cases of tests/postproc/test_partial_penetration.cpp.
Run: /usr/bin/python3 partial_penetration_reference.py
"""
import math

from scipy.integrate import quad
from scipy.special import erfc


def uniform_sum_density(a1, b1, a2, b2):
    """Density of X + Y, X ~ U[a1, b1], Y ~ U[a2, b2], and its support and corners."""
    def f(s):
        return max(0.0, min(b1, s - a2) - max(a1, s - b2)) / ((b1 - a1) * (b2 - a2))
    corners = sorted({a1 + a2, min(a1 + b2, b1 + a2), max(a1 + b2, b1 + a2), b1 + b2})
    return f, corners


def dimensionless_drawdown(T, S, ratio, b, r, t, pumped, observed):
    """4 pi T s / Q. pumped = (d, l), observed = (d', l') or (z, z): depths below the top."""
    d, l = pumped
    do, lo = observed
    diffusion = math.sqrt(T * t / S)  # sqrt(K_r t / Ss), L

    def kernel(zeta):
        rr = math.sqrt(r * r + zeta * zeta / ratio)
        return erfc(rr / (2.0 * diffusion)) / rr

    families = []  # (density, corners) of z - z0 and of z + z0
    for sign in (-1.0, 1.0):
        y = (-l, -d) if sign < 0 else (d, l)
        if lo == do:
            def f(s, y=y):
                return 1.0 / (l - d) if y[0] <= s - do <= y[1] else 0.0
            families.append((f, [do + y[0], do + y[1]]))
        else:
            families.append(uniform_sum_density(do, lo, y[0], y[1]))
    reach = 14.0 * diffusion * math.sqrt(ratio) + 2.0 * b
    m_max = int(reach / (2.0 * b)) + 2
    total = 0.0
    for f, corners in families:
        for m in range(-m_max, m_max + 1):
            shift = 2.0 * m * b
            lo_z, hi_z = corners[0], corners[-1]
            # the kernel centred on zeta = shift: skip images beyond its reach
            if lo_z - shift > reach or shift - hi_z > reach:
                continue
            pts = [c for c in corners[1:-1]] + ([shift] if lo_z < shift < hi_z else [])
            v, _ = quad(lambda z: f(z) * kernel(z - shift), lo_z, hi_z,
                        points=sorted(set(pts)) or None, epsabs=0.0, epsrel=1e-12, limit=400)
            total += v
    return b / math.sqrt(ratio) * total


# (T m2/d, S, K_z/K_r, b m, r m, pumped (d, l), observed (d', l') or (z, z), times d)
CASES = [
    (200.0, 2e-4, 1.0, 30.0, 6.0, (0.0, 10.0), (25.0, 25.0), (1e-5, 1e-3, 0.1)),
    (200.0, 2e-4, 0.1, 30.0, 1.5, (10.0, 20.0), (0.0, 5.0), (1e-5, 1e-3, 0.1)),
    (200.0, 2e-4, 0.3, 30.0, 30.0, (20.0, 30.0), (22.0, 28.0), (1e-3, 0.1, 1.0)),
    (200.0, 2e-4, 1.0, 30.0, 0.6, (5.0, 15.0), (10.0, 10.0), (1e-6, 1e-4, 0.01)),
    (200.0, 2e-4, 0.05, 30.0, 12.0, (0.0, 6.0), (0.0, 6.0), (1e-4, 0.01, 1.0)),
]

if __name__ == "__main__":
    for T, S, ratio, b, r, pumped, observed, times in CASES:
        for t in times:
            v = dimensionless_drawdown(T, S, ratio, b, r, t, pumped, observed)
            print(f"{{{T}, {S}, {ratio}, {b}, {r}, {pumped[0]}, {pumped[1]}, {observed[0]}, "
                  f"{observed[1]}, {t}, {v:.15g}}},")
