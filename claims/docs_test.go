package claims

import (
	"os"
	"regexp"
	"strings"
	"testing"
)

// Every claim example in docs/claims.md parses, so the page cannot drift
// from the schema. The true values in the examples name their sources
// there.
func TestDocumentedExamplesParse(t *testing.T) {
	data, err := os.ReadFile("../docs/claims.md")
	if err != nil {
		t.Fatal(err)
	}
	blocks := regexp.MustCompile("(?s)```toml\n(.*?)```").FindAllStringSubmatch(string(data), -1)
	n := 0
	for _, b := range blocks {
		if !strings.HasPrefix(b[1], "[[claim]]") {
			continue // the schema overview, with a placeholder for the kind's fields
		}
		n++
		if _, err := Parse("docs/claims.md", []byte(b[1])); err != nil {
			t.Errorf("example %d: %v\n%s", n, err, b[1])
		}
	}
	if n < len(kinds) {
		t.Errorf("%d claim examples; want at least one per kind (%d)", n, len(kinds))
	}
}
