#!/usr/bin/env bash
# Rewrites cases/*/expected_reply.json from what the built library replies now.
#
# Run this ONLY when a reply change is intended (a new field, a corrected number, a reworded
# message) and then review every changed file with `git diff tests/conformance/cases` before
# committing: the fixtures are the contract bindings are held to, and regenerating them blindly
# turns every regression into the new truth. expected_status is never rewritten; a case whose
# status changed is reported and left for a person to decide. A new case needs `method`,
# `request.json` and `expected_status` written by hand; this script then fills in its reply.
#
# Usage: tests/conformance/regenerate.sh BUILD_DIR   (a build configured with tests on)
#
# Why not `nucleate call`: on failure the CLI prints the message alone and exits 1, so it can
# give neither the ErrorDetail bytes nor the status code that the error cases record. The helper
# below calls nucleate_call exactly as the C runner does.
set -euo pipefail

if [[ $# -ne 1 ]]; then
  echo "usage: $0 BUILD_DIR" >&2
  exit 2
fi
build=$(cd "$1" && pwd)
here=$(cd "$(dirname "$0")" && pwd)
cmake --build "$build" --target conformance_regenerate_replies
# In the folder CMake prepared (data/ linked), as the runners run: requests name files relative
# to the working directory.
cd "$build/tests/conformance/run-regenerate"
"$build/tests/conformance/conformance_regenerate_replies" "$here/cases"
echo "now review: git diff -- tests/conformance/cases"
