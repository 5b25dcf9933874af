#!/usr/bin/env bash
# Mutation testing of one package: gremlins (pinned below, fetched once
# through the Go module proxy by go run) changes one operator or constant
# at a time in the package's code that its tests cover, reruns the
# package's tests, and counts the changes that no test noticed (LIVED)
# against those a test failed on (KILLED). Not part of CI: it builds and
# tests the package once per mutant, minutes to an hour on two cores.
#
#   scripts/mutation.sh PKG [FILE-REGEX]
#   scripts/mutation.sh physiology
#   scripts/mutation.sh setup '^(cautions|entries)\.go$'
#
# FILE-REGEX limits the run to the package's files whose base name matches
# (the others are excluded). WORKERS (default 1) mutants run at once;
# TIMEOUT_COEFFICIENT (default 10) scales the time a mutant's tests may
# take over the unmutated run before it counts as TIMED OUT. The survivors
# are listed with their file, line and kind, then the score: efficacy is
# KILLED / (KILLED + LIVED), mutant coverage the share of mutants that some
# test reaches at all.
set -euo pipefail
cd "$(dirname "$0")/.."

gremlins=github.com/go-gremlins/gremlins/cmd/gremlins@v0.6.0

pkg=${1:?usage: scripts/mutation.sh PKG [FILE-REGEX]}
pkg=${pkg#./}
pkg=${pkg%/}
files=${2:-}
[ -d "$pkg" ] || { echo "mutation.sh: no package directory $pkg" >&2; exit 2; }

args=(unleash --workers "${WORKERS:-1}" --timeout-coefficient "${TIMEOUT_COEFFICIENT:-10}")
if [ -n "$files" ]; then
  matched=0
  for f in "$pkg"/*.go; do
    base=$(basename "$f")
    case $base in *_test.go) continue ;; esac
    if [[ $base =~ $files ]]; then
      matched=1
    else
      # gremlins matches the path from the package directory
      args+=(--exclude-files "(^|/)$(printf '%s' "$base" | sed 's/[.]/[.]/g')\$")
    fi
  done
  [ "$matched" = 1 ] || { echo "mutation.sh: no file of $pkg matches $files" >&2; exit 2; }
fi

out=$(mktemp)
trap 'rm -f "$out"' EXIT
go run "$gremlins" "${args[@]}" --output-statuses lt "./$pkg" | tee "$out"
echo
echo "mutation score of $pkg${files:+ ($files)}:"
grep -E 'Killed:|Test efficacy|Mutator coverage' "$out" || echo "(gremlins printed no totals: see above)"
