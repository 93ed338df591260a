#!/usr/bin/env bash
# The invented pumping-test cases (cases/02-*, cases/03-*, cases/07-*) interpreted by one
# command each: the generating values (make_test.py, scipy) lie within the fitted 95 %
# intervals, and the chosen models, all by `auto`, are Theis, Neuman and Hantush's (1961)
# partial penetration.
#   bash pumping_test_cases.sh <aquiledger> <source-dir>
set -euo pipefail
exe=${1:?usage: pumping_test_cases.sh <aquiledger> <source-dir>}
src=${2:?usage: pumping_test_cases.sh <aquiledger> <source-dir>}
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
"$exe" drawdown-fit "$src/cases/02-hollin-ford-confined-test/test.toml" -o "$out/a" -q
# Case 03's file names neuman; -m auto makes the choice by AICc among Theis, Hantush-Jacob and
# Neuman (the simpler kept within 2).
"$exe" drawdown-fit "$src/cases/03-brackwater-water-table-test/test.toml" -m auto -o "$out/b" -q
# Case 07 gives screens: auto weighs Hantush (1961) partial penetration too.
"$exe" drawdown-fit "$src/cases/07-corvel-moss-partial-penetration-test/test.toml" -o "$out/c" -q
python3 - "$out" <<'PY'
import json, sys
# Generating values of the invented cases (their make_test.py).
for folder, model, truth in (("a", "theis", {"transmissivity": 480.0, "storativity": 1.5e-4}),
                             ("b", "neuman", {"transmissivity": 150.0, "storativity": 5e-4,
                                              "specific_yield": 0.12, "drainage_length": 200.0})):
    fit = json.load(open(f"{sys.argv[1]}/{folder}/fit.json"))
    assert fit["chosen_model"] == model, (folder, fit["chosen_model"])
    assert fit["automatic_choice"] is True, folder
    assert {c["model"] for c in fit["candidates"]} == {"theis", "hantush-jacob", "neuman"}, folder
    chosen = [c for c in fit["candidates"] if c["model"] == model][0]
    for p in chosen["parameters"]:
        assert p["low_95"] <= truth[p["name"]] <= p["high_95"], (folder, p)
fit = json.load(open(f"{sys.argv[1]}/c/fit.json"))
assert fit["chosen_model"] == "hantush-partial-penetration", fit["chosen_model"]
assert [c["model"] for c in fit["candidates"]] == [
    "theis", "hantush-partial-penetration", "hantush-jacob", "neuman"], fit["candidates"]
truth = {"transmissivity": 90.0, "storativity": 3e-4, "anisotropy_ratio": 0.1}
chosen = [c for c in fit["candidates"] if c["model"] == "hantush-partial-penetration"][0]
assert [p["name"] for p in chosen["parameters"]] == list(truth), chosen["parameters"]
for p in chosen["parameters"]:
    assert p["low_95"] <= truth[p["name"]] <= p["high_95"], ("c", p)
PY
echo "pumping test cases: all checks passed"
