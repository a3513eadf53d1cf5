package lsp

// wordDocs gives each statement word a one-line description for
// completion, by scope ("case:heat") where the meaning depends on it, else
// by the word alone. The wording follows docs/language.md.
var wordDocs = map[string]string{
	// Top level.
	"include": "read another .loop file: include \"parts.loop\"",
	"param":   "a named quantity: param NAME = VALUE",
	"part":    "a named set of component fields, copied with use PART",
	"loop":    "a loop (or network) with its own fluid, nodes and components",
	"case":    "an operating case: loads, sink, attitude, acceleration",
	"limits":  "design margin limits (exit quality, CHF ratio, tilt margin, …)",
	"methods": "correlation choices for the estimates",
	// Loop.
	"node":            "a point of the loop: node NAME [at (X, Y, Z) UNIT]",
	"junction":        "a node where branches split or merge: junction NAME [at (X, Y, Z) UNIT]",
	"pipe":            "an unheated tube: pipe NAME from NODE to NODE { … }",
	"evaporator":      "the heated section: evaporator NAME from NODE to NODE { … }",
	"condenser":       "the cooled section: condenser NAME from NODE to NODE { … }",
	"bend":            "a bend (zero length by default): bend NAME from NODE to NODE { … }",
	"fitting":         "a valve or fitting (zero length by default): fitting NAME from NODE to NODE { … }",
	"reservoir":       "a sump or accumulator holding liquid: reservoir NAME at NODE { volume Q }",
	"fluid":           "working fluid: a built-in name, or table \"FILE.csv\"",
	"charge":          "fill charge of working fluid (mass)",
	"design_pressure": "the loop's pressure rating (absolute or gauge)",
	"loop:saturation": "fix the saturation temperature instead of solving the condenser balance",
	// Components.
	"use":                  "copy a part's fields; fields written here win",
	"length":               "tube length along the flow",
	"rise":                 "signed elevation gain from inlet to outlet (negative: downhill)",
	"run":                  "inlet-to-outlet displacement (X, Y, Z) UNIT, instead of rise or coordinates",
	"bore":                 "inner diameter of a round tube",
	"flow_area":            "flow area of a non-round passage (with hydraulic_diameter)",
	"hydraulic_diameter":   "4 × flow area / wetted perimeter",
	"roughness":            "absolute wall roughness (default 1.5 µm)",
	"loss":                 "local loss coefficient K on the outlet velocity head",
	"channels":             "identical channels in parallel (default 1)",
	"heat":                 "evaporator heat load when a case gives none",
	"heated_length":        "heated part of the evaporator's length (default: all)",
	"wetted_area":          "boiling surface area, for the wall heat flux",
	"heat_flux":            "wall heat flux at the design load, instead of wetted_area",
	"wall_limit":           "highest allowed wall (device) temperature",
	"roughness_boiling":    "surface roughness for the boiling coefficient (default 1 µm)",
	"junction_to_case":     "the device's junction-to-case thermal resistance (K/W)",
	"interface_resistance": "thermal resistance of the interface between device case and plate",
	"spreading_resistance": "the plate's spreading resistance from the device to the boiling wall",
	"junction_limit":       "highest allowed device junction temperature",
	"conductance":          "overall conductance UA from the condensing fluid to the sink",
	"tubes":                "without conductance: parallel condensing tubes (default 1)",
	"coolant_htc":          "without conductance: coolant-side heat transfer coefficient",
	"sink":                 "sink (coolant) temperature when a case gives none",
	"outlet":               "fixed outlet (saturation) temperature instead of a conductance",
	"subcool":              "liquid subcooling at the condenser outlet (default 0 K)",
	"volume":               "liquid volume the reservoir holds",
	// Cases.
	"case:heat":        "heat load on one evaporator: heat EVAPORATOR Q",
	"case:sink":        "sink temperature: sink Q, or sink CONDENSER Q",
	"case:conductance": "one condenser's conductance in this case: conductance CONDENSER Q",
	"pitch":            "nose-up rotation about the lateral (y) axis",
	"roll":             "left-side-up rotation about the forward (x) axis",
	"yaw":              "rotation about the vertical (z) axis",
	"accel":            "steady acceleration of the equipment frame (AX, AY, AZ) UNIT",
	"case:saturation":  "fix the saturation temperature in this case",
	"profile":          "attitude and acceleration against time: a block of rows, or a CSV file \"FILE.csv\"",
	"envelope":         "bounds to search for the worst attitude and acceleration: { pitch LOW HIGH … }",
	// Profiles and envelopes.
	"profile:columns": "the profile's columns, time first: columns time pitch roll accel_x accel_y accel_z",
	"profile:row":     "one instant: its time, then one value per column: row 2 s -3 deg 0.1 gn",
	"envelope:pitch":  "pitch bounds: pitch LOW HIGH, or pitch HALF for ±HALF",
	"envelope:roll":   "roll bounds: roll LOW HIGH, or roll HALF for ±HALF",
	"accel_x":         "forward acceleration bounds: accel_x LOW HIGH, or accel_x HALF",
	"accel_y":         "lateral (leftward) acceleration bounds: accel_y LOW HIGH, or accel_y HALF",
	"accel_z":         "upward acceleration bounds: accel_z LOW HIGH, or accel_z HALF",
	// Limits.
	"exit_quality":   "highest evaporator exit quality (default 0.5, common practice)",
	"chf_ratio":      "least ratio of critical to wall heat flux (default 2, common practice)",
	"flooding":       "highest share of the flooding limit (default 0.7, common practice)",
	"tilt_margin":    "least angle from an attitude where circulation stops (default 5°)",
	"wall_margin":    "temperature difference kept below wall_limit (default 0 K)",
	"head_ratio":     "factor on the losses the design must still tolerate (default 1.5)",
	"saturation_max": "highest allowed saturation temperature",
	// Methods.
	"void_fraction":    "void-fraction correlation",
	"friction":         "two-phase friction correlation",
	"single_phase":     "single-phase friction factor",
	"chf":              "critical heat flux correlation",
	"saturation_state": "auto (local pressure where the liquid column shifts saturation by more than 5 K, else single), single saturated state per loop and case, or local pressure around the loop or through the network",
	"condensation":     "in-tube condensation coefficient of condensers given by geometry",
	"cells":            "cells per heated component in the quality march (4 to 10000)",
}

// wordDoc returns the description of a statement word in a scope.
func wordDoc(scope, word string) string {
	if d, ok := wordDocs[scope+":"+word]; ok {
		return d
	}
	return wordDocs[word]
}
