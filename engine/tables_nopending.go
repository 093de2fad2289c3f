//go:build !mixward_pending

package engine

type family struct{}
