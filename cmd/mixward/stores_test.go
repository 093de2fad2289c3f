package main

import "mixward/store"

var (
	_ streamReader  = (*store.DB)(nil)
	_ digestRecords = (*store.DB)(nil)
	_ inboxPruner   = (*store.DB)(nil)
	_ healthDB      = (*store.DB)(nil)
	_ seedCatalogue = (*store.DB)(nil)
)
