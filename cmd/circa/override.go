package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"circa/check/flow"
	"circa/check/output"
	"circa/check/vary"
	"circa/lang"
)

// setFlag collects the repeatable --set NAME=VALUE flag: a top-level
// parameter given another value for one run.
type setFlag []lang.Override

const setUsage = "give a top-level parameter another value for this run, `NAME=VALUE` with its unit (repeatable), e.g. --set riser_bore=10mm"

func (s *setFlag) String() string {
	if s == nil {
		return ""
	}
	parts := make([]string, len(*s))
	for i, o := range *s {
		parts[i] = o.String()
	}
	return strings.Join(parts, " ")
}

func (s *setFlag) Set(v string) error {
	o, err := lang.ParseOverride(v)
	if err != nil {
		// The message quotes the user's text; the flag package prints it
		// to the terminal as it is.
		return errors.New(output.Printable(err.Error()))
	}
	*s = append(*s, o)
	return nil
}

// apply resolves m again with the parameters set. A parameter the file
// does not declare, or a value of the wrong dimension, is printed as a
// usage error and ok is false.
// load resolves the text src of path for a report, which needs the model
// and the texts, not the trees: without --set the trees are never kept
// whole (LoadSourceModel); a variant is resolved from them first.
func (s setFlag) load(cmd, path string, src []byte, stderr io.Writer) (*lang.Model, bool) {
	if len(s) == 0 {
		return lang.LoadSourceModel(path, src, inputFS{}), true
	}
	m, ok := s.apply(cmd, lang.LoadSource(path, src, inputFS{}), stderr)
	if ok {
		m.DropSyntax()
	}
	return m, ok
}

func (s setFlag) apply(cmd string, m *lang.Model, stderr io.Writer) (*lang.Model, bool) {
	if len(s) == 0 {
		return m, true
	}
	v, err := m.With(s...)
	if err != nil {
		msg := output.Printable(fmt.Sprintf("--set: %s", err))
		fmt.Fprintf(stderr, "circa %s: %s: %s\n", cmd, output.Printable(m.Root), msg)
		if l, ok := stderr.(*problemLog); ok {
			l.list = append(l.list, output.Problem{File: m.Root, Message: msg})
		}
		return m, false
	}
	return v, true
}

// varyFlag collects the --vary NAME=FROM..TO:N flag, given once or twice:
// the parameters a sweep varies.
type varyFlag []vary.Axis

const varyUsage = "estimate at each value of a top-level parameter, `NAME=FROM..TO:N` (N values, ends included) or NAME=V1,V2,…; give it twice for a grid of two parameters"

func (v *varyFlag) String() string { return "" }

func (v *varyFlag) Set(s string) error {
	if len(*v) == 2 {
		return fmt.Errorf("a sweep varies at most two parameters")
	}
	a, err := vary.Parse(s)
	if err != nil {
		return errors.New(output.Printable(err.Error()))
	}
	*v = append(*v, a)
	return nil
}

// sweep runs the sweep of m the flags ask for, with progress on stderr;
// on error the message is printed and ok is false.
func (v varyFlag) sweep(cmd string, m *lang.Model, fo flow.Options, stderr io.Writer) (*vary.Result, bool) {
	pr := startProgress(stderr, cmd, "sweeping "+vary.Describe(v))
	res, err := vary.Run(context.Background(), m, v, vary.Options{Flow: fo, Progress: func(done, total int) {
		pr.Set(fmt.Sprintf("sweeping %s: %d of %d points", vary.Describe(v), done, total))
	}})
	pr.Stop()
	if err != nil {
		fmt.Fprintf(stderr, "circa %s: --vary: %s\n", cmd, output.Printable(err.Error()))
		return nil, false
	}
	return res, true
}
