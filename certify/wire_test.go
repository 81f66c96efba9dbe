package certify_test

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"avoidcert/certify"
	"avoidcert/internal/brute"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

const goldenPath = "testdata/cert-123-n8.json"

// goldenCert is the small certificate of the golden file: {123}, whole
// system, N = 8, with the structure section (primitive, exponent 4,
// recurrent states 1 and 2, |D| = 14, and the cyclic avoider 321).
func goldenCert(t testing.TB) *certify.Certificate {
	return assemble(t, []string{"123"}, []spec{wholeSpec(8, 1, true)}, structure123())
}

func TestGoldenFile(t *testing.T) {
	data, err := certify.Marshal(goldenCert(t))
	if err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.WriteFile(goldenPath, data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(goldenPath)
	if err != nil {
		t.Fatalf("%v (run go test ./certify/ -run Golden -update to create it)", err)
	}
	if !bytes.Equal(data, want) {
		t.Fatalf("Marshal differs from %s (run with -update if the change is intended):\n%s", goldenPath, data)
	}
	c, err := certify.Read(bytes.NewReader(want))
	if err != nil {
		t.Fatal(err)
	}
	if err := certify.Check(bg, c, certify.CheckOptions{}); err != nil {
		t.Fatal(err)
	}
}

func TestMarshalDeterministic(t *testing.T) {
	// two independent builds and two marshals of each
	a, b := goldenCert(t), goldenCert(t)
	var outs [][]byte
	for _, c := range []*certify.Certificate{a, a, b} {
		data, err := certify.Marshal(c)
		if err != nil {
			t.Fatal(err)
		}
		outs = append(outs, data)
	}
	if !bytes.Equal(outs[0], outs[1]) || !bytes.Equal(outs[0], outs[2]) {
		t.Fatal("Marshal is not byte-identical across calls and builds")
	}
	back, err := certify.Read(bytes.NewReader(outs[0]))
	if err != nil {
		t.Fatal(err)
	}
	again, err := certify.Marshal(back)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(again, outs[0]) {
		t.Fatal("Marshal(Read(file)) differs from the file")
	}
}

// TestContentDigestAsDocumented recomputes content_sha256 by the rule of
// docs/certificate.md: SHA-256 of the compact JSON of the content member.
func TestContentDigestAsDocumented(t *testing.T) {
	data, err := certify.Marshal(cert123(t))
	if err != nil {
		t.Fatal(err)
	}
	var f struct {
		Content json.RawMessage `json:"content"`
		Digest  string          `json:"content_sha256"`
	}
	if err := json.Unmarshal(data, &f); err != nil {
		t.Fatal(err)
	}
	if got := compactDigest(t, f.Content); got != f.Digest {
		t.Fatalf("content_sha256 %s, documented rule gives %s", f.Digest, got)
	}
}

func compactDigest(t testing.TB, content []byte) string {
	var buf bytes.Buffer
	if err := json.Compact(&buf, content); err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256(buf.Bytes())
	return hex.EncodeToString(sum[:])
}

var digestLine = regexp.MustCompile(`(?m)^  "content_sha256": "[^"\n]*",$`)

// redigest recomputes content_sha256 of a (tampered) file as an attacker
// would; it returns nil when the file no longer parses.
func redigest(data []byte) []byte {
	var f struct {
		Content json.RawMessage `json:"content"`
	}
	if json.Unmarshal(data, &f) != nil || f.Content == nil {
		return nil
	}
	var buf bytes.Buffer
	if json.Compact(&buf, f.Content) != nil {
		return nil
	}
	sum := sha256.Sum256(buf.Bytes())
	return digestLine.ReplaceAll(data, []byte(`  "content_sha256": "`+hex.EncodeToString(sum[:])+`",`))
}

func TestReadRefusesDamagedFiles(t *testing.T) {
	good, err := certify.Marshal(goldenCert(t))
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name   string
		data   []byte
		reason string
	}{
		{"empty", nil, "truncated"},
		{"cut", good[:len(good)/2], "truncated"},
		{"cut before the last brace", good[:len(good)-2], "truncated"},
		{"other JSON", []byte(`{"content": {"format": "something else"}}`), "not an avoidcert certificate"},
		{"not JSON", []byte("hello\n"), "truncated"},
		{"newer version", redigest(bytes.Replace(good, []byte(`"version": 4,`), []byte(`"version": 5,`), 1)), "format version 5"},
		{"version 3", redigest(bytes.Replace(good, []byte(`"version": 4,`), []byte(`"version": 3,`), 1)), "format version 3 (its structure section on order cells) is no longer checked; re-issue it with `avoidcert bound"},
		{"version 2", redigest(bytes.Replace(good, []byte(`"version": 4,`), []byte(`"version": 2,`), 1)), "re-issue it with `avoidcert bound"},
		{"version 1", redigest(bytes.Replace(good, []byte(`"version": 4,`), []byte(`"version": 1,`), 1)), "format version 1 (order cells) is no longer checked"},
		{"version as a huge number", redigest(bytes.Replace(good, []byte(`"version": 4,`), []byte(`"version": 4`+strings.Repeat("0", 100000)+`,`), 1)), "format version 4000"},
		{"version as an object", redigest(bytes.Replace(good, []byte(`"version": 4,`), []byte("\"version\": {\n},"), 1)), "content.version is not a number"},
		{"version key case", redigest(bytes.Replace(good, []byte(`"version": 4,`), []byte(`"Version": 4,`), 1)), "\"Version\" is not a member name"},
		{"CRLF line endings", bytes.ReplaceAll(good, []byte("\n"), []byte("\r\n")), "CRLF"},
		{"extra whitespace", bytes.Replace(good, []byte(`"n": `), []byte(`"n":  `), 1), "canonical form"},
		{"escaped character", redigest(bytes.Replace(good, []byte(`"patterns": [
        "123"`), []byte(`"patterns": [
        "\u0031\u0032\u0033"`), 1)), "canonical form"},
		{"unknown member", redigest(bytes.Replace(good, []byte(`"n": `), []byte(`"nn": 1, "n": `), 1)), "\"nn\" is not a member name"},
		{"member of another place", redigest(bytes.Replace(good, []byte(`"n": `), []byte(`"tool": "x", "n": `), 1)), "unknown field"},
		{"key case", redigest(bytes.Replace(good, []byte(`"n": `), []byte(`"N": `), 1)), "\"N\" is not a member name"},
		{"digest not redone", bytes.Replace(good, []byte(`"tool": "avoidcert`), []byte(`"tool": "Avoidcert`), 1), "content_sha256 does not match"},
		{"data after", append(bytes.Clone(good), good...), "not valid JSON"},
		{"too large", append(bytes.Repeat([]byte(" "), certify.MaxFileSize), good...), "larger than the limit"},
		{"long number", redigest(bytes.Replace(good, []byte(`"mu_lo": "`), []byte(`"mu_lo": "`+strings.Repeat("1", 5000)), 1)), "over the limit"},
		{"huge n", redigest(bytes.Replace(good, []byte(`"n": 8`), []byte(`"n": 80000`), 1)), "out of range"},
		{"n not an integer", redigest(bytes.Replace(good, []byte(`"n": 8`), []byte(`"n": 8.5`), 1)), "a number 8.5 where the format has another kind of value"},
		{"start unknown", redigest(bytes.Replace(good, []byte(`"start": "empty"`), []byte(`"start": "full"`), 1)), "not one of empty, ones, whole"},
		{"infinite lo", redigest(bytes.Replace(good, []byte(`"mu_lo": "`), []byte(`"mu_lo": "", "x": "`), 1)), "\"x\" is not a member name"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if tc.data == nil && tc.name != "empty" {
				t.Fatal("test input did not build")
			}
			_, err := certify.Read(bytes.NewReader(tc.data))
			if err == nil {
				t.Fatal("accepted")
			}
			if !strings.Contains(err.Error(), tc.reason) {
				t.Fatalf("refused for %q, want a reason containing %q", err, tc.reason)
			}
		})
	}
}

