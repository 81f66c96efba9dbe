package certify_test

import (
	"math/big"
	"strings"
	"testing"

	"avoidcert/certify"
)

// hostileNumber is about 0.49, with n digits above and below the bar.
func hostileNumber(n int) *big.Rat {
	digits := strings.Repeat("7", n)
	r, _ := new(big.Rat).SetString("8" + digits + "/1" + digits + "1")
	return r
}

// hostileCert is a certificate for {123} near the limits: brackets of every
// step up to MaxStep at nCount values of N each, all with valid digests and
// weak but true bounds of 800 digits, except the last bracket, whose lo is
// false; so the checker does all the work before it finds the false claim.
func hostileCert(t *testing.T, nCount int) *certify.Certificate {
	huge, _ := new(big.Rat).SetString("1" + strings.Repeat("0", 799) + "/1")
	c := &certify.Certificate{Tool: testTool, Statement: certify.Statement{
		Given:  []string{"123"},
		Lambda: certify.Range{Lo: new(big.Rat), Hi: huge, Digits: certify.MaxDigits},
		Radius: certify.Range{Lo: new(big.Rat).Inv(huge), Digits: certify.MaxDigits},
		AllN:   certify.AllN{N0: 2, AN0: big.NewInt(2), MuLo: new(big.Rat)},
	}}
	for step := 1; step <= certify.MaxStep; step++ {
		for n := 2; n < 2+nCount; n++ {
			_, digest, _ := certify.Iterate([]string{"123"}, nil, certify.StartEmpty, n)
			c.Evidence.Brackets = append(c.Evidence.Brackets, certify.Bracket{States: []int{0, 1, 2}, Start: certify.StartEmpty,
				Step: step, N: n, Lo: new(big.Rat), Hi: huge, Upper: step == 1 && n == 2, IterateDigest: digest})
		}
	}
	c.Evidence.Brackets[len(c.Evidence.Brackets)-1].Lo = hostileNumber(800)
	if err := certify.Derive(c); err != nil {
		t.Fatal(err)
	}
	return c
}

func TestHostileLargeCertificate(t *testing.T) {
	// at the bracket limit with numbers at the length limit, the file is
	// over the size limit, and Marshal says so
	c := hostileCert(t, certify.MaxBrackets/certify.MaxStep)
	for i := range c.Evidence.Brackets {
		c.Evidence.Brackets[i].Lo = hostileNumber(certify.MaxNumberLength/2 - 2)
	}
	if _, err := certify.Marshal(c); err == nil || !strings.Contains(err.Error(), "over the limit") {
		t.Fatalf("Marshal of an oversized file: %v", err)
	}
	// long numbers, large steps, many brackets: read, worked through, refused
	data, err := certify.Marshal(hostileCert(t, 2))
	if err != nil {
		t.Fatal(err)
	}
	back, err := certify.Read(strings.NewReader(string(data)))
	if err != nil {
		t.Fatal(err)
	}
	err = certify.Check(bg, back, certify.CheckOptions{})
	if err == nil || !strings.Contains(err.Error(), "evidence.brackets[127]") || !strings.Contains(err.Error(), "lo is above the ratio") {
		t.Fatalf("got %v, want the false lo of the last bracket refused", err)
	}
}

// TestHugeClaimsRefusedCheaply: the largest N on a set with many long
// states is refused by the estimates before any iteration, at the default
// limits.
func TestHugeClaimsRefusedCheaply(t *testing.T) {
	var all []string
	for _, p := range []string{"1234567", "7654321", "1324657", "2143657", "1726354", "3152746"} {
		all = append(all, p)
	}
	big := assemble(t, all, []spec{wholeSpec(6, 1, true)}, nil)
	big.Evidence.Brackets[0].N = certify.MaxN
	big.Statement.AllN.N0 = certify.MaxN
	err := certify.Check(bg, big, certify.CheckOptions{})
	if err == nil || !strings.Contains(err.Error(), "over the checker's limit") {
		t.Fatalf("got %v, want a limit refusal", err)
	}
}

