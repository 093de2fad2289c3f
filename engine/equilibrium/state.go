package equilibrium

import (
	"fmt"
	"math"
)

// gibbs returns Σ nᵢ(μ°ᵢ/RT + ln aᵢ) of pt.
func (s *system) gibbs(pt *point) float64 {
	mu := s.p.Species
	nw := pt.amt[s.solvent]
	g := nw * mu[s.solvent].Mu0
	for _, i := range s.pure {
		g += pt.amt[i] * mu[i].Mu0
	}
	for _, i := range s.aq {
		if n := pt.amt[i]; n > 0 {
			g += n * (mu[i].Mu0 + s.z2[i]*pt.gamma + math.Log(n/(nw*MolarMassWater)))
		}
	}
	if pt.gasOn && pt.ng > 0 {
		for _, i := range s.gas {
			if n := pt.amt[i]; n > 0 {
				g += n * (mu[i].Mu0 + s.lnP + math.Log(n/pt.ng))
			}
		}
	}
	return g
}

// state reports pt.
func (s *system) state(pt *point, active []string, iters int) State {
	ns := s.ns
	st := State{
		Amount:     make([]float64, ns),
		Molality:   make([]float64, ns),
		LogGamma:   make([]float64, ns),
		Partial:    make([]float64, ns),
		Active:     active,
		Iterations: iters,
	}
	nw := pt.amt[s.solvent]
	st.Amount[s.solvent] = nw
	for _, i := range s.pure {
		st.Amount[i] = math.Max(pt.amt[i], 0)
	}
	for _, i := range s.aq {
		st.Amount[i] = pt.amt[i]
		st.Molality[i] = pt.amt[i] / (nw * MolarMassWater)
		st.LogGamma[i] = s.z2[i] * pt.gamma
	}
	for _, g := range s.gas {
		st.Amount[g] = pt.amt[g]
		st.Partial[g] = math.Exp(math.Min(pt.logAmt[g]+s.lnP, expCap))
	}
	if pt.gasOn {
		st.GasMoles = pt.ng
	}
	st.IonicStrength = s.ionic(pt)
	st.G = s.gibbs(pt)
	st.Notes = s.notes(st.IonicStrength)
	return st
}

func (s *system) notes(ionic float64) []string {
	var notes []string
	if ionic > daviesINote {
		notes = append(notes, fmt.Sprintf("ionic strength %.3g mol/kg is beyond the Davies range (%.1f); activities approximate", ionic, daviesINote))
	}
	if ionic > daviesIMax {
		notes = append(notes, fmt.Sprintf("activity coefficients evaluated at %.0f mol/kg, where the Davies equation stops being meaningful", daviesIMax))
	}
	if t := s.p.TemperatureK; t < daviesTMin || t > daviesTMax {
		notes = append(notes, fmt.Sprintf("temperature %.1f K is outside 0–100 °C; the Davies constant is taken at the nearest end", t))
	}
	return notes
}