func TestTruncationDetected(t *testing.T) {
	good, err := certify.Marshal(goldenCert(t))
	if err != nil {
		t.Fatal(err)
	}
	for n := 0; n < len(good); n++ {
		if _, err := certify.Read(bytes.NewReader(good[:n])); err == nil {
			t.Fatalf("file cut to %d of %d bytes accepted", n, len(good))
		}
	}
}

// tamperCert has brackets of both steps, a restricted one, and the
// structure section, so that tampers reach every kind of field.
func tamperCert(t testing.TB) *certify.Certificate {
	return assemble(t, []string{"123"}, []spec{wholeSpec(6, 1, true), wholeSpec(5, 2, false),
		{states: []int{1, 2}, start: certify.StartWhole, step: 1, n: 6}}, structure123())
}

// freeKeys are the members a producer may choose (within the inequalities);
// a changed value there may still be a true, proved certificate.
var freeKeys = map[string]bool{"tool": true, "lo": true, "hi": true, "mu_lo": true, "mu_hi": true,
	"class": true, "lambda_status": true, "cyclic_avoider": true, "upper": true}

var memberLine = regexp.MustCompile(`^(\s*)"([a-z_0-9]+)": (.*?)(,?)$`)

// tamper changes one character (or token) of one field of the file, or
// cuts it, and returns the new file and the member it changed.
func tamper(rng *rand.Rand, data []byte) ([]byte, string) {
	lines := strings.SplitAfter(string(data), "\n")
	if rng.IntN(20) == 0 {
		return data[:rng.IntN(len(data))], "truncation"
	}
	for {
		i := rng.IntN(len(lines))
		line := strings.TrimSuffix(lines[i], "\n")
		key, value, start := "", strings.TrimSuffix(strings.TrimSpace(line), ","), strings.Index(line, strings.TrimSpace(line))
		if m := memberLine.FindStringSubmatch(line); m != nil {
			key, value = m[2], m[3]
			start = len(m[1]) + len(key) + 4
			if rng.IntN(10) == 0 { // change the member name itself
				j := len(m[1]) + 1 + rng.IntN(len(key))
				lines[i] = line[:j] + string(otherChar(rng, line[j])) + line[j+1:] + "\n"
				return []byte(strings.Join(lines, "")), "name of " + key
			}
		} else {
			key = arrayKey(lines, i)
		}
		if value == "" || value == "{" || value == "[" || value == "}" || value == "]" || key == "content_sha256" {
			continue
		}
		var changed string
		switch value {
		case "true":
			changed = "false"
		case "false":
			changed = "true"
		default:
			j := rng.IntN(len(value))
			if value[j] == '"' {
				continue
			}
			changed = value[:j] + string(otherChar(rng, value[j])) + value[j+1:]
		}
		lines[i] = line[:start] + changed + line[start+len(value):] + "\n"
		return []byte(strings.Join(lines, "")), key
	}
}

