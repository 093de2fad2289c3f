package engine

import (
	"errors"
	"io/fs"

	"mixward/engine/thermo"
)

// CheckTables runs every validation of the tables in fsys (normally data.FS)
// that New skips to start quickly: Load's checks of elements, chemicals,
// half-reactions, acid–base pairs and densities, and thermo's Check of the
// species data. It returns every problem found, joined, each naming its file
// and line; nil when the tables are sound. Tests and `mixward table --check`
// run it.
func CheckTables(fsys fs.FS) error {
	var errs []error
	if t, err := Load(fsys); err != nil {
		errs = append(errs, err)
	} else if _, err := LoadProducts(fsys, t); err != nil {
		errs = append(errs, err)
	}
	if _, err := LoadHazardRules(fsys); err != nil {
		errs = append(errs, err)
	}
	if _, err := LoadEnthalpies(fsys); err != nil {
		errs = append(errs, err)
	}
	if _, err := loadDilution(fsys); err != nil {
		errs = append(errs, err)
	}
	db, err := thermo.Load(fsys)
	if err != nil {
		errs = append(errs, err)
	} else if err := db.Check(); err != nil {
		errs = append(errs, err)
	}
	return errors.Join(errs...)
}
