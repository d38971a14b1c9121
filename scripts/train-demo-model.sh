#!/usr/bin/env bash
# Trains the demo model from scratch: builds nucleate, generates the synthetic corpus (seed 1),
# and runs `nucleate train` with integrations/demo/train_demo.yaml in WORK (default
# build/demo-training). About two hours on a 2-core machine. Resumable: interrupt it (Ctrl-C or
# a batch time limit) and run it again; it continues from the last checkpoint bit for bit.
# The result, WORK/demo.nucleate, is what integrations/demo/model/demo.nucleate ships.
set -euo pipefail
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
build="${NUCLEATE_BUILD_DIR:-$root/build}"
work="${1:-$build/demo-training}"

"$root/scripts/install-deps.sh"
"$root/scripts/build.sh" -DNUCLEATE_BUILD_TESTS=OFF
mkdir -p "$work"
"$build/integrations/demo/corpus/nucleate-corpus" --out "$work" --seed 1 --count 6000
cp "$root/integrations/demo/train_demo.yaml" "$work/train_demo.yaml"
"$build/integrations/cli/nucleate" train --config "$work/train_demo.yaml" --log "$work/train.log"
echo "model: $work/demo.nucleate"