// arrayKey returns the name of the array holding line i.
func arrayKey(lines []string, i int) string {
	for j := i - 1; j >= 0; j-- {
		if m := memberLine.FindStringSubmatch(strings.TrimSuffix(lines[j], "\n")); m != nil && m[3] == "[" {
			return m[2]
		}
	}
	return ""
}

// otherChar returns a different character of the same kind.
func otherChar(rng *rand.Rand, c byte) byte {
	var kind string
	switch {
	case c >= '0' && c <= '9':
		kind = "0123456789"
	case c >= 'a' && c <= 'f':
		kind = "0123456789abcdef"
	case c >= 'a' && c <= 'z':
		kind = "abcdefghijklmnopqrstuvwxyz"
	default:
		kind = "/.-, ()!^"
	}
	for {
		if d := kind[rng.IntN(len(kind))]; d != c {
			return d
		}
	}
}

// TestRandomTampersRejected changes one field at random, thousands of
// times. Left as they are, every tampered file is refused. With the
// content digest recomputed, a tamper of a derived field or of the
// evidence is refused, and a tamper of a free bound is refused unless what
// it states is still true (checked against the published lambda(123), the
// counts of OEIS A049774 and the structure of {123}).
func TestRandomTampersRejected(t *testing.T) {
	good, err := certify.Marshal(tamperCert(t))
	if err != nil {
		t.Fatal(err)
	}
	opts := certify.CheckOptions{Expect: []string{"123"}}
	verify := func(data []byte) (*certify.Certificate, error) {
		c, err := certify.Read(bytes.NewReader(data))
		if err != nil {
			return nil, err
		}
		return c, certify.Check(bg, c, opts)
	}
	rng := rand.New(rand.NewPCG(2003, 123))
	const n = 1500
	rejectedRaw, rejectedResealed, acceptedFree := 0, 0, 0
	for range n {
		bad, key := tamper(rng, good)
		if bytes.Equal(bad, good) {
			continue
		}
		if _, err := verify(bad); err == nil {
			t.Fatalf("tamper of %s accepted without a recomputed digest:\n%s", key, bad)
		}
		rejectedRaw++
		resealed := redigest(bad)
		if resealed == nil {
			rejectedResealed++
			continue
		}
		c, err := verify(resealed)
		if err != nil {
			rejectedResealed++
			continue
		}
		if !freeKeys[key] {
			t.Fatalf("tamper of %s accepted with a recomputed digest:\n%s", key, resealed)
		}
		if why := unsound(t, c, lambda123, "A049774", 4); why != "" {
			t.Fatalf("tamper of %s accepted although %s:\n%s", key, why, resealed)
		}
		acceptedFree++
	}
	t.Logf("%d tampers: %d refused as written; with the digest recomputed %d refused, %d accepted (free bounds, still true)", n, rejectedRaw, rejectedResealed, acceptedFree)
	if rejectedRaw < 1000 || rejectedResealed < 1000 {
		t.Fatalf("only %d and %d tampers refused; want at least 1000 each", rejectedRaw, rejectedResealed)
	}
}

