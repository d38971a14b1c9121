#!/usr/bin/env bash
# The conformance suite through the command-line tool: `nucleate call METHOD` with request.json
# on stdin. A passing case replies on stdout with the expected bytes and exits 0; a failing one
# exits 1 with one line on stderr naming the status (the CLI prints the message, not the
# ErrorDetail, so an error reply's bytes are not compared here).
# Usage: run_conformance_cli.sh NUCLEATE_EXECUTABLE CASES_DIR [EXPECTED_CASE_COUNT]
set -u

if [[ $# -lt 2 || $# -gt 3 ]]; then
  echo "usage: $0 NUCLEATE_EXECUTABLE CASES_DIR [EXPECTED_CASE_COUNT]" >&2
  exit 2
fi
cli=$1
cases=$2
expected_count=${3:-}
scratch=$(mktemp -d)
trap 'rm -rf "$scratch"' EXIT

# Copies $1 to $2 without one trailing newline, if there is one.
without_final_newline() {
  if [[ -s $1 && $(tail -c 1 "$1" | od -An -tx1 | tr -d ' ') == 0a ]]; then
    head -c -1 "$1" >"$2"
  else
    cat "$1" >"$2"
  fi
}

status_names=(NUCLEATE_OK NUCLEATE_ERROR_UNKNOWN_METHOD NUCLEATE_ERROR_BAD_ENCODING
  NUCLEATE_ERROR_MALFORMED_REQUEST NUCLEATE_ERROR_INVALID_ARGUMENT NUCLEATE_ERROR_LIMIT_EXCEEDED
  NUCLEATE_ERROR_OUT_OF_MEMORY NUCLEATE_ERROR_INTERNAL NUCLEATE_ERROR_NULL_ARGUMENT
  NUCLEATE_ERROR_IO NUCLEATE_ERROR_CANCELLED NUCLEATE_ERROR_NUMERICAL NUCLEATE_ERROR_UNSUPPORTED)

passed=0
failed=0
count=0
for folder in "$cases"/*/; do
  folder=${folder%/}
  name=$(basename "$folder")
  count=$((count + 1))
  method=$(head -n 1 "$folder/method")
  expected_status=$(tr -d '[:space:]' <"$folder/expected_status")
  "$cli" call "$method" <"$folder/request.json" >"$scratch/out" 2>"$scratch/err"
  code=$?
  why=""
  if [[ $expected_status == 0 ]]; then
    without_final_newline "$scratch/out" "$scratch/got"
    without_final_newline "$folder/expected_reply.json" "$scratch/want"
    if [[ $code -ne 0 ]]; then
      why="exit $code, expected 0: $(cat "$scratch/err")"
    elif ! difference=$(cmp "$scratch/got" "$scratch/want" 2>&1); then
      # Replies are long single lines: cmp names the first differing byte.
      why="reply differs: ${difference//"$scratch/"/}"
    elif [[ -s $scratch/err ]]; then
      why="wrote to stderr on success: $(cat "$scratch/err")"
    fi
  else
    # The CLI prints the status's symbolic name before the message; the codes are fixed forever
    # (nucleate.h), so expected_status maps to the name that must appear.
    status_name=${status_names[$expected_status]:-}
    if [[ $code -ne 1 ]]; then
      why="exit $code, expected 1"
    elif [[ $(wc -l <"$scratch/err") -ne 1 ]]; then
      why="stderr is not one line:"$'\n'"$(cat "$scratch/err")"
    elif [[ -z $status_name ]] || ! grep -q "$status_name:" "$scratch/err"; then
      why="stderr does not name ${status_name:-a status}: $(cat "$scratch/err")"
    elif [[ -s $scratch/out ]]; then
      why="wrote to stdout on failure: $(cat "$scratch/out")"
    fi
  fi
  if [[ -z $why ]]; then
    passed=$((passed + 1))
  else
    failed=$((failed + 1))
    echo "FAIL $name: $why"
  fi
done

echo "$passed passed, $failed failed"
if [[ -n $expected_count && $count -ne $expected_count ]]; then
  echo "found $count cases in $cases, expected $expected_count"
  exit 1
fi
[[ $failed -eq 0 && $passed -gt 0 ]]
