package engine

import (
	"fmt"

	"mixward/engine/state"
	"mixward/engine/thermo"
)

// withheld is the refusal of a chemical the dictionary knows by name but
// whose species have no thermodynamic data (data/withheld.txt): the answer
// is withheld rather than guessed.
func withheld(c *Component, msg string) *ParseError {
	return &ParseError{Code: "withheld", Message: msg + "; check the safety data sheet and ask a chemist before combining",
		Position: c.Pos, Token: c.Name, Suggestions: []string{}}
}

// waterMolarMass is g/mol (IUPAC standard atomic weights: 2 × 1.008 + 15.999).
const waterMolarMass = 18.015

// feedOf turns a parsed request into what the streams bring: the species
// each chemical gives in water (data/chemicals.txt) with their amounts, and
// the water of each liquid stream. Assumptions go to m's notes.
func feedOf(req *Request, t *Tables, db *thermo.DB, m *mixture) (state.Feed, error) {
	f := state.Feed{TempK: req.TemperatureK, PressureBar: req.PressureKPa / 100, PH: req.PH}
	m.fuelOxidizer = partnerAbove(req, t, db, organicFuelV)
	for si := range req.Streams {
		st, err := streamFeed(si, &req.Streams[si], t, db, m)
		if err != nil {
			return state.Feed{}, err
		}
		f.Streams = append(f.Streams, st)
	}
	if err := refuseAgentOfConcern(req, t, db); err != nil {
		return state.Feed{}, err
	}
	return f, nil
}

func streamFeed(si int, st *Stream, t *Tables, db *thermo.DB, m *mixture) (state.Stream, error) {
	vol := st.VolumeL
	liquid := vol > 0
	if vol == 0 && st.MassKg == 0 && streamIsSolution(st) {
		vol, liquid = 1, true
	}
	// A stream stands at its own stated temperature before it is poured,
	// else at 25 °C as stored: a drum of peroxide is not judged at the
	// temperature of the hot tank it goes into.
	out := state.Stream{Label: st.Label(), TempK: StandardTemperatureK}
	if st.TemperatureK != nil {
		out.TempK = *st.TemperatureK
	}
	solutes := 0.0 // kg of dissolved chemicals
	var found []soluteIn
	for ci := range st.Components {
		c := &st.Components[ci]
		if c.Chemical.Formula == "H2O" {
			continue
		}
		if w, ok := db.Withheld(c.Chemical.Formula); ok && fuelBeside(w, m.fuelOxidizer) {
			// The class of strong oxidizers with organic matter decides
			// before the missing data withhold the answer.
			mol, _, err := componentMoles(st, c, vol, liquid, t, m)
			if err != nil {
				return state.Stream{}, err
			}
			m.notAssessFuel(c, w, st.Label(), mol)
			continue
		}
		if w, ok := db.Withheld(c.Chemical.Formula); ok && w.Role != "" {
			m.notAssess(c, w, st.Label())
			continue
		}
		if err := db.WithheldError(c.Chemical.Formula); err != nil {
			return state.Stream{}, withheld(c, err.Error())
		}
		mol, excess, err := componentMoles(st, c, vol, liquid, t, m)
		if err != nil {
			return state.Stream{}, err
		}
		if liquid {
			solutes += mol * c.Chemical.MolarMass / 1000
		}
		found = append(found, soluteIn{chem: c.Chemical, stream: si, mol: mol})
		// A solid stream whose chemical has a solid species brings that
		// solid: the mix dissolves it (or not) and the state counts the
		// heat, instead of the table of heats of solution.
		if solid, ok := db.Get(c.Chemical.Formula + "(s)"); ok && !liquid && st.MassKg > 0 {
			out.Items = append(out.Items, state.Item{Species: solid, Mol: mol, Excess: excess})
			m.undissolve(c.Chemical)
			continue
		}
		for _, g := range c.Chemical.Gives {
			sp, ok := db.Get(g.Species.Text())
			if !ok {
				return state.Stream{}, withheld(c, fmt.Sprintf("no thermodynamic data for %s (%s gives %s); answer withheld", c.Name, c.Chemical.Formula, g.Species.Text()))
			}
			if sp.Text == "H2O" {
				out.WaterMol += mol * float64(g.Coef)
				continue
			}
			out.Items = append(out.Items, state.Item{Species: sp, Mol: mol * float64(g.Coef), Excess: excess})
			if (c.Chemical.Class == StrongAcid && sp.Text == "H+") || (c.Chemical.Class == StrongBase && sp.Text == "OH-") {
				out.Strong += mol * float64(g.Coef)
			}
		}
	}
	addBleachSalt(st, &out, db, m)
	if liquid {
		out.VolumeL, out.PH = vol, st.PH
		water := vol*streamDensity(st, t) - solutes // kg
		if water < 0.02*vol {
			water = 0.02 * vol // a near-pure reagent still holds a little water
		}
		out.WaterMol += water * 1000 / waterMolarMass
	}
	m.recordSolutes(t, found, out.WaterMol, liquid)
	return out, nil
}

// addBleachSalt adds the salt that hypochlorite solutions carry: bleach is
// made from chlorine and caustic soda (Cl2 + 2 NaOH → NaOCl + NaCl + H2O),
// so a sodium hypochlorite solution holds about one NaCl per NaOCl (common
// practice, no source). That chloride is what turns into chlorine when the
// solution meets acid. A stream that names its own sodium chloride is taken
// as stated.
func addBleachSalt(st *Stream, out *state.Stream, db *thermo.DB, m *mixture) {
	ocl := 0.0
	for _, c := range st.Components {
		switch c.Chemical.Formula {
		case "NaCl":
			return
		}
	}
	for _, it := range out.Items {
		if it.Species.Text == "OCl-" {
			ocl += it.Mol
		}
	}
	na, ok1 := db.Get("Na+")
	cl, ok2 := db.Get("Cl-")
	if ocl <= 0 || !ok1 || !ok2 {
		return
	}
	switch {
	case streamHas(st, "NaOCl"):
		out.Items = append(out.Items, state.Item{Species: na, Mol: ocl}, state.Item{Species: cl, Mol: ocl})
		m.note("sodium hypochlorite solution taken to carry one NaCl per NaOCl, as made from chlorine and caustic soda; name the NaCl in the stream to state it otherwise")
	case streamHas(st, "Ca(OCl)2"):
		// High-test calcium hypochlorite (65–70 % Ca(OCl)2) carries
		// about 15–20 % sodium chloride and a little calcium chloride:
		// about one chloride per two hypochlorite (suppliers' typical
		// analysis, from memory); bleaching powder carries more.
		out.Items = append(out.Items, state.Item{Species: na, Mol: ocl / 2}, state.Item{Species: cl, Mol: ocl / 2})
		m.note("calcium hypochlorite taken to carry one NaCl per two hypochlorite, as the high-test granules do; name the NaCl in the stream to state it otherwise")
	}
}

func streamHas(st *Stream, formula string) bool {
	for _, c := range st.Components {
		if c.Chemical.Formula == formula {
			return true
		}
	}
	return false
}

// undissolve takes a chemical off the solids whose heat of solution the
// tables count: the state dissolves it and counts the heat itself.
func (m *mixture) undissolve(ch *Chemical) {
	keep := m.dissolved[:0]
	for _, d := range m.dissolved {
		if d.chem != ch {
			keep = append(keep, d)
		}
	}
	m.dissolved = keep
}
