package certify_test

import (
	"testing"

	"avoidcert/certify"
)

// Until the checker verifies the structure section of format version 4,
// it accepts none.
func TestStructureSectionNotYetAccepted(t *testing.T) {
	c := assemble(t, []string{"123"}, []spec{wholeSpec(8, 1, true)}, structure123())
	wantRefusal(t, certify.Check(bg, c, certify.CheckOptions{}), "statement.structure")
}
