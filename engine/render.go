package engine

import "strings"

// RenderText writes a result as plain text for a terminal or a chat fallback.
func RenderText(r *Result) string {
	var b strings.Builder
	b.WriteString(r.Request)
	return b.String()
}
