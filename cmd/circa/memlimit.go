package main

import (
	"os"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"sync"

	"circa/lang"
)

// A command's memory is mostly what it keeps of its inputs, a few times
// their size. Under the collector's default pacing the heap may grow to
// twice the live set between cycles, garbage not yet swept included, so a
// large file's peak would be twice what its analysis needs. A soft limit
// (runtime/debug.SetMemoryLimit) scaled to the bytes read makes the
// collector run earlier as the heap nears it instead.

// heapPerInputByte is the soft limit per byte read: room over the live set
// of a large file's check or estimate (at most about 5.5 bytes per byte)
// for the garbage of one cycle. The process's resident size runs a little
// over the limit (the program itself, stacks, pages not yet returned), so
// the limit stays well under the target of at most 10 bytes per byte read
// that BenchmarkMemory reports as rss/input; 8 rather than 9
// cost a large check about 4 % more time in collection.
const heapPerInputByte = 8

// A limit under the live heap would make the collector run without pause:
// the limit is kept at least liveHeadroom times the live heap that the
// last cycle found, which costs a file whose analysis keeps more than the
// above some more cycles but never thrashes.
const liveHeadroom = 1.5

// leastMemoryLimit is the limit for small inputs, whose heap is so small
// that collecting more often would cost time and save nothing a user sees.
const leastMemoryLimit = 64 << 20

// inputMemory is the process's account of the bytes its commands read.
var inputMemory struct {
	mu     sync.Mutex
	active int   // commands running (tests run several in one process)
	read   int64 // bytes read by them
	prev   int64 // the limit before the first of them began
	live   int64 // the live heap at the end of the last cycle
	// watching is set while a finalizer follows the cycles (watchCycles).
	watching bool
}

// limitMemory starts a command's account of its inputs and returns the
// function that ends it; when no command is left running, the limit is
// what it was before. A limit the user set with GOMEMLIMIT is left alone.
func limitMemory() (end func()) {
	if os.Getenv("GOMEMLIMIT") != "" {
		return func() {}
	}
	a := &inputMemory
	a.mu.Lock()
	defer a.mu.Unlock()
	if a.active == 0 {
		a.prev = debug.SetMemoryLimit(-1)
		a.read, a.live = 0, 0
	}
	a.active++
	if !a.watching {
		a.watching = true
		watchCycles()
	}
	return func() {
		a.mu.Lock()
		defer a.mu.Unlock()
		if a.active--; a.active == 0 {
			debug.SetMemoryLimit(a.prev)
		}
	}
}

// noteInput counts n bytes read by a command and raises the soft limit
// with them. It is never lowered while a command runs: the text read stays
// live to the end, for the findings' excerpts.
func noteInput(n int) {
	a := &inputMemory
	a.mu.Lock()
	defer a.mu.Unlock()
	if a.active == 0 {
		return
	}
	a.read += int64(n)
	debug.SetMemoryLimit(memoryLimitFor(a.read, a.live))
}

// memoryLimitFor is the soft limit for inputs of inputBytes bytes in all
// while the live heap is live bytes.
func memoryLimitFor(inputBytes, live int64) int64 {
	return max(leastMemoryLimit, heapPerInputByte*inputBytes, int64(liveHeadroom*float64(live)))
}

// cycleTick is an object whose finalizer runs once a collection cycle
// found it unreachable, and which it sets again: a call at about every
// cycle. It holds a pointer so that it is not one of the tiny objects
// allocated together, whose finalizers wait for their neighbours.
type cycleTick struct{ _ *int }

// watchCycles follows the collection cycles while a command runs, raising
// the limit with the live heap each one finds.
func watchCycles() {
	runtime.SetFinalizer(&cycleTick{}, onCycle)
}

var liveSample = []metrics.Sample{{Name: "/gc/heap/live:bytes"}}

func onCycle(t *cycleTick) {
	a := &inputMemory
	a.mu.Lock()
	defer a.mu.Unlock()
	if a.active == 0 {
		a.watching = false
		return
	}
	metrics.Read(liveSample)
	if liveSample[0].Value.Kind() == metrics.KindUint64 {
		a.live = int64(liveSample[0].Value.Uint64())
		debug.SetMemoryLimit(memoryLimitFor(a.read, a.live))
	}
	runtime.SetFinalizer(t, onCycle)
}

// inputFS reads included files as lang.OSFS does, counting them with
// noteInput.
type inputFS struct{}

func (inputFS) ReadFile(path string) ([]byte, error) {
	b, err := lang.OSFS{}.ReadFile(path)
	noteInput(len(b))
	return b, err
}
