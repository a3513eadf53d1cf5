package main

import (
	"math"
	"runtime/debug"
	"testing"
)

// A command raises the soft memory limit with what it reads, keeps it over
// the live heap, and leaves the limit as it found it.
func TestMemoryLimit(t *testing.T) {
	t.Setenv("GOMEMLIMIT", "")
	if got := memoryLimitFor(1<<20, 0); got != leastMemoryLimit {
		t.Errorf("limit for 1 MiB read = %d, want the least, %d", got, leastMemoryLimit)
	}
	if got, want := memoryLimitFor(100<<20, 0), int64(heapPerInputByte*100<<20); got != want {
		t.Errorf("limit for 100 MiB read = %d, want %d", got, want)
	}
	if got := memoryLimitFor(100<<20, 1<<30); got < 1<<30+1<<29 {
		t.Errorf("limit with 1 GiB live = %d, under 1.5 GiB: the collector would run without pause", got)
	}
	before := debug.SetMemoryLimit(-1)
	end := limitMemory()
	noteInput(100 << 20)
	if got, want := debug.SetMemoryLimit(-1), int64(heapPerInputByte*100<<20); got < want {
		t.Errorf("limit while a command that read 100 MiB runs = %d, want at least %d", got, want)
	}
	end()
	if got := debug.SetMemoryLimit(-1); got != before {
		t.Errorf("limit after the command = %d, want %d as before", got, before)
	}
}

// A limit the user set in the environment is left alone.
func TestMemoryLimitEnvironment(t *testing.T) {
	t.Setenv("GOMEMLIMIT", "1GiB")
	before := debug.SetMemoryLimit(-1)
	end := limitMemory()
	noteInput(math.MaxInt32)
	if got := debug.SetMemoryLimit(-1); got != before {
		t.Errorf("limit = %d under GOMEMLIMIT, want %d unchanged", got, before)
	}
	end()
}
