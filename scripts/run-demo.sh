#!/usr/bin/env bash
# The main job on the shipped defaults. For now: design noise schedules for crystal generation,
# print the designed schedule's table and write plots. (Structure generation arrives with the
# model and sampling work.)
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${NUCLEATE_BUILD_DIR:-$root/build}"
out="${1:-$root/out/demo}"

"$root/scripts/install-deps.sh"
"$root/scripts/build.sh" -DNUCLEATE_BUILD_TESTS=OFF
nucleate="$build/integrations/cli/nucleate"
mkdir -p "$out"

"$nucleate" version
echo
echo "== Designing schedules for 1000 steps: terminal SNR 1e-4, coordinates resolved to 0.02 A"
echo "   on a 5 A cell, coordinate noise at sigma_max within 0.005 of uniform"
"$nucleate" design --steps 1000 --terminal-snr 1e-4 --resolution 0.02 --cell-length 5 \
  --tv-distance 0.005 --json > "$out/design.json"
"$nucleate" design --steps 1000 --terminal-snr 1e-4 --resolution 0.02 --cell-length 5 \
  --tv-distance 0.005
echo
echo "== Lattice noise: cosine schedule, every 100th step of 1000"
"$nucleate" schedule --kind cosine --steps 1000 --respace 10 --format table \
  --plot "$out/cosine_log_snr.svg"
echo
echo "== Coordinate noise: geometric sigma ladder on the unit torus, 10 levels"
"$nucleate" schedule --kind geometric --steps 10 --sigma-min 0.004 --sigma-max 0.5 \
  --format table --plot "$out/sigma_ladder.svg"
"$nucleate" schedule --kind cosine --steps 1000 --format csv > "$out/cosine.csv"
"$nucleate" schedule --kind geometric --steps 1000 --sigma-min 0.004 --sigma-max 0.5 \
  --format csv > "$out/sigma_ladder.csv"
echo
echo "Wrote: $out/design.json, cosine.csv, sigma_ladder.csv, cosine_log_snr.svg, sigma_ladder.svg"
