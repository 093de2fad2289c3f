// Package equilibrium finds the chemical equilibrium of a closed system: the
// composition with the least Gibbs energy
//
//	G/RT = Σ nᵢ (μ°ᵢ/RT + ln aᵢ)
//
// under the component balances A·n = b, electroneutrality of the aqueous
// phase, nᵢ ≥ 0 and optional linear constraints on species amounts (kinetic
// locks). It is pure numerics over the Problem it is handed: it knows nothing
// of chemistry tables, performs no I/O and is safe for concurrent use.
//
// # Model and assumptions
//
//   - Aqueous species: aᵢ = γᵢ mᵢ with molality mᵢ = nᵢ / (n_w · 0.018015 kg/mol),
//     n_w the amount of the Solvent species (water).
//   - The solvent has activity 1 (assumption: the osmotic lowering of the
//     water activity, −0.018·Σm in ln a_w for ideal solutes, is neglected).
//     It takes part in the balances, so water formed or consumed by a reaction
//     is counted and changes the molalities.
//   - Activity coefficients by the Davies equation,
//     log10 γ = −A z² (√I/(1+√I) − 0.3 I); neutral aqueous species γ = 1
//     (no salting-out term). The ionic strength used in the equation is held
//     at 1 mol/kg beyond that value, where the Davies curve turns upward
//     without physical meaning; beyond 0.5 mol/kg a Note says activities are
//     approximate. A(T) is given by DaviesA.
//   - Pure phases (Pure: solids, liquids) have activity 1 and are present
//     only when saturated: present ⇔ μ°/RT = Σ Aλ, absent ⇔ μ°/RT ≥ Σ Aλ,
//     with λ the component potentials.
//   - Gas species form one ideal mixture at PressureBar. The phase forms only
//     when the sum of the equilibrium partial pressures reaches PressureBar.
//     State.Partial reports each gas's equilibrium partial pressure
//     exp(Σ Aλ − μ°/RT) bar whether or not the phase forms.
//
// # Method
//
// The element-potential (dual) formulation: the unknowns are the component
// potentials λ (one per independent balance row — the charge row, the
// components, and one per active constraint), the amounts of the pure phases
// present and the amount of the gas phase when it is present. Aqueous
// amounts follow from the potentials in closed form,
// nᵢ = W·exp(aᵢ·λ − μ°ᵢ/RT − ln γᵢ), so concentrations spanning hundreds of
// orders of magnitude are represented without loss; the gas phase enters as
// ln Σ pᵢ/P = 0 and each pure phase as aₚ·λ = μ°ₚ/RT.
//
// Before solving, the balance rows are recombined so that only one row
// carries the solvent (for water "H" becomes "H beyond what water carries",
// H − 2·O): acidity and oxidation state are then balanced to their own
// scale instead of to 1e-12 of 111 mol of hydrogen. Dependent rows are
// dropped after checking that their totals agree (the charge row is kept
// first, so neutrality is enforced directly); totals that contradict each
// other or neutrality, negative totals, and components no species can carry
// are reported as ErrInfeasible before any iteration.
//
// Newton–Raphson on the balance, saturation and gas equations (gonum LAPACK
// LU with row and column equilibration and one step of refinement; a
// least-squares SVD step when the matrix is numerically singular) is damped
// by a step limit — no species may rise more than e² above what the totals
// allow in one step — and a backtracking (Armijo) line search on a scaled
// residual merit, whose scales are fixed for one Newton solve so that the
// merit is one function along it and are floored at the smallest nonzero
// total (a row whose carriers are all trace, such as the charge row beside
// a metal with nothing to oxidise it, would otherwise veto the steps that
// drive vanishing species down). A step that stalls short of the
// tolerances is retried as the least-squares step and then as the plain LU
// step whatever its pivots. When a full step only shrinks the merit
// linearly (a species being driven towards zero, where Newton on an
// exponential gains one ln unit per step) longer steps are tried while they
// keep paying. From a warm start (or the point of the previous round of
// the active set), a Newton solve whose accepted steps lower the merit by
// less than 1e-8 of itself ten times in a row has stalled (steps of 1e-12
// that the line search accepts but that lead nowhere) and gives up at once
// instead of running to its iteration cap: the cold start is the fallback.
// From the cold start, which has no fallback, such a solve runs on.
// Activity coefficients follow the ionic strength inside the
// Newton loop once the balances are nearly met; an outer fixed-point loop
// on ln γ confirms them. The pure-phase and gas assemblage is updated
// between Newton solves (most negative phase removed, most supersaturated
// phase added; an assemblage may be revisited at most three times).
// Inequality constraints use an active set (violated ones added, the one
// whose multiplier has the wrong sign dropped; one that comes back after
// being dropped is kept, so that two locks pinning one amount at the same
// bound cannot cycle). Every loop has a cap;
// exceeding it returns ErrNoConvergence saying what was tried.
//
// Directions in which only vanishing species move (an oxidation state with
// nothing to oxidise or reduce it) have no curvature; there the balances
// are met to the rounding carried in the totals (about 1e-15 of the largest
// total), not beyond, and amounts below that level are rounding.
//
// Cold start: the linear program "least Σ nᵢ μ°ᵢ/RT under the balances and
// the locks" gives the dominant species even when log K reaches ±200; its
// tight locks start active. It is solved by a small dense simplex method
// with Bland's rule and an iteration cap (lp.go says why not gonum's). The
// potentials are then fitted to it by weighted least squares, species it
// leaves out being pulled weakly towards 1e-10 mol/kg. A Start composition
// (for example the state of the previous point of a pour) replaces the
// linear program and is fitted exactly; if it fails the cold start is run,
// and if that fails it is retried with the potentials fitted exactly to the
// dominant species, without the pull of the others.
//
// The iterates of a dual method are not balanced compositions, so their
// Gibbs energy is not a descent quantity: what never rises along the
// accepted iterations is the merit. The final state is checked in the tests
// to be the minimum of G (no reaction vector and no random feasible move
// lowers it).
package equilibrium

