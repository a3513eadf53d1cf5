// Package picture draws a loop's estimates as figures: the circulation
// curve (mass flow and exit quality against heat load), the pressure budget
// of a case, the tilt envelope and the loop's geometry seen from the side
// and the front.
//
// Each figure comes in two steps: a function that computes the data series
// from the estimator (plain structs, so tests and other front ends can use
// the numbers) and a method that draws them. Figures render to SVG or PNG.
package picture
