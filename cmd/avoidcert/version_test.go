package main

import (
	"strings"
	"testing"
)

// The revision and its dirty flag come from the build information; a build
// without them (go run, go test) says "unknown". The tool string fits the
// certificate format's 200 characters.
func TestBuildWords(t *testing.T) {
	for _, tc := range []struct {
		b          build
		short, all string
	}{
		{build{}, "unknown", "unknown"},
		{build{revision: "0123456789abcdef0123456789abcdef01234567"}, "0123456789ab", "0123456789abcdef0123456789abcdef01234567"},
		{build{revision: "0123456789abcdef0123456789abcdef01234567", modified: true}, "0123456789ab, modified", "0123456789abcdef0123456789abcdef01234567, modified"},
	} {
		if got := tc.b.revisionWords(true); got != tc.short {
			t.Errorf("%+v short: %q, want %q", tc.b, got, tc.short)
		}
		if got := tc.b.revisionWords(false); got != tc.all {
			t.Errorf("%+v: %q, want %q", tc.b, got, tc.all)
		}
	}
	if name := toolName(); len(name) > 200 || !strings.HasPrefix(name, "avoidcert "+version+" (module ") {
		t.Errorf("tool %q", name)
	}
}