// unsound returns what is false in an accepted certificate, or "" when its
// claims agree with the published growth rate, the counts of an OEIS table
// and the structure of a primitive set of one length-3 pattern with the
// given exponent (docs/prefix-states.md, small cases), its cyclic avoider
// checked by brute force.
func unsound(t *testing.T, c *certify.Certificate, lambda float64, oeis string, exponent int) string {
	if why := unsoundStructure(c, exponent); why != "" {
		return why
	}
	st := c.Statement
	if !contains(st.Lambda, lambda) {
		return fmt.Sprintf("lambda [%s, %s] misses the published value", st.Lambda.LoDecimal, st.Lambda.HiDecimal)
	}
	rlo, _ := st.Radius.Lo.Float64()
	rhi := math.Inf(1)
	if st.Radius.Hi != nil {
		rhi, _ = st.Radius.Hi.Float64()
	}
	if r := 1 / lambda; rlo > r*(1+1e-14) || rhi < r*(1-1e-14) {
		return "the radius interval misses 1/lambda"
	}
	for _, b := range c.Evidence.Brackets {
		lo, _ := b.Lo.Float64()
		if p := math.Pow(lambda, float64(b.Step)); lo > p*(1+1e-13) {
			return "a bracket's lo exceeds lambda^d"
		}
		if b.Hi != nil {
			if hi, _ := b.Hi.Float64(); hi < math.Pow(lambda, float64(b.Step))*(1-1e-13) {
				return "a bracket's hi is below lambda^d"
			}
		}
	}
	terms, _ := oeisTerms(t, oeis) // offset 0
	A := new(big.Rat).SetFrac(st.AllN.AN0, new(big.Int).MulRange(1, int64(st.AllN.N0)))
	lo, hi := new(big.Rat).Set(A), new(big.Rat).Set(A)
	for n := st.AllN.N0; n < len(terms); n++ {
		x := new(big.Rat).SetFrac(terms[n], new(big.Int).MulRange(1, int64(n)))
		if x.Cmp(lo) < 0 || (st.AllN.MuHi != nil && x.Cmp(hi) > 0) {
			return fmt.Sprintf("the all-n bounds fail at n = %d", n)
		}
		lo.Mul(lo, st.AllN.MuLo)
		if st.AllN.MuHi != nil {
			hi.Mul(hi, st.AllN.MuHi)
		}
	}
	return ""
}

// unsoundStructure returns what is false in the structure section of a
// set of one pattern of length 3 whose prefix states (), (1), (12) are
// numbered 0, 1, 2, (1) and (12) recurrent, so that |D| = C(2,1) +
// 2 C(3,1) + C(4,2) = 14 (by hand, docs/prefix-states.md), and which is
// primitive with the given exponent; a cyclic avoider is checked by brute
// force.
func unsoundStructure(c *certify.Certificate, exponent int) string {
	st := c.Structure
	if st == nil {
		return ""
	}
	pats := parsePats(c.Statement.Patterns)
	switch st.Class {
	case certify.ClassUndecided:
	case certify.ClassPrimitive:
		if st.Exponent != exponent {
			return fmt.Sprintf("the exponent is %d, not %d", st.Exponent, exponent)
		}
		if !slices.Equal(st.Recurrent, []int{1, 2}) || st.Configurations != 14 {
			return fmt.Sprintf("recurrent states %v and %d configurations, not [1 2] and 14", st.Recurrent, st.Configurations)
		}
	default:
		return fmt.Sprintf("class %s, but the set is primitive", st.Class)
	}
	switch st.Lambda {
	case certify.LambdaUndecided:
	case certify.LambdaPositive:
		p := st.CyclicAvoider
		for i := range p {
			window := []int{p[i], p[(i+1)%len(p)], p[(i+2)%len(p)]}
			if len(p) < 3 || !brute.Avoids(window, pats) {
				return fmt.Sprintf("%v is not a cyclic avoider", p)
			}
		}
	default:
		return "lambda_status zero, but lambda > 0"
	}
	return ""
}

