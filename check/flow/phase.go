package flow

import "circa/lang"

// Cautions about the saturated state itself, found before any flow is
// solved: operation close to the critical point, and a liquid column tall
// enough for the fluid's saturation pressure that the evaporator inlet is
// deeply subcooled.

// NearCriticalTr is the reduced saturation temperature T/Tc from which the
// estimate warns of the critical point (circa's choice, common practice:
// latent heat and surface tension fall steeply over the last few per cent
// below Tc).
const NearCriticalTr = 0.95

// GeyserSubcool is the subcooling at an evaporator inlet, from the liquid
// column's hydrostatic pressure alone, above which the estimate warns of
// geyser boiling (circa's choice, common practice).
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
// temperature by more than GeyserSubcool: the liquid arrives subcooled by
// that much, heats without boiling, then flashes in bursts.
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
			cr.Findings = append(cr.Findings, p.finding(RuleGeyser, "warning", cr.Case, cp.name, dT, GeyserSubcool, "K", "",
				"evaporator %s in case %s: the %.2f m liquid column above its inlet raises the pressure there from %.3g kPa to %.3g kPa, where %s saturates at %.1f °C, %.1f K above the loop's %.1f °C: the liquid arrives that much subcooled and is likely to boil in bursts (geysering)",
				cp.name, cr.Case, col, s.sat.P/1e3, pin/1e3, p.info.Name, in.T-273.15, dT, s.sat.T-273.15))
		}
	}
}
