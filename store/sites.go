package store

import (
	"fmt"
	"strings"
)

// DefaultSite is the site of a database that names none, and of every row
// written before sites existed.
const DefaultSite = "main"

// maxSiteLen is the longest site name.
const maxSiteLen = 32

// NormalizeSite checks a site name (1–32 ASCII letters, digits, '-' or
// '_', starting with a letter or digit) and returns it in lower case; ""
// means DefaultSite.
func NormalizeSite(site string) (string, error) {
	site = strings.TrimSpace(site)
	if site == "" {
		return DefaultSite, nil
	}
	if len(site) > maxSiteLen {
		return "", fmt.Errorf("%w: site %.40q is longer than %d characters", ErrInvalid, site, maxSiteLen)
	}
	for i, c := range site {
		ok := c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || (i > 0 && (c == '-' || c == '_'))
		if !ok {
			return "", fmt.Errorf("%w: site %q: character %q at position %d is not allowed "+
				"(use letters, digits, '-' and '_', starting with a letter or digit, like north-works)", ErrInvalid, site, c, i+1)
		}
	}
	return strings.ToLower(site), nil
}

// Site is the site this DB serves (Options.Site).
func (db *DB) Site() string { return db.site }
