package certify_test

import (
	"math/big"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/pattern"
)

// hostileNumber is about 0.49, with n digits above and below the bar.
func hostileNumber(n int) *big.Rat {
	digits := strings.Repeat("7", n)
	r, _ := new(big.Rat).SetString("8" + digits + "/1" + digits + "1")
	return r
}

// hostileCert is a certificate for {123} near the limits: brackets of every
// step up to MaxStep at kCount degrees each, all with valid digests and
// weak but true bounds of 800 digits, except the last bracket, whose lo is
// false; so the checker does all the work before it finds the false claim.
func hostileCert(t *testing.T, kCount int) *certify.Certificate {
	set, _ := pattern.ParseSet([]string{"123"})
	huge, _ := new(big.Rat).SetString("1" + strings.Repeat("0", 799) + "/1")
	c := &certify.Certificate{Tool: testTool, Statement: certify.Statement{
		Given:  []string{"123"},
		Lambda: certify.Range{Lo: new(big.Rat), Hi: huge, Digits: certify.MaxDigits},
		Radius: certify.Range{Lo: new(big.Rat).Inv(huge), Digits: certify.MaxDigits},
		AllN:   certify.AllN{N0: 2, AN0: big.NewInt(2), MuLo: new(big.Rat)},
	}}
	for step := 1; step <= certify.MaxStep; step++ {
		for k := range kCount {
			digest, _ := certify.IterateDigest(set, nil, k)
			c.Evidence.Brackets = append(c.Evidence.Brackets, certify.Bracket{Cells: []int{0, 1}, Step: step, K: k,
				Lo: new(big.Rat), Hi: huge, Upper: step == 1 && k == 0, IterateDigest: digest})
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
	err = certify.Check(back, certify.CheckOptions{})
	if err == nil || !strings.Contains(err.Error(), "evidence.brackets[127]") || !strings.Contains(err.Error(), "lo is above the ratio") {
		t.Fatalf("got %v, want the false lo of the last bracket refused", err)
	}
}
