#!/usr/bin/env bash
# Gathers the slices that sample_slice.sh wrote into CAMPAIGN_DIR/slice-<t>/ into one folder,
# CAMPAIGN_DIR/candidates/, as one run of the whole campaign would have written it:
#   sample-<index>.cif and sample-<index>.failed  every candidate's file;
#   candidates.tsv                                the caution line, then a line per candidate in
#                                                 index order.
# Refuses, naming them, slices of different campaigns (model, formula, total, seed, tasks) and
# indices that no finished slice holds, with the tasks to run again; nothing is gathered then.
# Usage: merge_slices.sh CAMPAIGN_DIR  (run it again after the missing tasks have run)
set -euo pipefail
shopt -s nullglob

fail() {
  echo "merge_slices.sh: $*" >&2
  exit 1
}

[[ $# -eq 1 ]] || { echo "usage: merge_slices.sh CAMPAIGN_DIR" >&2; exit 2; }
campaign=$1
slices=("$campaign"/slice-*/)
((${#slices[@]} > 0)) || fail "no slice-*/ folders in $campaign: has any task run?"
slices=("${slices[@]%/}")

# Every slice must belong to the same campaign; a slice without its "done" line did not finish.
settings="" total="" unfinished=()
for slice in "${slices[@]}"; do
  [[ -f $slice/slice.txt ]] || fail "$slice has no slice.txt: not written by sample_slice.sh"
  line=$(grep '^campaign ' "$slice/slice.txt") || fail "$slice/slice.txt has no campaign line"
  if [[ -z $settings ]]; then
    settings=$line
  elif [[ $line != "$settings" ]]; then
    fail "$slice/slice.txt is of another campaign:"$'\n'"  $line"$'\n'"  $settings"
  fi
  grep -qx 'done' "$slice/slice.txt" || unfinished+=("$(basename "$slice")")
done
total=$(sed -n 's/.* total=\([0-9]*\) .*/\1/p' <<<"$settings")
tasks=$(sed -n 's/.* tasks=\([0-9]*\)$/\1/p' <<<"$settings")
[[ -n $total && -n $tasks ]] || fail "cannot read total and tasks from: $settings"

# The slice of each index, from the ranges the finished slices record.
declare -A holder=()
for slice in "${slices[@]}"; do
  grep -qx 'done' "$slice/slice.txt" || continue
  read -r first count < <(sed -n 's/^range first=\([0-9]*\) count=\([0-9]*\)$/\1 \2/p' \
    "$slice/slice.txt")
  for ((i = first; i < first + count; i++)); do holder[$i]=$slice; done
done
missing=()
for ((i = 0; i < total; i++)); do
  [[ -n ${holder[$i]:-} ]] || missing+=("$i")
done
if ((${#missing[@]} > 0)); then
  # Task t holds [t*total/tasks, (t+1)*total/tasks), as sample_slice.sh computes it.
  declare -A rerun=()
  for i in "${missing[@]}"; do
    for ((t = i * tasks / total; (t + 1) * total / tasks <= i; t++)); do :; done
    rerun[$t]=1
  done
  echo "merge_slices.sh: ${#missing[@]} of $total candidates missing (first: ${missing[0]})" >&2
  ((${#unfinished[@]} == 0)) || echo "  unfinished: ${unfinished[*]}" >&2
  fail "run these tasks again: $(printf '%s\n' "${!rerun[@]}" | sort -n | paste -sd ' ')"
fi

for ((i = 0; i < total; i++)); do
  slice=${holder[$i]}
  [[ -f $slice/sample-$i.cif || -f $slice/sample-$i.failed ]] ||
    fail "$slice is marked done but has no file for candidate $i"
done

out="$campaign/candidates"
mkdir -p "$out"
for slice in "${slices[@]}"; do
  grep -qx 'done' "$slice/slice.txt" || continue
  find "$slice" -maxdepth 1 -type f \( -name 'sample-*.cif' -o -name 'sample-*.failed' \) \
    -exec cp -t "$out" {} +
done
# The caution once (every slice carries the same), then the candidates' lines by index.
{
  grep -h -m 1 '^#' "${holder[0]}/candidates.tsv"
  for slice in "${slices[@]}"; do
    grep -qx 'done' "$slice/slice.txt" && [[ -f $slice/candidates.tsv ]] || continue
    grep -hv '^#' "$slice/candidates.tsv" || true
  done | LC_ALL=C sort -n -k 1,1
} >"$out/candidates.tsv"
echo "merge_slices.sh: $total candidates of ${#slices[@]} slices in $out"
