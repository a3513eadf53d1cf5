#!/usr/bin/env bash
# The whole test suite: unit, golden and end-to-end tests with the race
# detector, then each fuzz target briefly.
set -euo pipefail
cd "$(dirname "$0")"
go test -race -count=1 ./...
for target in $(grep -rhoE '^func (Fuzz[A-Za-z0-9_]+)' --include='*_test.go' . | sed 's/func //' | sort -u); do
  pkg=$(grep -rlE "^func $target\(" --include='*_test.go' . | head -1 | xargs dirname)
  echo "fuzz $target in $pkg"
  go test -run '^$' -fuzz "^$target\$" -fuzztime 10s "$pkg"
done
