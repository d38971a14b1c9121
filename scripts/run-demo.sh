#!/usr/bin/env bash
# The main job on the shipped defaults. For now: design the noise schedules for crystal generation
# from physical targets, print the designed tables and write plots. (Structure generation arrives with the
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
echo "== Designing schedules for 1000 steps: lattice noise from SNR 1e4 down to 1e-4;"
echo "   coordinates resolved to 0.02 A on a 5 A cell at the finest level, and within 0.005"
echo "   (total variation) of uniform at the coarsest"
"$nucleate" design --steps 1000 --initial-snr 1e4 --terminal-snr 1e-4 --resolution 0.02 \
  --cell-length 5 --tv-distance 0.005 --json > "$out/design.json"
"$nucleate" design --steps 1000 --initial-snr 1e4 --terminal-snr 1e-4 --resolution 0.02 \
  --cell-length 5 --tv-distance 0.005
echo
echo "== The designed lattice-noise schedule, every 100th of its 1000 steps"
"$nucleate" schedule --design "$out/design.json" --respace 10 --format table \
  --plot "$out/lattice_log_snr.svg"
"$nucleate" schedule --design "$out/design.json" --format csv > "$out/lattice_schedule.csv"
echo
echo "== The designed coordinate-noise ladder on the unit torus (wrapped normal), 10 levels"
"$nucleate" schedule --design "$out/design.json" --kind geometric --steps 10 --format table \
  --plot "$out/coordinate_sigma.svg"
"$nucleate" schedule --design "$out/design.json" --kind geometric --format csv \
  > "$out/coordinate_sigma.csv"
echo
echo "Wrote $out: design.json, lattice_schedule.csv, coordinate_sigma.csv,"
echo "      lattice_log_snr.svg, coordinate_sigma.svg"
