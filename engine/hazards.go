package engine

// HazardRule is one rule of the hazard table (data/hazards.txt).
type HazardRule struct {
	Code     string
	Severity Severity
	Message  string
	Source   string
}
