package certify_test

import (
	"context"
	"fmt"
	"math/big"
	"os"
	"path/filepath"

	"avoidcert/certify"
	transfer "avoidcert/internal/cellform/transfer"
	"avoidcert/pattern"
	"avoidcert/structure"
)

// A referee checks the certificate that came with a manuscript's claim
// about the pattern 123, binding the check to the set the claim is about.
func Example() {
	f, err := os.Open("testdata/cert-123-k6.json")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer f.Close()
	c, err := certify.Read(f)
	if err != nil {
		fmt.Println(err)
		return
	}
	claimed, _ := pattern.ParseSet([]string{"123"})
	if err := certify.Check(c, certify.CheckOptions{Expect: claimed}); err != nil {
		fmt.Println(err)
		return
	}
	st := c.Statement
	fmt.Printf("lambda in [%s, %s]\n", st.Lambda.LoDecimal, st.Lambda.HiDecimal)
	fmt.Printf("1/lambda in [%s, %s]\n", st.Radius.LoDecimal, st.Radius.HiDecimal)
	fmt.Printf("for n >= %d: a_n/n! <= (%s/%d!) (%s)^(n-%d)\n", st.AllN.N0, st.AllN.AN0, st.AllN.N0, st.AllN.MuHi.RatString(), st.AllN.N0)
	sc := c.Structure
	fmt.Printf("%s with exponent %d (%d witnesses); lambda %s (cyclic avoider %s)\n", sc.Class, sc.Exponent, len(sc.Witnesses), sc.Lambda, sc.CyclicAvoider)
	// Output:
	// lambda in [0.807692307692, 0.836734693878]
	// 1/lambda in [1.19512195121, 1.2380952381]
	// for n >= 8: a_n/n! <= (13358/8!) (41/49)^(n-8)
	// primitive with exponent 4 (24 witnesses); lambda positive (cyclic avoider 321)
}

// The same certificate presented for another set is refused.
func ExampleCheck_otherSet() {
	f, _ := os.Open("testdata/cert-123-k6.json")
	defer f.Close()
	c, err := certify.Read(f)
	if err != nil {
		fmt.Println(err)
		return
	}
	claimed, _ := pattern.ParseSet([]string{"132"})
	fmt.Println(certify.Check(c, certify.CheckOptions{Expect: claimed}))
	// Output:
	// certificate rejected: the certificate is for the set 123, not for the expected set 132
}

// A producer fills the free fields, takes a_n0 and the iterate digest from
// the engine and the structure section from the structure pass, lets
// Derive fill the rest, checks and writes. The set {21} keeps only
// increasing permutations, so G_k is 1 at the single index (k, 0) and the
// bracket at k = 3 is [0, 1/4]; its only cycle is the loop of the window
// 12, so lambda = 0 needs no further evidence (docs/certificate.md lists
// the members each class needs).
func ExampleWrite() {
	set, _ := pattern.ParseSet([]string{"21"})
	eng := transfer.New(transfer.FromSet(set))
	g := eng.Start()
	for range 3 {
		g, _ = eng.Next(context.Background(), g)
	}
	hi := big.NewRat(1, 4)
	c := &certify.Certificate{
		Tool: "avoidcert example",
		Statement: certify.Statement{
			Given:  []string{"21"},
			Lambda: certify.Range{Lo: new(big.Rat), Hi: hi, Digits: 6},
			Radius: certify.Range{Lo: big.NewRat(4, 1), Digits: 6}, // Hi nil: infinite
			AllN:   certify.AllN{N0: 4, AN0: g.Sum(), MuLo: new(big.Rat), MuHi: hi},
		},
		Evidence: certify.Evidence{Brackets: []certify.Bracket{
			{Cells: []int{0}, Step: 1, K: 3, Lo: new(big.Rat), Hi: hi, Upper: true, IterateDigest: g.Digest()},
		}},
	}
	rep, err := structure.Analyze(context.Background(), set, structure.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	c.Structure = &certify.Structure{Class: certify.StructureClass(rep.Class), Lambda: certify.LambdaStatus(rep.Lambda)}
	if err := certify.Derive(c); err != nil {
		fmt.Println(err)
		return
	}
	if err := certify.Check(c, certify.CheckOptions{Expect: set}); err != nil {
		fmt.Println(err)
		return
	}
	dir, _ := os.MkdirTemp("", "certify-example")
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "increasing.json")
	if err := certify.Write(path, c); err != nil {
		fmt.Println(err)
		return
	}
	f, _ := os.Open(path)
	defer f.Close()
	back, err := certify.Read(f)
	fmt.Println(err, back.Statement.Lambda.HiDecimal, back.Statement.AllN.AN0, back.Structure.Class, back.Structure.Lambda)
	// Output:
	// <nil> 0.25 1 subexponential zero
}