func TestWriteAtomic(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "claim.json")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	c := goldenCert(t)
	if err := certify.Write(path, c); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := certify.Marshal(c)
	if !bytes.Equal(got, want) {
		t.Fatal("written file differs from Marshal")
	}
	// an invalid certificate writes nothing and leaves the old file
	c.Statement.Lambda.Lo = nil
	if err := certify.Write(path, c); err == nil {
		t.Fatal("Write of an invalid certificate succeeded")
	}
	if again, _ := os.ReadFile(path); !bytes.Equal(again, want) {
		t.Fatal("failed Write changed the file")
	}
	if err := certify.Write(filepath.Join(dir, "missing", "x.json"), goldenCert(t)); err == nil {
		t.Fatal("Write into a missing directory succeeded")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Fatalf("directory holds %d entries, want only the certificate (no temporary files left)", len(entries))
	}
}

func TestReindentedFileNamed(t *testing.T) {
	good, err := certify.Marshal(goldenCert(t))
	if err != nil {
		t.Fatal(err)
	}
	var compact, wide bytes.Buffer
	if err := json.Compact(&compact, good); err != nil {
		t.Fatal(err)
	}
	if err := json.Indent(&wide, good, "", "    "); err != nil {
		t.Fatal(err)
	}
	for name, data := range map[string][]byte{"compacted": compact.Bytes(), "re-indented": wide.Bytes(), "compacted with a newline": append(compact.Bytes(), '\n')} {
		_, err := certify.Read(bytes.NewReader(data))
		if err == nil || !strings.Contains(err.Error(), "not in canonical form: re-indented?") {
			t.Errorf("%s: got %v, want the re-indented diagnosis", name, err)
		}
	}
}

// TestMessagesQuoteLittle feeds Read values of hundreds of kilobytes in
// every kind of field; no message may quote more than a few dozen
// characters of them.
func TestMessagesQuoteLittle(t *testing.T) {
	good, err := certify.Marshal(goldenCert(t))
	if err != nil {
		t.Fatal(err)
	}
	long := strings.Repeat("7", 300000)
	for _, tc := range []struct{ old, new string }{
		{`"n": 8`, `"n": ` + long},
		{`"step": 1`, `"step": ` + long},
		{`"digits": 12`, `"digits": -` + long},
		{`"mu_lo": "`, `"mu_lo": "` + long},
		{`"tool": "`, `"tool": "` + long},
		{`"start": "empty"`, `"start": "` + long + `"`},
		{`"upper": true`, `"upper": "` + long + `"`},
		{`"n": 8`, `"` + long + `": 8`},
		{`"class": "primitive"`, `"class": "` + long + `"`},
		{`"cyclic_avoider": "321"`, `"cyclic_avoider": "` + long + `"`},
		{`"patterns_given": [`, `"patterns_given": ["` + long + `",`},
	} {
		data := redigest(bytes.Replace(good, []byte(tc.old), []byte(tc.new), 1))
		if data == nil {
			data = bytes.Replace(good, []byte(tc.old), []byte(tc.new), 1)
		}
		_, err := certify.Read(bytes.NewReader(data))
		if err == nil {
			t.Errorf("%.20s...: accepted", tc.new)
			continue
		}
		if n := len(err.Error()); n > 400 {
			t.Errorf("%.20s...: message of %d characters: %.200s", tc.new, n, err)
		}
	}
}

// TestOldVersionsRefusedWithAdvice reads the version 2 and version 3
// files that earlier checkers wrote for {123}.
func TestOldVersionsRefusedWithAdvice(t *testing.T) {
	for file, want := range map[string]string{
		"testdata/cert-123-k6-v2.json": "certificate: format version 2 (order cells) is no longer checked; re-issue it with `avoidcert bound PATTERNS --out FILE`",
		"testdata/cert-123-n8-v3.json": "certificate: format version 3 (its structure section on order cells) is no longer checked; re-issue it with `avoidcert bound PATTERNS --out FILE`",
	} {
		data, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		_, err = certify.Read(bytes.NewReader(data))
		if err == nil || !strings.Contains(err.Error(), want) || strings.Contains(err.Error(), "\n") {
			t.Errorf("%s: got %v", file, err)
		}
	}
}
