package flow

import "circa/lang"

// Result is the estimate for every loop of a model. All quantities are SI
// (kg/s, kg/(m²s), Pa, K, W, m/s, kg, radians for angles) unless a field
// says otherwise. The layout is documented in docs/estimate-json.md and is
// kept stable.
type Result struct {
	// Cautions are printed with every estimate.
	Cautions []string     `json:"cautions"`
	Loops    []LoopResult `json:"loops"`
	// Findings that concern the whole model (an unknown case name).
	Findings []Finding `json:"findings,omitempty"`
	// Set lists the parameters given other values than their files' for
	// this estimate (circa estimate --set): the estimate is a variant's.
	Set []ParamSet `json:"set,omitempty"`
}

// LoopOf returns the estimate of loop l of m, the model r was computed for
// (nil when r is nil or does not hold that loop).
func (r *Result) LoopOf(m *lang.Model, l *lang.Loop) *LoopResult {
	if r == nil || m == nil {
		return nil
	}
	for i, ml := range m.Loops {
		if ml == l && i < len(r.Loops) && r.Loops[i].Loop == l.Name {
			return &r.Loops[i]
		}
	}
	return nil
}

// LoopResult is the estimate for one loop in every case.
type LoopResult struct {
	Loop        string       `json:"loop"`
	Fluid       string       `json:"fluid"`
	Safety      string       `json:"safety_class,omitempty"`
	Network     bool         `json:"network"` // parallel branches between junctions
	Methods     MethodsUsed  `json:"methods"`
	Assumptions []string     `json:"assumptions"`
	Cases       []CaseResult `json:"cases"`
	// Worst lists, for each margin, the case that comes closest to its limit.
	Worst []Margin `json:"worst"`
	// DesignPressureUnit is the unit the design pressure was written in
	// ("bar(g)"), so that it can be shown as written; values stay absolute.
	DesignPressureUnit string `json:"design_pressure_unit,omitempty"`
	// ChargeRange is the fill charge against the range every case accepts,
	// when the loop states a charge.
	ChargeRange *ChargeRange `json:"charge_range,omitempty"`
	// TiltLimits are the attitude limits of the nominal case, when searched.
	Findings []Finding `json:"findings,omitempty"`
}

// MethodsUsed names the correlations of the estimate (names as written in
// loop files).
type MethodsUsed struct {
	Void        string `json:"void_fraction"`
	Friction    string `json:"friction"`
	SinglePhase string `json:"single_phase"`
	CHF         string `json:"chf"`
	Saturation  string `json:"saturation"` // "single": one state per case; "local": at each cell's pressure; "auto": local where the liquid column shifts saturation by more than AutoLocalShift
	// Condensation is the in-tube coefficient of condensers given by
	// geometry: "film" (Nusselt 1916, Chato 1962), or one of the
	// forced-convection correlations "shah" (Shah 1979), "boyko_kruzhilin"
	// (Boyko & Kruzhilin 1967), "akers_deans_crosser" (Akers, Deans &
	// Crosser 1959), "cavallini_smith_zecchin" (Cavallini, Smith & Zecchin
	// 1974).
	Condensation string `json:"condensation"`
	Cells        int    `json:"cells"`
}

// CaseResult is the operating point of one loop in one case.
type CaseResult struct {
	Case string `json:"case"`
	// Grid is set for points of an attitude/acceleration sweep derived from
	// the case.
	Grid      bool       `json:"grid,omitempty"`
	Yaw       float64    `json:"yaw"`
	Pitch     float64    `json:"pitch"`
	Roll      float64    `json:"roll"`
	Accel     [3]float64 `json:"accel"`
	BodyForce [3]float64 `json:"body_force"` // m/s², equipment frame
	Heat      float64    `json:"heat"`       // total evaporator load, W

	SatTemperature float64 `json:"saturation_temperature"` // K
	SatPressure    float64 `json:"saturation_pressure"`    // Pa, absolute
	SatSource      string  `json:"saturation_source"`      // "case", "loop", "condenser outlet", "condenser balance"
	// SatState is the saturation state the case was estimated with:
	// "single" or "local" (with saturation_state auto, as its liquid
	// column decided; see ColumnShift).
	SatState string `json:"saturation_state,omitempty"`
	// ColumnShift is how far the weight of the tallest liquid column, from
	// the highest condenser outlet down to an evaporator inlet, raises the
	// saturation temperature there, K: what saturation_state auto decides
	// by.
	ColumnShift float64 `json:"column_shift,omitempty"`

	Circulates bool    `json:"circulates"`
	Reason     string  `json:"reason,omitempty"` // why not, when it does not
	MassFlow   float64 `json:"mass_flow"`        // single loop: the loop flow; network: the flow through the condensers
	Roots      []Root  `json:"roots,omitempty"`  // single loop: every balance found on the flow grid
	Iterations int     `json:"iterations,omitempty"`

	// Overrides lists the component values this case replaces (a heat, a
	// sink, a conductance), with the component's own.
	Overrides  []Override       `json:"overrides,omitempty"`
	Components []ComponentState `json:"components,omitempty"`
	Totals     Totals           `json:"totals"`
	Margins    []Margin         `json:"margins,omitempty"`
	// ChargeRange is the fill charge against the range this case accepts.
	ChargeRange *ChargeRange `json:"charge_range,omitempty"`
	Tilt        *TiltLimits  `json:"tilt,omitempty"`
	// Stability holds the static and dynamic stability indicators at the
	// operating point.
	Stability *Stability `json:"stability,omitempty"`
	// Profile is the case's manoeuvre, each instant estimated as a steady
	// state, when the case gives one.
	Profile *Profile `json:"profile,omitempty"`
	// Envelope is the worst attitude and acceleration within the case's
	// envelope, when it gives one.
	Envelope *Envelope `json:"envelope,omitempty"`
	Findings []Finding `json:"findings,omitempty"`

	pointCase *lang.Case
}

