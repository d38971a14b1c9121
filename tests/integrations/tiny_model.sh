# What the integration tests share: a check counter, a tiny model trained in seconds, and a
# listing of candidate files to compare runs byte for byte.
# Sourced by each test script: source tiny_model.sh

failures=0
# expect CONDITION_EXIT_CODE WHAT: counts a failed check and prints WHAT.
expect() {
  if [[ $1 -ne 0 ]]; then
    failures=$((failures + 1))
    echo "FAILED: $2"
  fi
}

# The candidate files of a folder (or of several), one "name checksum" line each, sorted by name.
listing() { find "$@" -maxdepth 1 -type f -name 'sample-*' -exec cksum {} + |
  awk '{n = split($3, p, "/"); print p[n], $1, $2}' | LC_ALL=C sort; }

# train_tiny_model CLI DIR: DIR/model.nucleate, trained with `CLI train` on two rock-salt cells in
# their primitive settings (a/sqrt(2) at 60 degrees): NaCl, a = 5.64 A, and KCl, a = 6.29 A
# (lattice constants from memory). The sizes of tests/abi/fortran_sample_test.f90: hidden 16, one
# layer, 20 diffusion steps, 2 epochs. Such a model is not expected to make good crystals; the
# tests check contracts (files, counts, reproducibility), not chemistry.
train_tiny_model() {
  local cli=$1 dir=$2 name formula metal a
  mkdir -p "$dir/structures"
  for name in NaCl:Na:3.98808 KCl:K:4.44770; do
    IFS=: read -r formula metal a <<<"$name"
    cat >"$dir/structures/$formula.cif" <<CIF
data_$formula
_cell_length_a $a
_cell_length_b $a
_cell_length_c $a
_cell_angle_alpha 60
_cell_angle_beta 60
_cell_angle_gamma 60
loop_
_atom_site_label
_atom_site_type_symbol
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
${metal}1 $metal 0 0 0
Cl1 Cl 0.5 0.5 0.5
CIF
  done
  cat >"$dir/train.yaml" <<YAML
data: {directory: structures}
split: {validation_fraction: 0.0, test_fraction: 0.0}
model: {hidden: 16, layers: 1, time_embedding: 8}
diffusion: {steps: 20}
training: {epochs: 2, batch_size: 2, micro_batch: 1, warmup_steps: 1}
output: {model: model.nucleate}
YAML
  if ! "$cli" train --config "$dir/train.yaml" >"$dir/train.out" 2>&1; then
    echo "FAILED: training the tiny model: $(tail -n 3 "$dir/train.out")"
    exit 1
  fi
}
