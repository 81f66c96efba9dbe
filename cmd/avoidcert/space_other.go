//go:build !unix

package main

import (
	"errors"
	"syscall"
)

// outOfSpace reports a write refused because the disk is full.
func outOfSpace(err error) bool { return errors.Is(err, syscall.ENOSPC) }
