package claims

import (
	"context"
	"math/big"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/prove"
)

// verdictsManifest states true, false and undecidable-within-budget claims
// of every kind. Sources of the true values:
//   - counts of 123: OEIS A049774 (1, 1, 2, 5, 17, 70, 349, 2017, 13358,
//     99377, 822041, 7477162, 74207209); of 132: OEIS A111004 (a_4 = 16);
//   - lambda(1342) = 0.95461183447... (OEIS A117156), so 1/lambda =
//     1.04754620...; lambda(1324) = 0.95585031347... (OEIS A113228);
//   - {123, 321}: the alternating permutations, period 2, radius pi/2
//     (Andre 1879); {132, 231}: lambda = 0 (computed by 'avoidcert
//     structure 132 231': subexponential);
//   - 123 and 321 have equal counts by the complement symmetry (from
//     memory; any textbook).
const verdictsManifest = `
[defaults]
max_k = 300

[[claim]]
id = "count-true"
kind = "count"
patterns = ["123"]
n = 12
count = "74207209"

[[claim]]
id = "count-list-false"
kind = "count"
patterns = ["123"]
from = 2
counts = ["2", "5", "17", "71"]

[[claim]]
id = "count-undecided"
kind = "count"
patterns = ["123"]
n = 12
count = "74207209"
max_n = 5

[[claim]]
id = "growth-true"
kind = "growth"
patterns = ["1342"]
value = "0.9546118"

[[claim]]
id = "growth-last-digit"
kind = "growth"
patterns = ["1342"]
value = "0.9546119"

[[claim]]
id = "radius-truncated"
kind = "growth"
patterns = ["1342"]
of = "radius"
value = "1.047546"
reading = "truncated"

[[claim]]
id = "radius-pi-half"
kind = "growth"
patterns = ["123", "321"]
of = "radius"
interval = ["1.57079", "1.57080"]

[[claim]]
id = "growth-negative"
kind = "growth"
patterns = ["123"]
value = "-0.5"

[[claim]]
id = "growth-above-one"
kind = "growth"
patterns = ["123"]
interval = ["1.01", "2"]

[[claim]]
id = "radius-below-one"
kind = "growth"
patterns = ["123"]
of = "radius"
value = "0.5"

[[claim]]
id = "growth-undecided"
kind = "growth"
patterns = ["1342"]
value = "0.9546118"
max_k = 6

[[claim]]
id = "form-true"
kind = "form"
patterns = ["123", "321"]
form = "periodic"
period = 2

[[claim]]
id = "form-false"
kind = "form"
patterns = ["132", "231"]
form = "primitive"

[[claim]]
id = "form-undecided"
kind = "form"
patterns = ["1342"]
form = "primitive"
max_memory = "1K"

[[claim]]
id = "order-true"
kind = "order"
patterns = ["1342"]
less_than = ["1324"]

[[claim]]
id = "order-false"
kind = "order"
patterns = ["1324"]
less_than = ["1342"]

[[claim]]
id = "order-undecided"
kind = "order"
patterns = ["123"]
less_than = ["321"]
max_k = 30

[[claim]]
id = "equal-true"
kind = "equal-counts"
patterns = ["123"]
other = ["321"]
to = 14

[[claim]]
id = "equal-false"
kind = "equal-counts"
patterns = ["123"]
other = ["132"]
to = 10

[[claim]]
id = "equal-undecided"
kind = "equal-counts"
patterns = ["123"]
other = ["321"]
to = 14
max_n = 8

[[claim]]
id = "probability-exact"
kind = "probability"
patterns = ["123"]
n = 4
exact = "17/24"

[[claim]]
id = "probability-digits-false"
kind = "probability"
patterns = ["123"]
n = 10
value = "0.2266"

[[claim]]
id = "probability-undecided"
kind = "probability"
patterns = ["123"]
n = 10
value = "0.2265"
max_n = 9
`

