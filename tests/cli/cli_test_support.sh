# What the command-line tests share: the executable from the first argument, a temporary working
# folder removed at exit, a check counter, and small writers and readers (bash and the CLI only).
# Sourced by each test script with its arguments: source cli_test_support.sh "$@"

if [[ $# -ne 1 ]]; then
  echo "usage: $0 NUCLEATE_EXECUTABLE" >&2
  exit 2
fi
cli=$(realpath "$1")
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
cd "$work" || exit 1

failures=0
checks=0
# expect CONDITION_EXIT_CODE WHAT: counts a check, prints WHAT when it failed.
expect() {
  checks=$((checks + 1))
  if [[ $1 -ne 0 ]]; then
    failures=$((failures + 1))
    echo "FAILED: $2"
  fi
}
# A one-structure P1 CIF: name, a, angle (equal axes and angles), then "symbol x y z" per site.
write_cif() {
  local path=$1 name=$2 a=$3 angle=$4
  shift 4
  {
    echo "data_$name"
    for axis in a b c; do echo "_cell_length_$axis $a"; done
    for angle_name in alpha beta gamma; do echo "_cell_angle_$angle_name $angle"; done
    echo "loop_"
    echo "_atom_site_label"
    echo "_atom_site_type_symbol"
    echo "_atom_site_fract_x"
    echo "_atom_site_fract_y"
    echo "_atom_site_fract_z"
    local site n=0
    for site in "$@"; do
      n=$((n + 1))
      read -r symbol x y z <<<"$site"
      echo "$symbol$n $symbol $x $y $z"
    done
  } >"$path"
}
# The JSON array under KEY in a compact JSON text, e.g. [11,17].
json_array() { grep -o "\"$1\":\[[^]]*\]" | head -n 1 | sed 's/^[^[]*//'; }
# The value of a top-level-unique "key":value in a compact JSON text (numbers may be quoted).
json_value() { grep -o "\"$1\":\"\\?[^,\"}]*" | head -n 1 | sed 's/^[^:]*:"\?//'; }
# The number of lines of a file, 0 when it does not exist.
lines() { if [[ -f $1 ]]; then wc -l <"$1"; else echo 0; fi; }
# interrupt_when_progressing PID LOG: sends Ctrl-C (SIGINT) to a background run once its log
# shows a progress line (or after 30 s), and returns the run's exit code.
interrupt_when_progressing() {
  local pid=$1 log=$2
  for _ in $(seq 1 600); do
    grep -q '^progress' "$log" 2>/dev/null && break
    sleep 0.05
  done
  kill -INT "$pid"
  wait "$pid"
}
