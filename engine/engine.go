package engine

import (
	"fmt"
	"sync"

	"mixward/engine/state"
)

// Version is the engine version recorded with every logged query.
const Version = "0.1.0"

// Resolver maps a site stream tag (T-101) to its stream text in the request
// language. It returns false for an unknown tag.
type Resolver func(tag string) (stream string, ok bool)

// AskOptions tune one request.
type AskOptions struct {
	Resolve Resolver // may be nil: tags are then unknown words
	// Tags lists the catalogue's tags; may be nil. It is called only for a
	// tag-like word that names nothing, to suggest the nearest tags
	// ("T102", "T-120": did you mean T-102?).
	Tags func() []string
}

// Engine answers mix requests from a loaded set of tables. It is safe for
// concurrent use.
type Engine struct {
	Tables *Tables
	Model  *state.Model // the equilibrium of a mix under the kinetic locks

	rowsOnce sync.Once
	rows     []tableRow // the half-reaction table as reactions of the species data
}

// ParseError is a request that could not be read. Position is the 1-based
// character offset of the offending token in the request.
type ParseError struct {
	Code        string   `json:"code"`
	Message     string   `json:"message"`
	Position    int      `json:"position"`
	Token       string   `json:"token,omitempty"`
	Suggestions []string `json:"suggestions"`
}

func (e *ParseError) Error() string {
	if e.Position > 0 {
		return fmt.Sprintf("at position %d: %s", e.Position, e.Message)
	}
	return e.Message
}
