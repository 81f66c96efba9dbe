package certify_test

import (
	"context"
	"crypto/sha256"
	"encoding/binary"
	"fmt"
	"math/big"
	"os"
	"path/filepath"

	"avoidcert/certify"
)

// A referee checks the certificate that came with a manuscript's claim
// about the pattern 123, binding the check to the set the claim is about.
func Example() {
	f, err := os.Open("testdata/cert-123-n8.json")
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
	if err := certify.Check(context.Background(), c, certify.CheckOptions{Expect: []string{"123"}}); err != nil {
		fmt.Println(err)
		return
	}
	st := c.Statement
	fmt.Printf("lambda in [%s, %s]\n", st.Lambda.LoDecimal, st.Lambda.HiDecimal)
	fmt.Printf("1/lambda in [%s, %s]\n", st.Radius.LoDecimal, st.Radius.HiDecimal)
	fmt.Printf("for n >= %d: a_n/n! <= (%s/%d!) (%s)^(n-%d)\n", st.AllN.N0, st.AllN.AN0, st.AllN.N0, st.AllN.MuHi.RatString(), st.AllN.N0)
	sc := c.Structure
	fmt.Printf("%s with primitivity exponent %d on recurrent states %v (%d configurations); lambda %s (cyclic avoider %v)\n", sc.Class, sc.Exponent, sc.Recurrent, sc.Configurations, sc.Lambda, sc.CyclicAvoider)
	// Output:
	// lambda in [0.807692307692, 0.836734693878]
	// 1/lambda in [1.19512195121, 1.2380952381]
	// for n >= 8: a_n/n! <= (13358/8!) (41/49)^(n-8)
	// primitive with primitivity exponent 4 on recurrent states [1 2] (14 configurations); lambda positive (cyclic avoider [3 2 1])
}

// The same certificate presented for another set is refused.
func ExampleCheck_otherSet() {
	f, _ := os.Open("testdata/cert-123-n8.json")
	defer f.Close()
	c, err := certify.Read(f)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(certify.Check(context.Background(), c, certify.CheckOptions{Expect: []string{"132"}}))
	// Output:
	// certificate rejected: the certificate is for the set 123, not for the expected set 132
}

// A producer fills the free fields and the iterate's digest, lets Derive
// fill the rest, checks and writes. The set {21} keeps only the increasing
// permutations: its prefix states are () and (1), and after n >= 1 values
// the state is (1) with all n-1 other values below it, so G_n is 1 at the
// composition (n-1, 0) of state (1) and 0 elsewhere. At N = 3 the elevated
// G_3 is 3 at (3, 0) and 1 at (2, 1), where G_4 is 1 and 0: the bracket is
// [0, 1/3]. The digest is the byte stream of docs/prefix-states.md, built
// here by hand. The structure section states lambda = 0: the state (1)
// is recurrent (its loop), R_k = {the current value above the start
// value} for every k >= 1 (the joint cycle starts at 1 with length 1), and
// no configuration closes (the copy of the start value would come below
// the current value: a descent).
func ExampleWrite() {
	stream := []byte("avoidcert-iterate-v3\n")
	stream = binary.AppendUvarint(stream, 2) // states
	stream = binary.AppendUvarint(stream, 3) // n
	stream = append(stream, 0)               // state (): composition (3), value 0
	stream = append(stream, 0, 0, 1, 1)      // state (1): (0, 2) and (1, 1) are 0, (2, 0) is 1
	hi := big.NewRat(1, 3)
	c := &certify.Certificate{
		Tool: "avoidcert example",
		Statement: certify.Statement{
			Given:  []string{"21"},
			Lambda: certify.Range{Lo: new(big.Rat), Hi: hi, Digits: 6},
			Radius: certify.Range{Lo: big.NewRat(3, 1), Digits: 6}, // Hi nil: infinite
			AllN:   certify.AllN{N0: 3, AN0: big.NewInt(1), MuLo: new(big.Rat), MuHi: hi},
		},
		Evidence: certify.Evidence{Brackets: []certify.Bracket{
			{States: []int{0, 1}, Start: certify.StartEmpty, Step: 1, N: 3, Lo: new(big.Rat), Hi: hi, Upper: true, IterateDigest: sha256.Sum256(stream)},
		}},
		Structure: &certify.Structure{Class: certify.ClassSubexponential, Lambda: certify.LambdaZero,
			Recurrent: []int{1}, Configurations: 2, CycleStart: 1, CycleLength: 1},
	}
	if err := certify.Derive(c); err != nil {
		fmt.Println(err)
		return
	}
	if err := certify.Check(context.Background(), c, certify.CheckOptions{Expect: []string{"21"}}); err != nil {
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
	fmt.Println(err, back.Statement.Lambda.HiDecimal, back.Evidence.States, back.Structure.Class, back.Structure.Lambda)
	// Output:
	// <nil> 0.333334 2 subexponential zero
}
