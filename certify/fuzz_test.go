package certify_test

import (
	"bytes"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"avoidcert/certify"
)

// FuzzRead feeds the reader arbitrary files: nothing may panic, every
// refusal is one line that quotes little, and an accepted file is
// canonical (Marshal gives it back byte for byte).
func FuzzRead(f *testing.F) {
	good, err := os.ReadFile(goldenPath)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(good)
	old, err := os.ReadFile("testdata/cert-123-k6-v2.json")
	if err != nil {
		f.Fatal(err)
	}
	f.Add(old)
	f.Add([]byte("{}"))
	f.Add(good[:len(good)/3])
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := certify.Read(bytes.NewReader(data))
		if err != nil {
			if msg := err.Error(); msg == "" || strings.Contains(msg, "\n") || len(msg) > 600 {
				t.Fatalf("refusal is not one short line: %.300q", msg)
			}
			return
		}
		if out, err := certify.Marshal(c); err != nil || !bytes.Equal(out, data) {
			t.Fatalf("accepted a file that is not canonical: %v", err)
		}
	})
}

// FuzzCheck feeds the reader and the checker arbitrary files, each as
// written and with its content digest recomputed (so that mutations get
// past the digest into the checker). Nothing may panic, and a file is
// accepted only if it is canonical and every claim is true: for {123} and
// {132} against the published growth rates, OEIS counts and their
// structure; no other set can be verified here, so accepting one fails
// the test.
func FuzzCheck(f *testing.F) {
	good, err := os.ReadFile(goldenPath)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(good)
	other, err := certify.Marshal(wholeCert(f, "132", 5))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(other)
	// {132}: primitive with exponent 3 (docs/prefix-states.md, small
	// cases), recurrent states (1) and (12), |D| = 14, and the cyclic
	// avoider 123 (its cyclic windows 123, 231, 312 avoid 132)
	withStructure, err := certify.Marshal(assemble(f, []string{"132"}, []spec{wholeSpec(5, 1, true)}, &certify.Structure{
		Class: certify.ClassPrimitive, Exponent: 3, Lambda: certify.LambdaPositive, Recurrent: []int{1, 2}, Configurations: 14, CyclicAvoider: []int{1, 2, 3}}))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(withStructure)
	rng := rand.New(rand.NewPCG(1, 2))
	for range 20 {
		bad, _ := tamper(rng, good)
		f.Add(bad)
	}
	f.Add(good[:len(good)/3])
	f.Add([]byte("{}"))
	opts := certify.CheckOptions{MaxWork: 5_000_000, MaxMemory: 64 << 20}
	f.Fuzz(func(t *testing.T, data []byte) {
		for _, in := range [][]byte{data, redigest(data)} {
			if in == nil {
				continue
			}
			c, err := certify.Read(bytes.NewReader(in))
			if err != nil {
				continue
			}
			if err := certify.Check(bg, c, opts); err != nil {
				if msg := err.Error(); msg == "" || strings.Contains(msg, "\n") || len(msg) > 600 {
					t.Fatalf("refusal is not one short line: %.300q", msg)
				}
				continue
			}
			if out, err := certify.Marshal(c); err != nil || !bytes.Equal(out, in) {
				t.Fatalf("accepted a file that is not canonical: %v", err)
			}
			var why string
			switch set := c.Statement.Patterns; {
			case len(set) == 1 && set[0] == "123":
				why = unsound(t, c, lambda123, "A049774", 4) // OEIS A049774; exponent: docs/prefix-states.md, small cases
			case len(set) == 1 && set[0] == "132":
				why = unsound(t, c, lambda132, "A111004", 3) // OEIS A111004; exponent: the same small cases
			default:
				why = "it is for a set this test cannot verify"
			}
			if why != "" {
				t.Fatalf("accepted a certificate although %s:\n%s", why, in)
			}
		}
	})
}
