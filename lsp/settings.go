package lsp

import (
	"encoding/json"
	"fmt"
	"strconv"
	"strings"

	"circa/lang"
	"circa/units"
)

// Settings are the client's choices, sent as initializationOptions or in
// workspace/didChangeConfiguration (either at the top level or under
// "circa"). A file's own methods and limits blocks win over them.
type Settings struct {
	// VoidFraction and Friction name correlations as a methods block does
	// ("zivi", "friedel"); empty keeps the default.
	VoidFraction string `json:"voidFraction"`
	Friction     string `json:"friction"`
	// Limits overrides margin limits by field name, each a value with its
	// unit as in a limits block: {"exit_quality": "0.4", "tilt_margin": "8 deg"}.
	Limits map[string]string `json:"limits"`
	// InlayHints shows computed mass flow, exit quality and rise closure.
	InlayHints bool `json:"inlayHints"`
	// RangeHints shows, with the inlay hints, each parameter's feasible
	// range after its line (the design guidance, computed in the background).
	RangeHints bool `json:"rangeHints"`
	// MarginChecks says when to run the margin rules, whose tilt-limit
	// search costs hundreds of estimates: "auto" (when one estimate took
	// less than 10 ms), "always" or "never".
	MarginChecks string `json:"marginChecks"`
}

// DefaultSettings returns the settings before the client sends any.
func DefaultSettings() Settings { return Settings{InlayHints: true, MarginChecks: "auto"} }

// parseSettings reads a JSON settings object over base.
func parseSettings(raw []byte, base Settings) (Settings, error) {
	var probe map[string]json.RawMessage
	if err := json.Unmarshal(raw, &probe); err != nil {
		return base, fmt.Errorf("settings are not a JSON object: %v", err)
	}
	if inner, ok := probe["circa"]; ok {
		raw = inner
	}
	out := base
	if err := json.Unmarshal(raw, &out); err != nil {
		return base, fmt.Errorf("reading settings: %v", err)
	}
	if out.VoidFraction != "" && !validChoice("void_fraction", out.VoidFraction) {
		return base, fmt.Errorf("voidFraction %q is not one of %s", out.VoidFraction, strings.Join(lang.MethodChoices["void_fraction"], ", "))
	}
	if out.Friction != "" && !validChoice("friction", out.Friction) {
		return base, fmt.Errorf("friction %q is not one of %s", out.Friction, strings.Join(lang.MethodChoices["friction"], ", "))
	}
	switch out.MarginChecks {
	case "auto", "always", "never":
	default:
		return base, fmt.Errorf("marginChecks %q is not one of auto, always, never", out.MarginChecks)
	}
	for k, v := range out.Limits {
		if _, err := limitValue(k, v); err != nil {
			return base, err
		}
	}
	return out, nil
}

func validChoice(field, name string) bool {
	for _, c := range lang.MethodChoices[field] {
		if c == name {
			return true
		}
	}
	return false
}

// limitValue reads "NUMBER [UNIT]" for a limits field, in SI.
func limitValue(field, text string) (float64, error) {
	need, ok := lang.FieldNeeds[field]
	known := false
	for _, f := range lang.LimitFields {
		known = known || f == field
	}
	if !ok || !known {
		return 0, fmt.Errorf("limits: unknown field %q (known: %s)", field, strings.Join(lang.LimitFields, ", "))
	}
	text = strings.TrimSpace(text)
	num, unit, _ := strings.Cut(text, " ")
	v, err := strconv.ParseFloat(num, 64)
	if err != nil {
		return 0, fmt.Errorf("limits %s: %q is not a number with a unit", field, text)
	}
	u, err := units.Parse(strings.TrimSpace(unit))
	if err != nil {
		return 0, fmt.Errorf("limits %s: %v", field, err)
	}
	q := u.Quantity(v)
	if err := units.Check(q, u.Text, need); err != nil {
		return 0, fmt.Errorf("limits %s: %v", field, err)
	}
	return q.SI, nil
}

// apply writes the settings into a model where the files left a choice open.
func (st Settings) apply(m *lang.Model) {
	if st.VoidFraction != "" && !m.Methods.Void.Set {
		m.Methods.Void.Name = st.VoidFraction
	}
	if st.Friction != "" && !m.Methods.Friction.Set {
		m.Methods.Friction.Name = st.Friction
	}
	for k, text := range st.Limits {
		si, err := limitValue(k, text)
		if err != nil {
			continue
		}
		var v *lang.Value
		switch k {
		case "exit_quality":
			v = &m.Limits.ExitQuality
		case "chf_ratio":
			v = &m.Limits.CHFRatio
		case "flooding":
			v = &m.Limits.Flooding
		case "tilt_margin":
			v = &m.Limits.TiltMargin
		case "wall_margin":
			v = &m.Limits.WallMargin
		case "head_ratio":
			v = &m.Limits.HeadRatio
		case "saturation_max":
			v = &m.Limits.SaturationMax
		}
		if v != nil && !v.Set {
			v.SI = si
			// A limit without a default applies only when set.
			v.Set = k == "saturation_max"
		}
	}
}

func (st Settings) key() string {
	b, _ := json.Marshal(st)
	return string(b)
}