// Override is a component's value that a case gives in place of the
// component's own.
type Override struct {
	Component string  `json:"component"`
	Field     string  `json:"field"` // "heat" (W), "sink" (K) or "conductance" (W/K)
	Value     float64 `json:"value"` // in this case, SI
	// Own is the component's own value (SI), absent when it has none (a
	// condenser given by its geometry has no conductance of its own).
	Own *float64 `json:"own,omitempty"`
}

// Root is one balance of a single loop's excess head.
type Root struct {
	MassFlow float64 `json:"mass_flow"`
	Slope    float64 `json:"slope"`  // dE/dṁ, Pa/(kg/s)
	Stable   bool    `json:"stable"` // dE/dṁ < 0
}

// ComponentState is one component at the operating point.
type ComponentState struct {
	Component string  `json:"component"`
	Kind      string  `json:"kind"`
	MassFlow  float64 `json:"mass_flow"` // along the declared direction; negative is reverse flow
	MassFlux  float64 `json:"mass_flux"`
	Heat      float64 `json:"heat"` // added (evaporators, positive) or removed (condensers, negative), W
	XIn       float64 `json:"quality_in"`
	XOut      float64 `json:"quality_out"` // below 0: subcooled liquid; above 1: dry
	VoidOut   float64 `json:"void_out"`
	VoidMean  float64 `json:"void_mean"`
	// Phase velocities at the outlet, m/s (zero for an absent phase).
	VelLiquid float64 `json:"velocity_liquid"`
	VelVapour float64 `json:"velocity_vapour"`
	// Pressure changes along the flow, Pa: friction, local and acceleration
	// losses (positive reduce the pressure) and the gravity gain.
	DpFriction float64 `json:"dp_friction"`
	DpLocal    float64 `json:"dp_local"`
	DpAccel    float64 `json:"dp_acceleration"`
	DpGravity  float64 `json:"dp_gravity"`
	DpTotal    float64 `json:"dp_total"` // p_in − p_out
	// Budget is the same pressure change with every term a drop, and the
	// acceleration split into its phase-change and flow-area parts.
	Budget Budget  `json:"budget"`
	Mass   float64 `json:"mass"` // fluid held, kg
	// Local saturation along a single loop (omitted for networks), in either
	// saturation state: the pressure marched from the condenser outlet (at
	// the case's saturation pressure), the saturation temperature there,
	// and the quality that the enthalpy has at the local saturation state.
	// With saturation_state local these qualities are quality_in/out too.
	Local *LocalState `json:"local,omitempty"`
	// Junction is the device on an evaporator that gives its thermal stack.
	Junction *Junction `json:"junction,omitempty"`
}

// Junction is a device's temperatures above an evaporator's boiling wall,
// K, with its heat through the series stack junction → case → interface →
// spreading → wall.
type Junction struct {
	Wall       float64 `json:"wall"`       // boiling wall
	Case       float64 `json:"case"`       // device case (below junction_to_case)
	Junction   float64 `json:"junction"`   // junction
	Resistance float64 `json:"resistance"` // junction to wall, K/W
}