import "errors"

// Phase says which phase a species belongs to.
type Phase int

// Phases of a species.
const (
	// Aqueous is a solute; its activity is γ·molality.
	Aqueous Phase = iota
	// Pure is a solid or liquid phase of its own, activity 1 when present.
	Pure
	// Gas is a member of the ideal gas mixture at the problem's pressure.
	Gas
	// Solvent is the water of the aqueous phase, activity 1. Exactly one.
	Solvent
)

// String names the phase.
func (ph Phase) String() string {
	switch ph {
	case Aqueous:
		return "aqueous"
	case Pure:
		return "pure"
	case Gas:
		return "gas"
	case Solvent:
		return "solvent"
	}
	return "unknown phase"
}

// Species is one species of a Problem.
type Species struct {
	Name   string
	Phase  Phase
	Charge int
	// Amounts is the formula amount of each component (len ==
	// len(Problem.Components)). Charge is not a component: the solver
	// enforces electroneutrality of the aqueous phase itself.
	Amounts []float64
	// Mu0 is μ°/(RT) at the problem's temperature.
	Mu0 float64
}

// Relation is the sense of a Constraint.
type Relation int

// Relations of a Constraint: Σ Coef·n (AtMost|AtLeast|Exactly) Bound.
const (
	AtMost Relation = iota
	AtLeast
	Exactly
)

// Constraint is a linear (in)equality on species amounts: a kinetic lock.
type Constraint struct {
	Name  string
	Coef  []float64 // per species
	Rel   Relation
	Bound float64
}

// Problem is a closed system to bring to equilibrium.
type Problem struct {
	Components  []string
	Totals      []float64 // moles of each component
	Species     []Species // exactly one Solvent species
	Constraints []Constraint
	// TemperatureK sets the Davies A; μ° values must already be at this
	// temperature. PressureBar is the ambient pressure for the gas phase.
	TemperatureK, PressureBar float64
	// Start is an optional warm start (mol per species), for example the
	// Amount of a nearby solved State.
	Start []float64
	// StartActive names the inequality constraints taken as active from
	// the first round of a warm start, for example the Active of the
	// nearby State when only their bounds differ. The active-set loop
	// still adds the violated ones and drops those whose multiplier has
	// the wrong sign; when the warm start fails they are forgotten.
	StartActive []string
}

// State is the equilibrium of a Problem. Slices are indexed like
// Problem.Species.
type State struct {
	Amount        []float64 // mol per species (0 for absent pure phases and gases)
	Molality      []float64 // mol/kg for aqueous species, 0 for the others
	LogGamma      []float64 // ln γ (Davies) for aqueous species, 0 for the others
	IonicStrength float64   // mol/kg
	// Partial is the equilibrium partial pressure (bar) of each gas species,
	// also when no gas phase forms; 0 for the other species.
	Partial  []float64
	GasMoles float64 // moles in the gas phase (0 when none forms)
	// G is Σ nᵢ(μ°ᵢ/RT + ln aᵢ) of the state.
	G          float64
	Active     []string // names of constraints active at the solution
	Iterations int      // Newton iterations over all loops
	Notes      []string
}

// Errors returned by Solve, wrapped with the details.
var (
	// ErrNoConvergence means an iteration cap was reached.
	ErrNoConvergence = errors.New("equilibrium: no convergence")
	// ErrInfeasible means no composition satisfies the totals and constraints.
	ErrInfeasible = errors.New("equilibrium: infeasible")
	// ErrBadInput means the Problem is malformed.
	ErrBadInput = errors.New("equilibrium: bad input")
)

// MolarMassWater is the molar mass of water in kg/mol (IUPAC CIAAW standard
// atomic weights: 2·1.008 + 15.999 = 18.015 g/mol).
const MolarMassWater = 0.018015

// Solve returns the equilibrium state of p. Errors wrap ErrBadInput,
// ErrInfeasible or ErrNoConvergence.
func Solve(p Problem) (State, error) {
	return solve(&p, nil)
}
