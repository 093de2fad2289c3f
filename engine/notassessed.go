package engine

import (
	"fmt"

	"mixward/engine/chem"

	"mixward/engine/thermo"
)

// NotAssessed is a chemical of the request that the answer leaves out: the
// dictionary knows it by name, but its species have no thermodynamic data
// (data/withheld.txt, a row with a role), and it is not the agent of concern
// of the rest of the mix (see refuseAgentOfConcern). Neither the chemical
// nor its counter-ions are counted in the state, the gases or the heat.
type NotAssessed struct {
	Name    string `json:"name"`
	Formula string `json:"formula"`
	Stream  string `json:"stream"`
	Reason  string `json:"reason"`
	Role    string `json:"role"` // reductant, oxidant or inert (data/withheld.txt); fuel (RoleFuel)
	// Mol is the amount of a chemical taken in as fuel (Role RoleFuel),
	// and Oxidizer the strong oxidizing agent of the request beside it.
	Mol      float64 `json:"mol,omitempty"`
	Oxidizer string  `json:"oxidizer,omitempty"`
}

// RoleFuel is the role of a NotAssessed chemical that is organic matter
// without data beside a strong oxidizing agent: it is left out of the
// state, the gases and the heat, but handed to the hazard rules as fuel by
// its amount, so the class of strong oxidizers with organic matter
// (Bretherick's Handbook of Reactive Chemical Hazards, chlorates,
// permanganates, nitric acid with organic matter, from memory) decides,
// not the missing ΔfG°.
const RoleFuel = "fuel"

// fuelBeside: a withheld chemical is taken in as fuel when it is organic
// (carbon and hydrogen), is not given a redox role of its own (a reductant
// such as an aldehyde stays with refuseAgentOfConcern) and the request
// brings a strong oxidizing agent.
func fuelBeside(w *thermo.Withheld, oxidizer string) bool {
	return oxidizer != "" && organicFormula(w.Formula) && (w.Role == "" || w.Role == thermo.RoleInert)
}

// notAssessFuel records c as not assessed, taken in as fuel.
func (m *mixture) notAssessFuel(c *Component, w *thermo.Withheld, stream string, mol float64) {
	for i, n := range m.notAssessed {
		if n.Formula == w.Formula {
			m.notAssessed[i].Mol += mol
			return
		}
	}
	m.notAssessed = append(m.notAssessed, NotAssessed{
		Name: c.Name, Formula: w.Formula, Role: RoleFuel, Stream: stream, Mol: mol, Oxidizer: m.fuelOxidizer,
		Reason: "no thermodynamic data (" + w.Missing + "); judged only as organic matter beside the strong oxidizing agent " + m.fuelOxidizer,
	})
}

// oxidizerOfConcernV is the standard potential (V) from which a species the
// rest of the mix brings counts as an oxidizing agent that could act on an
// unassessed reducing agent: ferric iron (+0.77 V, CRC Handbook,
// Electrochemical Series) and every stronger one, such as nitrate,
// hypochlorite, peroxide, chlorite, chromate, permanganate and persulfate.
const oxidizerOfConcernV = 0.7

// notAssess records c as not assessed.
func (m *mixture) notAssess(c *Component, w *thermo.Withheld, stream string) {
	for _, n := range m.notAssessed {
		if n.Formula == w.Formula {
			return
		}
	}
	m.notAssessed = append(m.notAssessed, NotAssessed{
		Name: c.Name, Formula: w.Formula, Role: w.Role, Stream: stream,
		Reason: "no thermodynamic data (" + w.Missing + "); the answer is for the rest of the mix",
	})
}