// LocalState is a component's state at its local saturation.
type LocalState struct {
	PressureIn float64 `json:"pressure_in"`               // Pa, absolute
	SatTempIn  float64 `json:"saturation_temperature_in"` // K, at pressure_in
	SatTempOut float64 `json:"saturation_temperature_out"`
	XIn        float64 `json:"quality_in"`
	XOut       float64 `json:"quality_out"`
	// Evaporators: the inlet liquid's subcooling below its local saturation
	// temperature (K), and where boiling starts, m from the inlet along the
	// flow (absent when the inlet is already two-phase or boiling never
	// starts inside).
	SubcoolingIn float64  `json:"subcooling_in,omitempty"`
	BoilingOnset *float64 `json:"boiling_onset,omitempty"`
}

// Budget splits a pressure drop along the flow, p_in − p_out in Pa, by
// cause. Every term is a drop (positive: the pressure falls along the
// flow), so the terms add up to Total, and around a loop the totals add up
// to zero.
type Budget struct {
	Friction float64 `json:"friction"`
	// Gravity is the hydrostatic drop −∫ρ_m b·ŝ ds: positive going up
	// against the body force.
	Gravity float64 `json:"gravity"`
	// Acceleration is the change of momentum flux inside the component,
	// from evaporation or condensation.
	Acceleration float64 `json:"acceleration"`
	// AreaChange is the step of momentum flux from the previous component's
	// outlet to this one's inlet at the same quality: a change of flow area
	// (and of the void fraction where the two lie at different inclinations).
	AreaChange float64 `json:"area_change"`
	Local      float64 `json:"local"`
	Total      float64 `json:"total"`
}

// Totals sums the loop at the operating point.
type Totals struct {
	Heat      float64 `json:"heat"`     // W added
	Rejected  float64 `json:"rejected"` // W removed by the condensers
	EnergyGap float64 `json:"energy_closure"`
	MassGap   float64 `json:"mass_closure"` // largest junction imbalance over the flow
	Friction  float64 `json:"dp_friction"`
	Local     float64 `json:"dp_local"`
	Accel     float64 `json:"dp_acceleration"`
	Gravity   float64 `json:"dp_gravity"` // net gravity head at the operating point
	// Budget sums the components' budgets, each weighted by its share of
	// the loop flow as the other sums are; its Total is zero at a solution.
	Budget     Budget  `json:"budget"`
	HeadMax    float64 `json:"head_available"`   // gravity head at vanishing flow
	Inventory  float64 `json:"inventory"`        // fluid in the flow path at the operating point, kg
	Reservoirs float64 `json:"reservoir_liquid"` // reservoirs full of liquid, kg
	// Transit is the time the fluid takes round a single loop, s: each
	// component's mass over the loop flow, summed (absent for networks). A
	// change of attitude or acceleration faster than this is beyond a
	// quasi-static estimate.
	Transit float64 `json:"transit_time,omitempty"`
}

// Margin is one design margin in one case. Use is the fraction of the limit
// used: 1 or more means the limit is reached.
type Margin struct {
	Margin string `json:"margin"`
	Case   string `json:"case,omitempty"`
	// Point names the sweep point ("pitch 20°, roll 0°") when the margin
	// comes from one, in a loop's worst margins.
	Point     string  `json:"point,omitempty"`
	Component string  `json:"component,omitempty"`
	Value     float64 `json:"value"`
	Limit     float64 `json:"limit"`
	Unit      string  `json:"unit"`
	Use       float64 `json:"use"`
	Status    string  `json:"status"` // "ok", "warning", "error"
	// Time is the instant of the case's profile the margin comes from, s.
	Time *float64 `json:"time,omitempty"`
	// LimitField says where a condenser margin's saturation limit comes
	// from: "saturation_max" (the limits block) or LimitFluidRange (the
	// top of the fluid's range, for want of a lower saturation_max).
	LimitField string `json:"limit_field,omitempty"`
}

// ChargeRange is the range of fill charge, kg, that raises no charge
// warning: below Low the deficit empties more than ChargeLevelWarn of the
// liquid lines, above High the surplus floods more than ChargeFloodWarn of
// the condensers (or leaves no room for vapour). For a loop it is the
// range every case accepts, with the cases that set its ends; Low above
// High means no charge suits every case.
type ChargeRange struct {
	Charge   float64 `json:"charge"`
	Low      float64 `json:"low"`
	High     float64 `json:"high"`
	LowCase  string  `json:"low_case,omitempty"`
	HighCase string  `json:"high_case,omitempty"`
	// LowPoint and HighPoint name the sweep point that sets an end, when
	// one does.
	LowPoint  string `json:"low_point,omitempty"`
	HighPoint string `json:"high_point,omitempty"`
	// HighBy says what sets the high end: ChargeByCondenser,
	// ChargeByReservoir or ChargeByFull.
	HighBy string `json:"high_by,omitempty"`
}

