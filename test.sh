#!/usr/bin/env bash
# The whole test suite: unit, golden and end-to-end tests with the race
# detector, then each fuzz target briefly.
set -euo pipefail
cd "$(dirname "$0")"
go test -race -count=1 ./...

# Each fuzz target runs a fixed number of inputs (a count, not a duration:
# a duration can expire while a worker is busy, which the fuzzer reports as
# "context deadline exceeded" without any failing input). A run that fails
# without writing a failing input is retried once.
fuzz() {
  local pkg=$1 target=$2 out
  for attempt in 1 2; do
    if out=$(go test -run '^$' -fuzz "^$target\$" -fuzztime 100000x -fuzzminimizetime 2000x "$pkg" 2>&1); then
      echo "$out" | tail -1
      return 0
    fi
    echo "$out" | tail -20
    if echo "$out" | grep -q "Failing input written"; then
      return 1
    fi
    echo "fuzz $target: failed without a failing input (attempt $attempt)"
  done
  return 1
}

for file in $(grep -rlE '^func Fuzz[A-Za-z0-9_]+\(' --include='*_test.go' . | sort); do
  pkg=$(dirname "$file")
  for target in $(grep -hoE '^func (Fuzz[A-Za-z0-9_]+)' "$file" | sed 's/func //'); do
    echo "fuzz $target in $pkg"
    fuzz "$pkg" "$target"
  done
done
