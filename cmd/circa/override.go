package main

import (
	"fmt"
	"io"
	"strings"

	"circa/check/output"
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
		return err
	}
	*s = append(*s, o)
	return nil
}

// apply resolves m again with the parameters set. A parameter the file
// does not declare, or a value of the wrong dimension, is printed as a
// usage error and ok is false.
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
