package main

import (
	"fmt"
	"io"
	"sync"
	"time"
)

// progressDelay is how long a command runs silently before it reports its
// progress on stderr.
var progressDelay = time.Second

// progress prints what a long command is doing, at most once a second and
// only once it has run longer than progressDelay, so quick runs stay
// silent.
type progress struct {
	mu      sync.Mutex
	w       io.Writer
	cmd     string
	stage   string
	printed string
	spoke   bool
	start   time.Time
	stop    chan struct{}
	done    chan struct{}
}

func startProgress(w io.Writer, cmd, stage string) *progress {
	p := &progress{w: w, cmd: cmd, stage: stage, start: time.Now(), stop: make(chan struct{}), done: make(chan struct{})}
	go p.run()
	return p
}

func (p *progress) run() {
	defer close(p.done)
	select {
	case <-time.After(progressDelay):
	case <-p.stop:
		return
	}
	tick := time.NewTicker(time.Second)
	defer tick.Stop()
	for {
		p.say()
		select {
		case <-tick.C:
		case <-p.stop:
			return
		}
	}
}

func (p *progress) say() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.stage == p.printed {
		return
	}
	fmt.Fprintf(p.w, "circa %s: %s… (%.1f s)\n", p.cmd, p.stage, time.Since(p.start).Seconds())
	p.printed, p.spoke = p.stage, true
}

// Set names what the command is doing now.
func (p *progress) Set(stage string) {
	p.mu.Lock()
	p.stage = stage
	p.mu.Unlock()
}

// Stop ends the reports; when any was printed, a last line gives the time.
func (p *progress) Stop() {
	close(p.stop)
	<-p.done
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.spoke {
		fmt.Fprintf(p.w, "circa %s: done in %.1f s\n", p.cmd, time.Since(p.start).Seconds())
	}
}
