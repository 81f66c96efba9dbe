package claims

import (
	"context"
	"strings"
	"testing"

	"avoidcert/pattern"
)

// typedManifest's claims are true of {123, 321} as written, and of no
// other set: a_6 = 122 (OEIS A001250), radius pi/2 (Andre 1879), periodic,
// and lambda(123, 321) = 2/pi < lambda(1342) (OEIS A117156).
const typedManifest = `
[[claim]]
id = "count"
kind = "count"
patterns = ["123,321"]
n = 6
count = "122"

[[claim]]
id = "growth"
kind = "growth"
patterns = ["123,321"]
of = "radius"
interval = ["1.5707", "1.5709"]

[[claim]]
id = "form"
kind = "form"
patterns = ["123,321"]
form = "periodic"

[[claim]]
id = "order"
kind = "order"
patterns = ["1342"]
less_than = ["1.3.4.2", "123,321"]

[[claim]]
id = "equal"
kind = "equal-counts"
patterns = ["321,123"]
other = ["123,321"]
to = 6
`

// Every verdict is bound by the checker to the patterns as the manifest
// writes them. Should the engine's parser misread a comma list (here: the
// parsed sets replaced by the set without its last pattern), no claim is
// proved or refuted for the misread set: each fails with the checker's
// refusal or the two counts' disagreement.
func TestVerdictsBindToTheTypedSets(t *testing.T) {
	m, err := Parse("typed.toml", []byte(typedManifest))
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	honest, err := Run(ctx, m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range honest {
		if r.Verdict != Proved && !(r.ID == "order" && r.Verdict == Refuted) {
			t.Errorf("%s: %s (%s), want proved", r.ID, r.Verdict, r.Evidence)
		}
	}
	misread := func(typed []string) pattern.Set {
		last := typed[len(typed)-1]
		if i := strings.LastIndex(last, ","); i >= 0 {
			typed = append(append([]string(nil), typed[:len(typed)-1]...), last[:i])
		}
		s, err := pattern.ParseSet(typed)
		if err != nil {
			t.Fatal(err)
		}
		return s
	}
	for i := range m.Claims {
		c := &m.Claims[i]
		c.Set = misread(c.Typed)
		if c.OtherTyped != nil {
			c.Other = misread(c.OtherTyped)
		}
	}
	results, err := Run(ctx, m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range results {
		if r.Verdict != Failed || !strings.Contains(r.Evidence, "checker") {
			t.Errorf("%s on the misread set: %s (%s), want an error from the checker", r.ID, r.Verdict, r.Evidence)
		}
	}
}