// refuseAgentOfConcern withholds the whole answer when a chemical that
// would be marked not assessed may be the oxidizing or reducing agent of
// concern:
//   - an unassessed reducing agent (an oxygen scavenger, an aldehyde) meets
//     an oxidizing agent of the table with E° of oxidizerOfConcernV or more
//     brought by another chemical of the request;
//   - an unassessed oxidizing agent meets any chemical that the tables list
//     as a reducing agent (the reduced side of a half-reaction);
//   - an inert one (a surfactant) is not refused for a redox partner.
//
// Organic matter without data (inert or without a role) beside an
// oxidizing agent of E° organicFuelV or more (concentrated nitric acid,
// permanganate, dichromate, chlorate, peroxide) never reaches this check:
// streamFeed takes it in as fuel (RoleFuel) and the hazard rules of strong
// oxidizers with organic matter judge it (Bretherick's Handbook of Reactive
// Chemical Hazards, nitric acid, permanganate and chlorates with organic
// materials, from memory).
//
// Water alone never makes it the agent of concern.
func refuseAgentOfConcern(req *Request, t *Tables, db *thermo.DB) error {
	for si := range req.Streams {
		for ci := range req.Streams[si].Components {
			c := &req.Streams[si].Components[ci]
			w, ok := db.Withheld(c.Chemical.Formula)
			if !ok || w.Role == "" {
				continue
			}
			if w.Role == thermo.RoleInert {
				// Organic matter beside a strong oxidizing agent is taken
				// in as fuel (fuelBeside): the hazard rules judge it.
				continue
			}
			if other := partnerOf(req, t, db, w.Role); other != "" {
				return withheld(c, fmt.Sprintf("no thermodynamic data for %s (%s); answer withheld: it may be the %s that %s acts on",
					c.Name, w.Missing, agentWord(w.Role), other))
			}
		}
	}
	return nil
}

// organicFuelV is the standard potential (V) from which an oxidizing agent
// is taken to attack unassessed organic matter: above hypochlorite (0.89 V
// in base), which is dosed beside quaternary ammonium sanitisers, and below
// nitric acid (0.96 V). Common practice, no source.
const organicFuelV = 0.95

// fuelOxidizerMolar is the strength (mol/L in its own stream) from which a
// liquid oxidizing agent counts against unassessed organic matter; solids
// always count. Common practice, no source.
const fuelOxidizerMolar = 1.0

// organicFormula: a formula with carbon and hydrogen.
func organicFormula(f string) bool {
	a, err := chem.ParseFormula(f)
	return err == nil && a["C"] > 0 && a["H"] > 0
}

func agentWord(role string) string {
	if role == thermo.RoleOxidant {
		return "oxidizing agent"
	}
	return "reducing agent"
}

// partnerOf names the first chemical of the request (not withheld, not
// water) that could be the redox partner of an unassessed agent of role.
func partnerOf(req *Request, t *Tables, db *thermo.DB, role string) string {
	return firstPartner(req, db, func(_ *Stream, c *Component, key string) bool {
		return partnerSpecies(t, key, role)
	})
}

// partnerAbove names the first chemical of the request (not withheld, not
// water) that brings the oxidized side of a half-reaction with E° ≥ v, as a
// solid or at fuelOxidizerMolar or more in its own stream (a 1 % nitric
// acid rinse beside a quat sanitiser does not count).
func partnerAbove(req *Request, t *Tables, db *thermo.DB, v float64) string {
	return firstPartner(req, db, func(st *Stream, c *Component, key string) bool {
		if st.VolumeL > 0 {
			mol, _, err := componentMoles(st, c, 1, true, t, &mixture{})
			if err != nil || mol < fuelOxidizerMolar {
				return false
			}
		}
		return oxidizerAbove(t, key, v)
	})
}

// firstPartner names the first chemical of the request, water and withheld
// chemicals aside, one of whose species (by mixKey) passes match.
func firstPartner(req *Request, db *thermo.DB, match func(st *Stream, c *Component, key string) bool) string {
	for si := range req.Streams {
		st := &req.Streams[si]
		for ci := range st.Components {
			c := &st.Components[ci]
			if c.Chemical == nil || c.Chemical.Formula == "H2O" {
				continue
			}
			if _, ok := db.Withheld(c.Chemical.Formula); ok {
				continue
			}
			for _, g := range c.Chemical.Gives {
				if match(st, c, mixKey(g.Species)) {
					return c.Name
				}
			}
		}
	}
	return ""
}

// partnerSpecies: for an unassessed reducing agent, key is the oxidized
// side of a half-reaction with E° ≥ oxidizerOfConcernV; for an unassessed
// oxidizing agent, the reduced side of any half-reaction.
func partnerSpecies(t *Tables, key, role string) bool {
	if role == thermo.RoleReductant {
		return oxidizerAbove(t, key, oxidizerOfConcernV)
	}
	for _, h := range t.Half {
		for _, k := range h.redKeys {
			if k == key {
				return true
			}
		}
	}
	return false
}

// oxidizerAbove: key is the oxidized side of a half-reaction with E° ≥ v.
func oxidizerAbove(t *Tables, key string, v float64) bool {
	for _, h := range t.Half {
		if h.E0 < v {
			continue
		}
		for _, k := range h.oxKeys {
			if k == key {
				return true
			}
		}
	}
	return false
}
