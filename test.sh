#!/usr/bin/env bash
# The whole test suite: unit, golden and end-to-end tests with the race
# detector, then each fuzz target briefly.
set -euo pipefail
cd "$(dirname "$0")"
go test -race -count=1 ./...
for file in $(grep -rlE '^func Fuzz[A-Za-z0-9_]+\(' --include='*_test.go' . | sort); do
  pkg=$(dirname "$file")
  for target in $(grep -hoE '^func (Fuzz[A-Za-z0-9_]+)' "$file" | sed 's/func //'); do
    echo "fuzz $target in $pkg"
    go test -run '^$' -fuzz "^$target\$" -fuzztime 10s -fuzzminimizetime 5s "$pkg"
  done
done