// What sets the high end of a charge range.
const (
	// ChargeByCondenser: the surplus floods the condensers.
	ChargeByCondenser = "condenser"
	// ChargeByReservoir: the reservoirs are full and the surplus floods the
	// condensers.
	ChargeByReservoir = "reservoir"
	// ChargeByFull: the liquid fills the whole loop, leaving no room for
	// vapour.
	ChargeByFull = "full"
)

// TiltLimits are the attitudes, from the case's own, at which circulation
// stops. A nil limit means none within half a turn.
type TiltLimits struct {
	PitchUp   *float64 `json:"pitch_up,omitempty"`
	PitchDown *float64 `json:"pitch_down,omitempty"`
	RollLeft  *float64 `json:"roll_left,omitempty"`
	RollRight *float64 `json:"roll_right,omitempty"`
	Margin    float64  `json:"margin"` // smallest angle from the case to a limit, rad (π when none)
}

// Finding is one margin or estimate finding, with the case, the component,
// the value and the limit it is checked against.
type Finding struct {
	Rule      string  `json:"rule"`
	Severity  string  `json:"severity"` // "error", "warning", "info"
	Loop      string  `json:"loop,omitempty"`
	Case      string  `json:"case,omitempty"`
	Component string  `json:"component,omitempty"`
	Value     float64 `json:"value"`
	Limit     float64 `json:"limit"`
	Unit      string  `json:"unit,omitempty"`
	// Limit field, when the limit comes from the limits block
	// ("exit_quality", …) or from a component field ("wall_limit").
	LimitField string `json:"limit_field,omitempty"`
	Message    string `json:"message"`
	// Time is the instant of the case's profile the finding comes from, s.
	Time *float64 `json:"time,omitempty"`
	// Correlation names the correlation a correlation-range finding is
	// about ("Shah (1979)").
	Correlation string `json:"correlation,omitempty"`
}

// Rule identifiers of the findings.
const (
	RuleGeometry        = "estimate-geometry"
	RuleTooLarge        = "estimate-too-large"
	RuleFluidRange      = "fluid-range"
	RuleNoSink          = "estimate-no-sink"
	RuleNoCirculation   = "no-circulation"
	RuleUnstable        = "ledinegg-unstable"
	RuleConverge        = "network-not-converged"
	RuleReverse         = "reverse-flow"
	RuleExitQuality     = "margin-exit-quality"
	RuleDryout          = "margin-dryout"
	RuleCHF             = "margin-chf"
	RuleFlooding        = "margin-flooding"
	RuleWall            = "margin-wall-temperature"
	RuleJunction        = "margin-junction-temperature"
	RulePressure        = "margin-design-pressure"
	RuleCondenser       = "margin-condenser"
	RuleCharge          = "margin-charge"
	RuleHead            = "margin-loss-reserve"
	RuleTilt            = "margin-tilt"
	RuleFluidSafety     = "fluid-safety"
	RuleEnergyClosure   = "estimate-energy-closure"
	RuleUnknownCase     = "estimate-unknown-case"
	RuleNegativeHeat    = "estimate-negative-heat"
	RuleMethod          = "estimate-method"
	RuleFluidUnknown    = "estimate-fluid"
	RuleNoCondenser     = "estimate-no-condenser"
	RuleSuperheatCells  = "margin-superheat"
	RuleNonFinite       = "estimate-non-finite"
	RuleNearCritical    = "near-critical"
	RuleGeyser          = "geyser-risk"
	RuleDensityWave     = "density-wave-risk"
	RuleMaldistribution = "parallel-maldistribution"
	RuleManoeuvre       = "manoeuvre-quasi-static"
	// RuleCorrelationRange: a correlation applied outside the range of
	// inputs its source states.
	RuleCorrelationRange = "correlation-range"
)

// Cautions printed with every estimate.
var Cautions = []string{
	"Estimates for early design only: a steady, one-dimensional, quasi-static model with the stated correlations; confirm by test.",
	"Pressure findings compare the saturation pressure with the stated rating only; pressure equipment must satisfy local pressure-equipment codes and be approved by licensed engineers.",
	"Flammable or toxic working fluids (ASHRAE 34 / ISO 817 safety classes other than A1) must follow local codes for charge limits, ventilation and detection.",
	"Evaporator walls, device cases, vapour lines and condensers run near the estimated wall, junction and saturation temperatures: guard or insulate hot surfaces people can touch as local codes require.",
}
