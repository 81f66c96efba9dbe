//go:build unix

package main

import (
	"errors"
	"syscall"
)

// outOfSpace reports a write refused because the disk or the user's quota
// is full.
func outOfSpace(err error) bool {
	return errors.Is(err, syscall.ENOSPC) || errors.Is(err, syscall.EDQUOT)
}
