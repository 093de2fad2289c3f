package engine

// KineticRule is one kinetic allowance (data/kinetics.txt): a couple that the
// potential table ranks higher than plants observe, and how much its
// potential is discounted when the headline pair is ranked.
type KineticRule struct {
	ID     string
	Couple string  // half-reaction id the rule applies to
	Side   Role    // the side it slows: oxidizer or reducer
	Volts  float64 // discount in volts when ranking
	When   string  // condition: "always", "ph>=N", "ph<N", "t<N"
	Reason string
	Source string
}
