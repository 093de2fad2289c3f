//go:build unix

package main

import "golang.org/x/sys/unix"

// restrictUmask makes every file the process creates private to its owner
// (mode 0600 at most): the database and its WAL and shared-memory files,
// backups, exports and pictures.
func restrictUmask() { unix.Umask(0o077) }