// TestHostileValuesNoPanic feeds Check certificates that no producer would
// make; each must be refused with a message, never a panic.
func TestHostileValuesNoPanic(t *testing.T) {
	huge := new(big.Rat).SetInt(new(big.Int).Lsh(big.NewInt(1), 20000))
	for _, tc := range []struct {
		name   string
		change func(c *certify.Certificate)
	}{
		{"nil lo", func(c *certify.Certificate) { c.Statement.Lambda.Lo = nil }},
		{"nil a_n0", func(c *certify.Certificate) { c.Statement.AllN.AN0 = nil }},
		{"negative lo", func(c *certify.Certificate) { c.Evidence.Brackets[0].Lo = big.NewRat(-1, 2) }},
		{"huge number", func(c *certify.Certificate) { c.Evidence.Brackets[0].Hi = huge }},
		{"no brackets", func(c *certify.Certificate) { c.Evidence.Brackets = nil }},
		{"no patterns", func(c *certify.Certificate) { c.Statement.Given = nil }},
		{"bad pattern", func(c *certify.Certificate) { c.Statement.Given = []string{"1223"} }},
		{"long pattern", func(c *certify.Certificate) { c.Statement.Given = []string{"1.2.3.4.5.6.7.8.9.10"} }},
		{"comma in token", func(c *certify.Certificate) { c.Statement.Given = []string{"123,132"} }},
		{"state out of range", func(c *certify.Certificate) { c.Evidence.Brackets[0].States = []int{0, 1, 3} }},
		{"negative state", func(c *certify.Certificate) { c.Evidence.Brackets[0].States = []int{-1, 1, 2} }},
		{"unsorted states", func(c *certify.Certificate) { c.Evidence.Brackets[0].States = []int{1, 0, 2} }},
		{"no states", func(c *certify.Certificate) { c.Evidence.Brackets[0].States = nil }},
		{"unknown start", func(c *certify.Certificate) { c.Evidence.Brackets[0].Start = "full" }},
		{"step 0", func(c *certify.Certificate) { c.Evidence.Brackets[0].Step = 0 }},
		{"negative n", func(c *certify.Certificate) { c.Evidence.Brackets[0].N = -1 }},
		{"huge n", func(c *certify.Certificate) { c.Evidence.Brackets[0].N = 1 << 40 }},
		{"digits 0", func(c *certify.Certificate) { c.Statement.Lambda.Digits = 0 }},
		{"tool with quote", func(c *certify.Certificate) { c.Tool = `a"b` }},
		{"empty tool", func(c *certify.Certificate) { c.Tool = "" }},
		{"state count", func(c *certify.Certificate) { c.Evidence.States = 4 }},
		{"huge state count", func(c *certify.Certificate) { c.Evidence.States = 1 << 40 }},
		{"duplicate bracket", func(c *certify.Certificate) {
			c.Evidence.Brackets = append(c.Evidence.Brackets, c.Evidence.Brackets[0])
		}},
		{"decimal not derived", func(c *certify.Certificate) { c.Statement.Lambda.LoDecimal = "0.5" }},
		{"canonical not derived", func(c *certify.Certificate) { c.Statement.Canonical = []string{"321"} }},
		{"patterns not derived", func(c *certify.Certificate) { c.Statement.Patterns = []string{"1.2.3"} }},
		{"negative exponent", func(c *certify.Certificate) { c.Structure.Exponent = -4 }},
		{"huge exponent", func(c *certify.Certificate) { c.Structure.Exponent = 1 << 40 }},
		{"cycle start without length", func(c *certify.Certificate) { c.Structure.CycleStart = 3 }},
		{"negative recurrent state", func(c *certify.Certificate) { c.Structure.Recurrent = []int{-1, 2} }},
		{"huge recurrent state", func(c *certify.Certificate) { c.Structure.Recurrent = []int{1, 1 << 40} }},
		{"empty recurrent states", func(c *certify.Certificate) { c.Structure.Recurrent = []int{} }},
		{"empty block", func(c *certify.Certificate) { c.Structure.Blocks = [][]int{{}} }},
		{"huge configurations", func(c *certify.Certificate) { c.Structure.Configurations = 1 << 60 }},
		{"negative configurations", func(c *certify.Certificate) { c.Structure.Configurations = -1 }},
		{"long cyclic avoider", func(c *certify.Certificate) { c.Structure.CyclicAvoider = make([]int, certify.MaxPermLength+1) }},
		{"empty class", func(c *certify.Certificate) { c.Structure.Class = "" }},
		{"empty lambda status", func(c *certify.Certificate) { c.Structure.Lambda = "" }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := goldenCert(t)
			tc.change(c)
			if err := certify.Check(bg, c, certify.CheckOptions{}); err == nil {
				t.Fatal("accepted")
			} else if strings.Contains(err.Error(), "\n") || len(err.Error()) > 600 {
				t.Fatalf("message is not one short line: %.300q", err)
			}
		})
	}
	if err := certify.Check(bg, nil, certify.CheckOptions{}); err == nil {
		t.Fatal("nil certificate accepted")
	}
}
