package flow

import (
	"fmt"
	"math"

	"circa/lang"
	"circa/units"
)

// Cautions about the saturated state itself, found before any flow is
// solved: operation close to the critical point, and a liquid column tall
// enough for the fluid's saturation pressure that the evaporator inlet is
// deeply subcooled.

// NearCriticalTr is the reduced saturation temperature T/Tc from which the
// estimate warns of the critical point (circa's choice, common practice:
// latent heat and surface tension fall steeply over the last few per cent
// below Tc).
const NearCriticalTr = 0.95

// GeyserSubcool is the rise of the saturation temperature at an evaporator
// inlet by the static head of the liquid column at rest above which the
// estimate warns of geyser boiling (circa's choice, common practice).
const GeyserSubcool = 5.0 // K

func (p *prepared) phaseCautions(s *state, cr *CaseResult) {
	if tc := p.info.Tc; tc > 0 && s.sat.T >= NearCriticalTr*tc && s.sat.T < tc {
		cr.Findings = append(cr.Findings, p.finding(RuleNearCritical, "warning", cr.Case, "", s.sat.T, tc, "K", "",
			"saturation temperature %.1f °C in case %s is only %.1f K below the critical temperature of %s (%.1f °C; T/Tc = %.3f): latent heat %.0f kJ/kg and surface tension %.2f mN/m fall to zero there, and with them the evaporator's capacity and its critical heat flux",
			s.sat.T-273.15, cr.Case, tc-s.sat.T, p.info.Name, tc-273.15, s.sat.T/tc, s.sat.Hlv/1e3, s.sat.Sigma*1e3))
	}
	p.geyser(s, cr)
}

// geyser reports evaporators whose inlet lies so far below the condensers'
// outlets that the liquid column's weight raises the local saturation
// temperature by more than GeyserSubcool. The criterion takes the column at
// rest, its static head alone: geysering is a low-flow cycle whose liquid
// waits, nearly still, between bursts, and the liquid heated to boiling at
// the inlet is superheated by that shift against the saturation
// temperature at the condenser's level, so it flashes as it rises. The
// losses of the circulating estimate and the condenser's subcooling do not
// enter it; geyserFlowing adds the inlet state at the estimated flow to the
// message so that both are read side by side.
func (p *prepared) geyser(s *state, cr *CaseResult) {
	height, top, ok := p.columnTop(s)
	if !ok {
		return
	}
	for _, cp := range s.net.comps {
		if cp.kind != lang.Evaporator {
			continue
		}
		h, k := height(cp.c.From)
		if !k || top-h <= 0 {
			continue
		}
		col := top - h
		pin := s.sat.P + s.p.RhoL*s.bmag*col
		in, err := p.fl.AtP(pin)
		if err != nil {
			continue
		}
		if dT := in.T - s.sat.T; dT > GeyserSubcool {
			d := kPaDecimals(pin)
			cr.Findings = append(cr.Findings, p.finding(RuleGeyser, "warning", cr.Case, cp.name, dT, GeyserSubcool, "K", "",
				"evaporator %s in case %s: at rest, the static head of the %.2f m liquid column above its inlet raises the pressure there from %.*f kPa at the condenser outlet to %.*f kPa, where %s saturates at %.2f °C, %.2f K above the loop's saturation temperature (the geysering criterion: the head alone, no flow losses or condenser subcooling): liquid heated to boiling there is that much superheated against the saturation at the condenser's level and is likely to boil in bursts (geysering)",
				cp.name, cr.Case, col, d, s.sat.P/1e3, d, pin/1e3, p.info.Name, in.T-273.15, dT))
		}
	}
}

// geyserFlowing completes each geyser-risk finding of a circulating single
// loop with its evaporator's inlet at the estimated flow, as the
// local-saturation table (or the single state's note) gives it: lower in
// pressure than at rest by the losses on the way, and subcooled by the
// condenser's subcooling besides.
func geyserFlowing(cr *CaseResult) {
	// The table prints every pressure to the decimals of its largest.
	top := 0.0
	for _, cs := range cr.Components {
		if cs.Local != nil {
			top = math.Max(top, cs.Local.PressureIn)
		}
	}
	for i := range cr.Findings {
		f := &cr.Findings[i]
		if f.Rule != RuleGeyser {
			continue
		}
		for _, cs := range cr.Components {
			if cs.Component != f.Component || cs.Local == nil {
				continue
			}
			l := cs.Local
			f.Message += fmt.Sprintf("; circulating at %.2f g/s, the losses on the way leave the inlet at %.*f kPa (saturation %.2f °C), where the liquid arrives %.2f K subcooled",
				math.Abs(cs.MassFlow)*1e3, kPaDecimals(top), l.PressureIn/1e3, l.SatTempIn-273.15, l.SubcoolingIn)
		}
	}
}

// kPaDecimals is the number of decimals that gives a pressure four
// significant figures in kPa, as the local-saturation table prints it.
func kPaDecimals(pa float64) int {
	a := math.Abs(pa / 1e3)
	if !(a > 0) || math.IsInf(a, 0) {
		return 3
	}
	return units.SigDecimals(a, 4)
}
