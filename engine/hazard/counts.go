package hazard

import "mixward/engine"

// withCounts adds the gases a hazard counts by amount (engine.GasCount) to
// it; fillCounts completes their figures once the hazards are judged.
func withCounts(h engine.Hazard, cs ...engine.GasCount) engine.Hazard {
	h.Counts = append(h.Counts, cs...)
	return h
}

// beyondCount is a gas that a reaction the equilibrium state does not run
// gives off: up to mol of formula, from what gives it.
func beyondCount(formula, name string, mol float64, from string) engine.GasCount {
	return engine.GasCount{Formula: formula, Name: name, Mol: mol, Beyond: true, From: from}
}

// fillCounts completes each hazard's gas counts from the outcome and the
// gas table: the volume of the gas, the equilibrium headspace figure the
// mixed state gives for it, and its limit (the gas table's, unless the
// family named its own) with the ratio.
func fillCounts(o *Outcome, d *Data, hs []engine.Hazard) {
	for i := range hs {
		for j := range hs[i].Counts {
			c := &hs[i].Counts[j]
			if !c.InLiquid {
				c.VolumeL = sig(c.Mol * litreBarPerMolK() * o.TemperatureK() / (o.PressureKPa / 100))
			}
			c.Mol = sig(c.Mol)
			if c.Formula == "CO2" {
				// An asphyxiant judged by its amount over a room
				// (judgeGas), not by the closed headspace: the amount
				// is its figure.
				continue
			}
			if m, ok := o.Measured[c.Formula]; ok && m.PPM > 0 {
				c.HeadspacePPM = sig(min(m.PPM, 1e6))
			}
			if g, ok := d.Gases[c.Formula]; ok && c.LimitName == "" {
				c.LimitName, c.LimitPPM, c.LimitSource = g.LimitName, g.LimitPPM, g.LimitSource
			}
			if c.LimitPPM > 0 && c.HeadspacePPM > 0 {
				c.Ratio = sig(c.HeadspacePPM / c.LimitPPM)
			}
		}
	}
}
