package units

import (
	"errors"
	"fmt"
	"math"
)

// Quantity is a value in SI with its dimension. AbsTemp marks an absolute
// temperature written on an offset scale (degC, degF) or derived from one; a
// plain K value may serve as an absolute temperature or a difference.
type Quantity struct {
	SI      float64
	Dim     Dim
	AbsTemp bool
}

func finite(f float64) bool { return !math.IsInf(f, 0) && !math.IsNaN(f) }

func result(q Quantity) (Quantity, error) {
	if !finite(q.SI) {
		return Quantity{}, errors.New("result is out of range")
	}
	return q, nil
}

func operands(a, b Quantity) error {
	if !finite(a.SI) || !finite(b.SI) {
		return errors.New("operand is not a finite number")
	}
	return nil
}

// Add returns a+b. Both must have the same dimension. Adding two absolute
// temperatures is an error; an absolute temperature plus a difference is an
// absolute temperature.
func Add(a, b Quantity) (Quantity, error) {
	if err := operands(a, b); err != nil {
		return Quantity{}, err
	}
	if a.Dim != b.Dim {
		return Quantity{}, fmt.Errorf("cannot add %s and %s", Name(a.Dim), Name(b.Dim))
	}
	if a.AbsTemp && b.AbsTemp {
		return Quantity{}, errors.New("cannot add two absolute temperatures; subtract them for a difference, or write one in K or degC_diff")
	}
	return result(Quantity{SI: a.SI + b.SI, Dim: a.Dim, AbsTemp: a.AbsTemp || b.AbsTemp})
}

// Sub returns a-b. The difference of two absolute temperatures is a
// temperature difference; an absolute temperature minus a difference is
// absolute; a difference minus an absolute temperature is an error.
func Sub(a, b Quantity) (Quantity, error) {
	if err := operands(a, b); err != nil {
		return Quantity{}, err
	}
	if a.Dim != b.Dim {
		return Quantity{}, fmt.Errorf("cannot subtract %s from %s", Name(b.Dim), Name(a.Dim))
	}
	if b.AbsTemp && !a.AbsTemp {
		return Quantity{}, errors.New("cannot subtract an absolute temperature from a temperature difference")
	}
	return result(Quantity{SI: a.SI - b.SI, Dim: a.Dim, AbsTemp: a.AbsTemp && !b.AbsTemp})
}

func combineDims(a, b Dim, sign int) (Dim, error) {
	x := dimAcc(a.exps()).add(dimAcc(b.exps()), sign)
	if !x.fits(127) {
		return Dim{}, errors.New("dimension exponent out of range")
	}
	return dimFromExps(x), nil
}

// absTempFactor refuses an absolute temperature on an offset scale as a
// factor of anything but a pure number: 20 degC times 2 m means nothing
// without choosing K, so the writer must say so.
func absTempFactor(a, b Quantity) error {
	if (a.AbsTemp && !b.Dim.IsZero()) || (b.AbsTemp && !a.Dim.IsZero()) {
		return errors.New("an absolute temperature on an offset scale (degC, degF) cannot be multiplied or divided by a dimensional quantity; write it in K")
	}
	return nil
}

// Mul returns a*b. An absolute temperature may only be scaled by a
// dimensionless number.
func Mul(a, b Quantity) (Quantity, error) {
	if err := operands(a, b); err != nil {
		return Quantity{}, err
	}
	if err := absTempFactor(a, b); err != nil {
		return Quantity{}, err
	}
	d, err := combineDims(a.Dim, b.Dim, 1)
	if err != nil {
		return Quantity{}, err
	}
	return result(Quantity{SI: a.SI * b.SI, Dim: d, AbsTemp: a.AbsTemp || b.AbsTemp})
}

// Div returns a/b. Division by zero is an error.
func Div(a, b Quantity) (Quantity, error) {
	if err := operands(a, b); err != nil {
		return Quantity{}, err
	}
	if err := absTempFactor(a, b); err != nil {
		return Quantity{}, err
	}
	if b.SI == 0 {
		return Quantity{}, errors.New("division by zero")
	}
	d, err := combineDims(a.Dim, b.Dim, -1)
	if err != nil {
		return Quantity{}, err
	}
	return result(Quantity{SI: a.SI / b.SI, Dim: d, AbsTemp: a.AbsTemp || b.AbsTemp})
}

// Pow returns a to the power n. An absolute temperature on an offset scale
// cannot be raised to a power other than 1.
func Pow(a Quantity, n int) (Quantity, error) {
	if !finite(a.SI) {
		return Quantity{}, errors.New("operand is not a finite number")
	}
	if a.AbsTemp && n != 1 {
		return Quantity{}, errors.New("an absolute temperature on an offset scale (degC, degF) cannot be raised to a power; write it in K")
	}
	if n < -127 || n > 127 {
		return Quantity{}, errors.New("power out of range")
	}
	x := dimAcc(a.Dim.exps()).scale(n)
	if !x.fits(127) {
		return Quantity{}, errors.New("dimension exponent out of range")
	}
	if a.SI == 0 && n < 0 {
		return Quantity{}, errors.New("division by zero")
	}
	return result(Quantity{SI: math.Pow(a.SI, float64(n)), Dim: dimFromExps(x), AbsTemp: a.AbsTemp})
}

// Neg returns -a.
func Neg(a Quantity) Quantity {
	a.SI = -a.SI
	return a
}

// Need is what a field requires of a quantity: a dimension, and for a
// temperature whether it is a difference.
type Need struct {
	Dim        Dim
	Difference bool // a temperature difference: an absolute temperature on an offset scale will not do
}

// describe names what a quantity is, for messages.
func describe(q Quantity) string {
	if q.AbsTemp && q.Dim == Temperature {
		return "an absolute temperature"
	}
	return Name(q.Dim)
}

func needName(n Need) string {
	if n.Difference && n.Dim == Temperature {
		return "a temperature difference"
	}
	return Name(n.Dim)
}

// Check reports whether q suits a field that needs need; u is the unit text
// as written, quoted in the message: "expected a length, found a pressure
// (bar)".
func Check(q Quantity, u string, need Need) error {
	if !finite(q.SI) {
		return errors.New("value is not a finite number")
	}
	// What was found is only spelt out for a message: a value that fits
	// costs no allocation.
	found := func() string {
		if u == "" {
			return describe(q)
		}
		return describe(q) + " (" + u + ")"
	}
	if q.Dim != need.Dim {
		msg := fmt.Sprintf("expected %s, found %s", needName(need), found())
		if u == "" && q.Dim.IsZero() {
			if c := Common(need.Dim); len(c) > 0 && c[0].Text != "" {
				msg += "; add a unit such as " + c[0].Text
			}
		}
		return errors.New(msg)
	}
	if !need.Difference && need.Dim == Temperature && !q.AbsTemp {
		// A value written in a difference-only unit cannot be an absolute
		// temperature: "sink 20 degC_diff" means nothing.
		if uu, err := Parse(u); err == nil && (uu.Text == "degC_diff" || uu.Text == "degF_diff") {
			return fmt.Errorf("expected an absolute temperature, found a temperature difference (%s); write K, degC or degF", u)
		}
	}
	if need.Difference && need.Dim == Temperature && q.AbsTemp {
		alt := "degC_diff"
		if uu, err := Parse(u); err == nil && uu.Text == "degF" {
			alt = "degF_diff"
		}
		return fmt.Errorf("expected a temperature difference, found %s; write K or %s", found(), alt)
	}
	return nil
}