func parseOrFail(t *testing.T, text string) *Manifest {
	t.Helper()
	m, err := Parse("verdicts.toml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func TestVerdicts(t *testing.T) {
	m := parseOrFail(t, verdictsManifest)
	results, err := Run(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]struct {
		verdict Verdict
		says    string
	}{
		"count-true":               {Proved, "a_12 = 74207209"},
		"count-list-false":         {Refuted, "a_5 = 70, not 71"},
		"count-undecided":          {Undecided, "max_n = 5"},
		"growth-true":              {Proved, "inside the claim"},
		"growth-last-digit":        {Refuted, "outside the claim"},
		"radius-truncated":         {Proved, "radius in [1.04754"},
		"radius-pi-half":           {Proved, "radius in [1.570796"},
		"growth-negative":          {Refuted, "every set has 0 <= lambda <= 1, since 0 <= a_n <= n!, and the claim lies below 0"},
		"growth-above-one":         {Refuted, "every set has 0 <= lambda <= 1, since 0 <= a_n <= n!, and the claim lies above 1"},
		"radius-below-one":         {Refuted, "every set has 1/lambda >= 1"},
		"growth-undecided":         {Undecided, "is the last that max_k 6 allows; raise max_k"},
		"form-true":                {Proved, "periodic with period 2"},
		"form-false":               {Refuted, "proves subexponential"},
		"form-undecided":           {Undecided, "over max_memory 1.0 KiB; raise max_memory to"},
		"order-true":               {Proved, "is below"},
		"order-false":              {Refuted, "is not below"},
		"order-undecided":          {Undecided, "overlaps"},
		"equal-true":               {Proved, "evidence, not a proof, of c-Wilf equivalence"},
		"equal-false":              {Refuted, "a_4 differ: 17 for 123, 16 for 132"},
		"equal-undecided":          {Undecided, "max_n = 8"},
		"probability-exact":        {Proved, "17/24"},
		"probability-digits-false": {Refuted, "822041/3628800"},
		"probability-undecided":    {Undecided, "max_n = 9"},
	}
	if len(results) != len(want) {
		t.Fatalf("%d results for %d claims", len(results), len(want))
	}
	for _, r := range results {
		w := want[r.ID]
		if r.Verdict != w.verdict || !strings.Contains(r.Evidence, w.says) {
			t.Errorf("%s: %s (%s); want %s, saying %q", r.ID, r.Verdict, r.Evidence, w.verdict, w.says)
		}
		impossible := strings.Contains(r.Evidence, "no certificate needed")
		if impossible != (r.ID == "growth-negative" || r.ID == "growth-above-one" || r.ID == "radius-below-one") {
			t.Errorf("%s: %s; only a claim no set satisfies is refuted without a certificate", r.ID, r.Evidence)
		}
		if !impossible && (r.Kind == KindGrowth || r.Kind == KindOrder || (r.Kind == KindForm && r.Verdict != Undecided)) {
			if len(r.Certificates) == 0 || len(r.Certificates[0].SHA256) != 64 {
				t.Errorf("%s: no certificate digest: %+v", r.ID, r.Certificates)
			}
		}
	}
	if s := Summarize(results); s.Failed != 0 {
		t.Errorf("summary %s: nothing should fail", s)
	}
}

const cacheManifest = `
[[claim]]
id = "g"
kind = "growth"
patterns = ["1342"]
value = "0.9546118" # OEIS A117156

[[claim]]
id = "o"
kind = "order"
patterns = ["1342"]       # 0.95461... (OEIS A117156)
less_than = ["1324"]      # 0.95585... (OEIS A113228)

[[claim]]
id = "f"
kind = "form"
patterns = ["123", "321"] # alternating permutations: period 2 (Andre 1879)
form = "periodic"
`

// The second run over a cache re-checks the cached certificates instead
// of computing them; a tampered cached certificate is refused by the
// checker, recomputed and replaced.
func TestCache(t *testing.T) {
	ctx := context.Background()
	m := parseOrFail(t, cacheManifest)
	cache, kept := t.TempDir(), t.TempDir()
	opts := Options{CacheDir: cache, CertDir: kept}
	first, err := Run(ctx, m, opts)
	if err != nil {
		t.Fatal(err)
	}
	second, err := Run(ctx, m, opts)
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range second {
		if r.Verdict != Proved || !r.Cached || !strings.HasPrefix(r.Evidence, "re-checked cached certificate: ") {
			t.Errorf("second run, %s: %s, cached %v, %q", r.ID, r.Verdict, r.Cached, r.Evidence)
		}
		if first[i].Cached || first[i].Certificates[0].SHA256 != r.Certificates[0].SHA256 {
			t.Errorf("%s: first run cached %v; digests %s and %s", r.ID, first[i].Cached, first[i].Certificates[0].SHA256, r.Certificates[0].SHA256)
		}
		if _, err := os.Stat(filepath.Join(kept, certName(r.ID, 0, len(r.Certificates)))); err != nil {
			t.Errorf("%s: certificate not kept: %v", r.ID, err)
		}
	}

	// Two tampers, each followed by a run that must refuse the cached
	// certificate, recompute it and cache a good one again: an edited
	// byte (the reader refuses the file: its content digest no longer
	// matches) and a raised lower end of lambda written with a fresh
	// content digest (only the checker can refuse that one).
	path := cachePaths(cache, m.Claims[0], 1)[0]
	tamperBytes := func() {
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		tampered := strings.Replace(string(data), `"lo_decimal": "0.95461`, `"lo_decimal": "0.95462`, 1)
		if tampered == string(data) {
			t.Fatal("the tamper found nothing to change")
		}
		if err := os.WriteFile(path, []byte(tampered), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	tamperStatement := func() {
		c, err := prove.Load(context.Background(), path)
		if err != nil {
			t.Fatal(err)
		}
		c.Statement.Lambda.Lo = new(big.Rat).Add(c.Statement.Lambda.Lo, big.NewRat(1, 1_000_000_000)) // inside [lo, hi], above what the brackets prove
		if err := certify.Derive(c); err != nil {                                                     // the decimals and digests follow the change
			t.Fatal(err)
		}
		if err := prove.Save(path, c); err != nil {
			t.Fatal(err)
		}
		if _, err := prove.Load(context.Background(), path); err != nil {
			t.Fatalf("the re-digested certificate should read: %v", err)
		}
	}
	for _, tamper := range []func(){tamperBytes, tamperStatement} {
		tamper()
		third, err := Run(ctx, m, opts)
		if err != nil {
			t.Fatal(err)
		}
		r := third[0]
		t.Logf("after the tamper: %s", r.Evidence)
		if r.Verdict != Proved || r.Cached || !strings.Contains(r.Evidence, "cached certificate refused") || !strings.Contains(r.Evidence, "recomputed") {
			t.Errorf("tampered cache: %s, cached %v, %q", r.Verdict, r.Cached, r.Evidence)
		}
		if fourth, err := Run(ctx, m, opts); err != nil || !fourth[0].Cached {
			t.Errorf("after recomputing, the cache holds a good certificate again: %+v, %v", fourth[0], err)
		}
	}
}

// The run's timeout leaves the claims it could not reach undecided.
func TestRunTimeout(t *testing.T) {
	m := parseOrFail(t, cacheManifest)
	m.Timeout = 1 // nanosecond
	results, err := Run(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range results {
		if r.Verdict != Undecided || !strings.Contains(r.Evidence, "run's timeout") {
			t.Errorf("%s: %s (%s)", r.ID, r.Verdict, r.Evidence)
		}
	}
}

// An interrupt ends the run with an error, not with verdicts.
func TestInterrupt(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Run(ctx, parseOrFail(t, cacheManifest), Options{}); err == nil {
		t.Error("a cancelled run returned no error")
	}
}
