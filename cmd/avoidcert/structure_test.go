package main

import (
	"testing"

	"avoidcert/certify"
)

// structure exits 3, as every command does for undecided, when the checked
// section decides no class; a decided class is 0 (script tests show those).
func TestStructureUndecidedIsThree(t *testing.T) {
	for _, tc := range []struct {
		class certify.StructureClass
		code  int
	}{
		{certify.ClassUndecided, exitUndecided},
		{certify.ClassPrimitive, exitOK},
		{certify.ClassSubexponential, exitOK},
	} {
		if got := structureCode(&certify.Structure{Class: tc.class}); got != tc.code {
			t.Errorf("class %s: exit %d, want %d", tc.class, got, tc.code)
		}
	}
}
