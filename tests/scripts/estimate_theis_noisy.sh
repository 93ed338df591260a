#!/usr/bin/env bash
# Noisy Theis (1935) drawdowns over repeated seeds: do the reported 95 % intervals of
# `aquiledger estimate` cover the true T and S as often as they claim?
#
# Data: drawdowns at four bores (15 to 250 m) at 11 times (0.2 to 2 d) from the Theis
# solution s = Q / (4 pi T) E1(r^2 S / (4 T t)) computed at test time with scipy.special.exp1
# (estimate_theis.py), T = 350 m2/d, S = 2e-4, Q = 1000 m3/d, plus Gaussian noise of standard
# deviation 0.15 m (drawdowns 0.6 to 2.4 m), seeds 1 to 10, the set-up's weights
# 1 / 0.15^2. Model: the numerical model on a small telescoping grid (2 m at the well, widths
# growing by 1.5 to 3 km; 33 x 33 cells) and 20 time steps growing by 15 %, so that each fit
# takes about a second of CPU. Its own discretisation error (measured noise-free with the same
# grid: T +2.5 %, S -4.0 %) is a small part of the intervals at this noise (about 0.45 and
# 0.15 of a standard error of T and ln S), so the intervals should cover nearly as often as
# 95 % intervals do (for T about 0.93: P(|Z + 0.45| < 1.96)).
#
# Why at least 8 of 10 for each parameter: if each interval covers its true value with
# probability 0.95, independently from seed to seed, the number of the 10 seeds that cover it
# is binomial (10, 0.95): P(at least 8) = 0.988, P(at least 9) = 0.914. So at least 8 fails a
# correct fit for about 1 seed set in 90. With the bias above the coverage per seed is nearer
# 0.93 for T (binomial (10, 0.93): P(at least 8) = 0.97). The seeds are fixed, so the outcome is the same on every
# run; a wrong interval (e.g. s^2 left out, or the t quantile replaced by 1) covers far less
# often (about 0.68 for one standard error), and P(at least 8 of 10) = 0.33 would show it.
#   bash estimate_theis_noisy.sh <aquiledger> <source-dir>
set -euo pipefail
# shellcheck source=../support/script_start.sh
source "${BASH_SOURCE[0]%/*}/../support/script_start.sh"
skip_unless_scipy
make_scratch out
grid=(--width-growth 1.5 --extent 3000 --steps 20 --step-growth 1.15)
for seed in 1 2 3 4 5 6 7 8 9 10; do
  mkdir "$out/$seed"
  /usr/bin/python3 "$src/tests/scripts/estimate_theis.py" "$out/$seed" 350 2e-4 --noise 0.15 \
    --seed "$seed" "${grid[@]}"
  "$exe" estimate "$out/$seed/setup.toml" -o "$out/$seed/fit" -q
done
/usr/bin/python3 - "$out" <<'PY'
import csv, json, os, sys
out = sys.argv[1]
b = 10.0  # aquifer thickness of estimate_theis.py: T = K b
covered = {"T": 0, "S": 0}
s2 = []
for seed in range(1, 11):
    d = os.path.join(out, str(seed), "fit")
    rows = {r["parameter"]: r for r in csv.DictReader(open(os.path.join(d, "estimated_parameters.csv")))}
    est = json.load(open(os.path.join(d, "estimate.json")))
    assert est["converged"] is True, (seed, est["warnings"])
    s2.append(est["error_variance"])
    line = [f"seed {seed:2d}:"]
    for name, key, scale, true in (("T", "k", b, 350.0), ("S", "storativity", 1.0, 2.0e-4)):
        r = rows[key]
        v, lo, hi = (float(r[c]) * scale for c in ("value", "lower_95", "upper_95"))
        inside = lo <= true <= hi
        covered[name] += inside
        line.append(f"{name} {v:.4g} ({lo:.4g} .. {hi:.4g}){'' if inside else ' MISSES'}")
    print("  ".join(line))
print(f"covered in 10 seeds: T {covered['T']}, S {covered['S']}; s^2 mean {sum(s2) / len(s2):.3f}")
for name, n in covered.items():
    assert n >= 8, f"the 95 % interval of {name} covered the true value in only {n} of 10 seeds"
PY
echo "noisy Theis seeds: ok"
