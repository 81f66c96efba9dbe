package certify

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math/big"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
)

// The wire form: the JSON members in the order they are written. Numbers
// that can be large are strings; an absent optional bound means +inf.

type wireFile struct {
	Content       wireContent `json:"content"`
	ContentSHA256 string      `json:"content_sha256"`
	End           string      `json:"end"`
}

type wireContent struct {
	Format    string        `json:"format"`
	Version   int           `json:"version"`
	Tool      string        `json:"tool"`
	Statement wireStatement `json:"statement"`
	Evidence  wireEvidence  `json:"evidence"`
}

type wireStatement struct {
	Given     []string  `json:"patterns_given"`
	Patterns  []string  `json:"patterns"`
	Canonical []string  `json:"canonical_patterns"`
	Quantity  string    `json:"quantity"`
	Lambda    wireRange `json:"lambda"`
	Radius    wireRange `json:"radius"`
	AllN      wireAllN  `json:"all_n"`
	// optional, with evidence.structure
	Structure *wireStructureClaim `json:"structure,omitempty"`
}

type wireStructureClaim struct {
	Class        string  `json:"class"`
	Exponent     int     `json:"primitivity_exponent,omitempty"`
	Period       int     `json:"period,omitempty"`
	FiniteFrom   int     `json:"finite_from,omitempty"`
	Blocks       [][]int `json:"blocks,omitempty"`
	LambdaStatus string  `json:"lambda_status"`
}

type wireRange struct {
	Lo        string `json:"lo"`
	Hi        string `json:"hi,omitempty"`
	Digits    int    `json:"digits"`
	LoDecimal string `json:"lo_decimal"`
	HiDecimal string `json:"hi_decimal,omitempty"`
}

type wireAllN struct {
	N0   int    `json:"n0"`
	AN0  string `json:"a_n0"`
	MuLo string `json:"mu_lo"`
	MuHi string `json:"mu_hi,omitempty"`
}

type wireEvidence struct {
	Method        string        `json:"method"`
	MethodVersion int           `json:"method_version"`
	States        int           `json:"states"`
	Brackets      []wireBracket `json:"brackets"`
	// optional, with statement.structure
	Structure *wireStructureEvidence `json:"structure,omitempty"`
}

type wireStructureEvidence struct {
	Method         string          `json:"method"`
	MethodVersion  int             `json:"method_version"`
	Recurrent      []int           `json:"recurrent_states,omitempty"`
	Configurations int             `json:"configurations,omitempty"`
	JointCycle     *wireJointCycle `json:"joint_cycle,omitempty"`
	CyclicAvoider  string          `json:"cyclic_avoider,omitempty"`
}

type wireJointCycle struct {
	Start  int `json:"start"`
	Length int `json:"length"`
}

type wireBracket struct {
	States []int  `json:"states"`
	Start  string `json:"start"`
	Step   int    `json:"step"`
	N      int    `json:"n"`
	Lo     string `json:"lo"`
	Hi     string `json:"hi,omitempty"`
	Upper  bool   `json:"upper"`
	Digest string `json:"iterate_sha256"`
}

// fileEnd is how every canonical file ends; a file cut short lacks it.
const fileEnd = "  \"end\": \"" + EndMarker + "\"\n}\n"

// Marshal returns the canonical file of c. It refuses a certificate that
// Read could not read back (a missing number, a value out of range, a
// string with characters outside the allowed set); it does not check the
// mathematics. Marshal of the same certificate is byte-identical on every
// machine.
func Marshal(c *Certificate) ([]byte, error) {
	w, err := toWire(c)
	if err == nil {
		_, err = fromWire(w)
	}
	if err != nil {
		return nil, fmt.Errorf("certificate: %v", err)
	}
	data, err := render(w)
	if err == nil && len(data) > MaxFileSize {
		err = fmt.Errorf("certificate: the file would have %d bytes, over the limit of %d that Read accepts; use fewer brackets or shorter bounds", len(data), MaxFileSize)
	}
	return data, err
}

// render writes the canonical file of a validated content: the indented
// JSON of the file object and a final newline.
func render(w wireContent) ([]byte, error) {
	sum, err := contentDigest(w)
	if err != nil {
		return nil, err
	}
	out, err := json.MarshalIndent(wireFile{Content: w, ContentSHA256: hex.EncodeToString(sum[:]), End: EndMarker}, "", "  ")
	if err != nil {
		return nil, err
	}
	return append(out, '\n'), nil
}

// contentDigest is the SHA-256 of the compact JSON of the content object.
func contentDigest(w wireContent) ([32]byte, error) {
	compact, err := json.Marshal(w)
	if err != nil {
		return [32]byte{}, err
	}
	return sha256.Sum256(compact), nil
}

// Read reads one certificate file and checks its form: size, end marker,
// format and version, strict JSON with only the known members, every field
// within its limits, the content digest, and the canonical layout (the file
// must be byte-identical to what Marshal writes). It does not check the
// mathematics; call Check for that.
func Read(r io.Reader) (*Certificate, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxFileSize+1))
	if err != nil {
		return nil, fmt.Errorf("certificate: read: %v", err)
	}
	if len(data) > MaxFileSize {
		return nil, fmt.Errorf("certificate: file is larger than the limit of %d bytes; no certificate this checker writes is that large, so this is not one", MaxFileSize)
	}
	// The whole file's syntax first (trailing data included), then a
	// plain tree of it, whose keys are exactly as written: the typed
	// decoder below matches member names regardless of case.
	var tree map[string]any
	treeErr := json.Unmarshal(data, new(json.RawMessage))
	if treeErr == nil {
		dec := json.NewDecoder(bytes.NewReader(data))
		dec.UseNumber()
		treeErr = dec.Decode(&tree)
	}
	content, _ := tree["content"].(map[string]any)
	format, _ := content["format"].(string)
	end, _ := tree["end"].(string)
	if treeErr == nil && format != Format {
		return nil, fmt.Errorf("certificate: content.format is %q, not %q: this is not an avoidcert certificate", abbreviate(format), Format)
	}
	if bytes.Contains(data, []byte("\r\n")) {
		return nil, errors.New("certificate: the file has CRLF line endings (changed by a text-mode copy or a line-ending conversion?); certificates use LF only, restore the original file")
	}
	if treeErr != nil || end != EndMarker {
		// a re-indented or compacted file still parses and still ends
		// with the marker; only a cut or damaged one lands here
		if !bytes.HasSuffix(data, []byte(fileEnd)) {
			return nil, fmt.Errorf("certificate: truncated or damaged: the file does not end with the end marker %q", EndMarker)
		}
		if treeErr != nil {
			return nil, fmt.Errorf("certificate: %s", jsonProblem(treeErr))
		}
		return nil, fmt.Errorf("certificate: end marker is %q, not %q", abbreviate(end), EndMarker)
	}
	version, hasVersion := content["version"]
	if hasVersion {
		if err := checkVersion(version); err != nil {
			return nil, err
		}
	}
	if name, ok := unknownMember(tree); ok {
		return nil, fmt.Errorf("certificate: %q is not a member name of format version %d (names are exact, in lower case)", abbreviate(name), Version)
	}
	if !hasVersion {
		return nil, errors.New("certificate: content.version is missing")
	}
	var f wireFile
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&f); err != nil {
		return nil, fmt.Errorf("certificate: %s", jsonProblem(err))
	}
	if dec.More() {
		return nil, errors.New("certificate: data after the certificate object")
	}
	c, err := fromWire(f.Content)
	if err != nil {
		return nil, fmt.Errorf("certificate: %v", err)
	}
	// The file must be exactly the canonical rendering of what it holds.
	// When only the digest line differs, the content was changed after
	// writing; otherwise the layout is not canonical.
	w, err := toWire(c)
	if err != nil {
		return nil, fmt.Errorf("certificate: %v", err)
	}
	canonical, err := render(w)
	if err != nil {
		return nil, err
	}
	if !bytes.Equal(canonical, data) {
		want, got := bytes.SplitAfter(canonical, []byte("\n")), bytes.SplitAfter(data, []byte("\n"))
		var differ []int
		for i := range max(len(want), len(got)) {
			if i >= len(want) || i >= len(got) || !bytes.Equal(want[i], got[i]) {
				differ = append(differ, i)
			}
		}
		if len(want) == len(got) && len(differ) == 1 && bytes.HasPrefix(got[differ[0]], []byte(`  "content_sha256": `)) {
			return nil, errors.New("certificate: content_sha256 does not match the content: the file was changed after it was written")
		}
		var compactData, compactCanonical bytes.Buffer
		if json.Compact(&compactData, data) == nil && json.Compact(&compactCanonical, canonical) == nil && bytes.Equal(compactData.Bytes(), compactCanonical.Bytes()) {
			return nil, errors.New("certificate: not in canonical form: re-indented? The file holds the same JSON content in another layout (spaces, line breaks); certificates are compared byte for byte, so restore the file as it was written")
		}
		return nil, fmt.Errorf("certificate: not in canonical form (first difference on line %d); files are compared byte for byte with what the writer produces", differ[0]+1)
	}
	return c, nil
}

// checkVersion refuses every content.version but Version, naming the
// command that re-issues a certificate of an older version.
func checkVersion(version any) error {
	n, ok := version.(json.Number)
	if !ok {
		return errors.New("certificate: content.version is not a number")
	}
	switch v := n.String(); v {
	case fmt.Sprint(Version):
		return nil
	case "1", "2":
		return fmt.Errorf("certificate: format version %s (order cells) is no longer checked; re-issue it with `avoidcert bound PATTERNS --out FILE`, which writes version %d (prefix states)", v, Version)
	case "3":
		return fmt.Errorf("certificate: format version 3 (its structure section on order cells) is no longer checked; re-issue it with `avoidcert bound PATTERNS --out FILE`, which writes version %d (structure on prefix states)", Version)
	default:
		return fmt.Errorf("certificate: format version %s; this checker reads version %d only", abbreviate(v), Version)
	}
}

// memberNames holds every member name of the format, from the JSON
// tags of the wire types. All are in lower case, so a key that the typed
// decoder matched at its place regardless of case and that is also in
// this set is the exact name of that member.
var memberNames = func() map[string]bool {
	names := map[string]bool{}
	var walk func(t reflect.Type)
	walk = func(t reflect.Type) {
		switch t.Kind() {
		case reflect.Pointer, reflect.Slice:
			walk(t.Elem())
		case reflect.Struct:
			for i := range t.NumField() {
				name, _, _ := strings.Cut(t.Field(i).Tag.Get("json"), ",")
				names[name] = true
				walk(t.Field(i).Type)
			}
		}
	}
	walk(reflect.TypeFor[wireFile]())
	return names
}()

// unknownMember returns the first key of the tree, in sorted order at
// each level, that is not exactly a member name of the format.
func unknownMember(v any) (string, bool) {
	switch v := v.(type) {
	case map[string]any:
		keys := make([]string, 0, len(v))
		for k := range v {
			keys = append(keys, k)
		}
		slices.Sort(keys)
		for _, k := range keys {
			if !memberNames[k] {
				return k, true
			}
			if name, ok := unknownMember(v[k]); ok {
				return name, true
			}
		}
	case []any:
		for _, x := range v {
			if name, ok := unknownMember(x); ok {
				return name, true
			}
		}
	}
	return "", false
}

// Write writes the canonical file of c to path atomically: into a
// temporary file in the same directory, flushed to disk, then renamed over
// path. It refuses to replace anything that is not a regular file (a
// device, a FIFO, a folder, a symbolic link). On any error path is left as
// it was.
func Write(path string, c *Certificate) (err error) {
	data, err := Marshal(c)
	if err != nil {
		return err
	}
	if info, err := os.Lstat(path); err == nil && !info.Mode().IsRegular() {
		return fmt.Errorf("certificate: %s is not a regular file (%s); it is left alone: choose another path", path, info.Mode().Type())
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return fmt.Errorf("certificate: %v", err)
	}
	defer func() {
		if err != nil {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if _, err = tmp.Write(data); err != nil {
		return fmt.Errorf("certificate: %v", err)
	}
	if err = tmp.Chmod(0o644); err != nil {
		return fmt.Errorf("certificate: %v", err)
	}
	if err = tmp.Sync(); err != nil {
		return fmt.Errorf("certificate: %v", err)
	}
	if err = tmp.Close(); err != nil {
		return fmt.Errorf("certificate: %v", err)
	}
	if err = os.Rename(tmp.Name(), path); err != nil {
		return fmt.Errorf("certificate: %v", err)
	}
	if dir, derr := os.Open(filepath.Dir(path)); derr == nil {
		dir.Sync() // make the rename durable where the platform allows
		dir.Close()
	}
	return nil
}

// toWire formats c. It fails on missing or negative numbers only; limits
// are fromWire's business.
func toWire(c *Certificate) (wireContent, error) {
	if c == nil {
		return wireContent{}, errors.New("nil certificate")
	}
	s := c.Statement
	w := wireContent{
		Format:  Format,
		Version: Version,
		Tool:    c.Tool,
		Statement: wireStatement{
			Given:     s.Given,
			Patterns:  s.Patterns,
			Canonical: s.Canonical,
			Quantity:  Quantity,
		},
		Evidence: wireEvidence{Method: Method, MethodVersion: MethodVersion, States: c.Evidence.States},
	}
	var err error
	rat := func(name string, r *big.Rat, optional bool) string {
		switch {
		case err != nil:
			return ""
		case r == nil && optional:
			return ""
		case r == nil:
			err = fmt.Errorf("%s is missing", name)
			return ""
		case r.Sign() < 0:
			err = fmt.Errorf("%s is negative", name)
			return ""
		}
		return formatRational(r)
	}
	rng := func(name string, r Range) wireRange {
		return wireRange{Lo: rat(name+".lo", r.Lo, false), Hi: rat(name+".hi", r.Hi, true), Digits: r.Digits,
			LoDecimal: r.LoDecimal, HiDecimal: r.HiDecimal}
	}
	w.Statement.Lambda = rng("statement.lambda", s.Lambda)
	w.Statement.Radius = rng("statement.radius", s.Radius)
	w.Statement.AllN = wireAllN{N0: s.AllN.N0, MuLo: rat("statement.all_n.mu_lo", s.AllN.MuLo, false),
		MuHi: rat("statement.all_n.mu_hi", s.AllN.MuHi, true)}
	if err == nil {
		switch {
		case s.AllN.AN0 == nil:
			err = errors.New("statement.all_n.a_n0 is missing")
		case s.AllN.AN0.Sign() < 0:
			err = errors.New("statement.all_n.a_n0 is negative")
		default:
			w.Statement.AllN.AN0 = s.AllN.AN0.String()
		}
	}
	for i, b := range c.Evidence.Brackets {
		name := fmt.Sprintf("evidence.brackets[%d]", i)
		w.Evidence.Brackets = append(w.Evidence.Brackets, wireBracket{
			States: b.States, Start: string(b.Start), Step: b.Step, N: b.N,
			Lo: rat(name+".lo", b.Lo, false), Hi: rat(name+".hi", b.Hi, true),
			Upper: b.Upper, Digest: hex.EncodeToString(b.IterateDigest[:]),
		})
	}
	if st := c.Structure; st != nil {
		w.Statement.Structure, w.Evidence.Structure = structureToWire(st)
	}
	return w, err
}

// structureToWire formats a structure section; validation is
// structureFromWire's business.
func structureToWire(st *Structure) (*wireStructureClaim, *wireStructureEvidence) {
	claim := &wireStructureClaim{Class: string(st.Class), Exponent: st.Exponent, Period: st.Period,
		FiniteFrom: st.N1, Blocks: st.Blocks, LambdaStatus: string(st.Lambda)}
	ev := &wireStructureEvidence{Method: StructureMethod, MethodVersion: StructureMethodVersion,
		Recurrent: st.Recurrent, Configurations: st.Configurations}
	if st.CycleStart != 0 || st.CycleLength != 0 {
		ev.JointCycle = &wireJointCycle{Start: st.CycleStart, Length: st.CycleLength}
	}
	if st.CyclicAvoider != nil {
		ev.CyclicAvoider = formatPerm(st.CyclicAvoider)
	}
	return claim, ev
}

// maxConfigurations bounds the configurations member: |D| of MaxStates
// states of length 8 is below 46234^2 C(16, 8) < 3e13.
const maxConfigurations = 1 << 50

// structureFromWire parses and validates a structure section: fixed
// strings, known names, ranges, state numbers, permutations in their one
// spelling. The result owns all its values.
func structureFromWire(claim *wireStructureClaim, ev *wireStructureEvidence) (*Structure, error) {
	fail := func(field, format string, args ...any) (*Structure, error) {
		return nil, fmt.Errorf("%s: %s", field, fmt.Sprintf(format, args...))
	}
	st := &Structure{Class: StructureClass(claim.Class), Lambda: LambdaStatus(claim.LambdaStatus),
		Exponent: claim.Exponent, Period: claim.Period, N1: claim.FiniteFrom, Configurations: ev.Configurations}
	switch {
	case ev.Method != StructureMethod:
		return fail("evidence.structure.method", "%q is not %q", abbreviate(ev.Method), StructureMethod)
	case ev.MethodVersion != StructureMethodVersion:
		return fail("evidence.structure.method_version", "%d is not %d", ev.MethodVersion, StructureMethodVersion)
	}
	switch st.Class {
	case ClassPrimitive, ClassPeriodic, ClassReducible, ClassFinite, ClassSubexponential, ClassUndecided:
	default:
		return fail("statement.structure.class", "%q is not one of primitive, periodic, reducible, finite, subexponential, undecided", abbreviate(claim.Class))
	}
	switch st.Lambda {
	case LambdaPositive, LambdaZero, LambdaUndecided:
	default:
		return fail("statement.structure.lambda_status", "%q is not one of positive, zero, undecided", abbreviate(claim.LambdaStatus))
	}
	for _, n := range []struct {
		field    string
		v, limit int
	}{
		{"statement.structure.primitivity_exponent", st.Exponent, MaxJointSteps},
		{"statement.structure.period", st.Period, MaxJointSteps},
		{"statement.structure.finite_from", st.N1, MaxStates + 1},
		{"evidence.structure.configurations", st.Configurations, maxConfigurations},
	} {
		if n.v < 0 || n.v > n.limit {
			return fail(n.field, "%d out of range 0..%d", n.v, n.limit)
		}
	}
	if len(claim.Blocks) > MaxStates {
		return fail("statement.structure.blocks", "%d blocks; a set has at most %d states", len(claim.Blocks), MaxStates)
	}
	if claim.Blocks != nil {
		st.Blocks = make([][]int, len(claim.Blocks))
	}
	for i, b := range claim.Blocks {
		field := fmt.Sprintf("statement.structure.blocks[%d]", i)
		if err := checkStateList(b); err != nil {
			return fail(field, "%v", err)
		}
		st.Blocks[i] = append([]int(nil), b...)
	}
	if ev.Recurrent != nil {
		if err := checkStateList(ev.Recurrent); err != nil {
			return fail("evidence.structure.recurrent_states", "%v", err)
		}
		st.Recurrent = append([]int(nil), ev.Recurrent...)
	}
	if jc := ev.JointCycle; jc != nil {
		if jc.Start < 0 || jc.Start > MaxJointSteps || jc.Length < 1 || jc.Length > MaxJointSteps {
			return fail("evidence.structure.joint_cycle", "start %d and length %d out of range (0..%d and 1..%d)", jc.Start, jc.Length, MaxJointSteps, MaxJointSteps)
		}
		st.CycleStart, st.CycleLength = jc.Start, jc.Length
	}
	if ev.CyclicAvoider != "" {
		p, err := parsePerm(ev.CyclicAvoider)
		if err != nil {
			return fail("evidence.structure.cyclic_avoider", "%v", err)
		}
		st.CyclicAvoider = p
	}
	return st, nil
}

// checkStateList accepts a list of state numbers: 1 to MaxStates of them,
// each in 0..MaxStates-1, strictly increasing. Whether they are states of
// the set is Check's business.
func checkStateList(states []int) error {
	if len(states) == 0 || len(states) > MaxStates {
		return fmt.Errorf("%d states; give 1 to %d", len(states), MaxStates)
	}
	for i, p := range states {
		switch {
		case p < 0 || p >= MaxStates:
			return fmt.Errorf("state %d out of range 0..%d", p, MaxStates-1)
		case i > 0 && p <= states[i-1]:
			return fmt.Errorf("not strictly increasing at entry %d", i)
		}
	}
	return nil
}

// fromWire parses and validates a content object: fixed strings, limits,
// number syntax. The result owns all its values.
func fromWire(w wireContent) (*Certificate, error) {
	fail := func(field, format string, args ...any) (*Certificate, error) {
		return nil, fmt.Errorf("%s: %s", field, fmt.Sprintf(format, args...))
	}
	switch {
	case w.Format != Format:
		return fail("format", "%q is not %q", abbreviate(w.Format), Format)
	case w.Version != Version:
		return fail("version", "%d; this checker reads version %d only", w.Version, Version)
	case (w.Statement.Structure == nil) != (w.Evidence.Structure == nil):
		return fail("structure", "statement.structure and evidence.structure come together or not at all")
	case w.Statement.Quantity != Quantity:
		return fail("statement.quantity", "%q is not %q, the only quantity of version %d", abbreviate(w.Statement.Quantity), Quantity, Version)
	case w.Evidence.Method != Method:
		return fail("evidence.method", "%q is not %q", abbreviate(w.Evidence.Method), Method)
	case w.Evidence.MethodVersion != MethodVersion:
		return fail("evidence.method_version", "%d is not %d", w.Evidence.MethodVersion, MethodVersion)
	}
	if err := checkText(w.Tool); err != nil {
		return fail("tool", "%v", err)
	}
	c := &Certificate{Tool: w.Tool}
	st := &c.Statement
	var err error
	lists := []struct {
		name string
		in   []string
		out  *[]string
	}{
		{"statement.patterns_given", w.Statement.Given, &st.Given},
		{"statement.patterns", w.Statement.Patterns, &st.Patterns},
		{"statement.canonical_patterns", w.Statement.Canonical, &st.Canonical},
	}
	for _, l := range lists {
		if len(l.in) == 0 || len(l.in) > MaxGiven {
			return fail(l.name, "%d patterns; give 1 to %d", len(l.in), MaxGiven)
		}
		for _, tok := range l.in {
			if err := checkToken(tok); err != nil {
				return fail(l.name, "%v", err)
			}
		}
		*l.out = append([]string(nil), l.in...)
	}
	if st.Lambda, err = parseRange("statement.lambda", w.Statement.Lambda); err != nil {
		return nil, err
	}
	if st.Radius, err = parseRange("statement.radius", w.Statement.Radius); err != nil {
		return nil, err
	}
	a := w.Statement.AllN
	if a.N0 < 0 || a.N0 > MaxN {
		return fail("statement.all_n.n0", "%d out of range 0..%d", a.N0, MaxN)
	}
	st.AllN.N0 = a.N0
	if st.AllN.AN0, err = parseInteger(a.AN0); err != nil {
		return fail("statement.all_n.a_n0", "%v", err)
	}
	if st.AllN.MuLo, err = parseRational(a.MuLo); err != nil {
		return fail("statement.all_n.mu_lo", "%v", err)
	}
	if a.MuHi != "" {
		if st.AllN.MuHi, err = parseRational(a.MuHi); err != nil {
			return fail("statement.all_n.mu_hi", "%v", err)
		}
	}
	ev := w.Evidence
	if ev.States < 1 || ev.States > MaxStates {
		return fail("evidence.states", "%d out of range 1..%d", ev.States, MaxStates)
	}
	c.Evidence.States = ev.States
	if len(ev.Brackets) == 0 || len(ev.Brackets) > MaxBrackets {
		return fail("evidence.brackets", "%d brackets; give 1 to %d", len(ev.Brackets), MaxBrackets)
	}
	for i, b := range ev.Brackets {
		name := fmt.Sprintf("evidence.brackets[%d]", i)
		if len(b.States) == 0 || len(b.States) > ev.States {
			return fail(name+".states", "%d states; give 1 to evidence.states = %d", len(b.States), ev.States)
		}
		switch Start(b.Start) {
		case StartEmpty, StartOnes, StartWhole:
		default:
			return fail(name+".start", "%q is not one of empty, ones, whole", abbreviate(b.Start))
		}
		if b.Step < 1 || b.Step > MaxStep {
			return fail(name+".step", "%d out of range 1..%d", b.Step, MaxStep)
		}
		if b.N < 0 || b.N > MaxN {
			return fail(name+".n", "%d out of range 0..%d", b.N, MaxN)
		}
		nb := Bracket{States: append([]int(nil), b.States...), Start: Start(b.Start), Step: b.Step, N: b.N, Upper: b.Upper}
		if nb.Lo, err = parseRational(b.Lo); err != nil {
			return fail(name+".lo", "%v", err)
		}
		if b.Hi != "" {
			if nb.Hi, err = parseRational(b.Hi); err != nil {
				return fail(name+".hi", "%v", err)
			}
		}
		if len(b.Digest) != 64 || strings.ToLower(b.Digest) != b.Digest {
			return fail(name+".iterate_sha256", "not 64 lowercase hexadecimal digits")
		}
		if _, err := hex.Decode(nb.IterateDigest[:], []byte(b.Digest)); err != nil {
			return fail(name+".iterate_sha256", "not 64 lowercase hexadecimal digits")
		}
		c.Evidence.Brackets = append(c.Evidence.Brackets, nb)
	}
	if w.Statement.Structure != nil {
		if c.Structure, err = structureFromWire(w.Statement.Structure, w.Evidence.Structure); err != nil {
			return nil, err
		}
	}
	return c, nil
}

func parseRange(name string, w wireRange) (Range, error) {
	var r Range
	var err error
	if r.Lo, err = parseRational(w.Lo); err != nil {
		return r, fmt.Errorf("%s.lo: %v", name, err)
	}
	if w.Hi != "" {
		if r.Hi, err = parseRational(w.Hi); err != nil {
			return r, fmt.Errorf("%s.hi: %v", name, err)
		}
	}
	if w.Digits < 1 || w.Digits > MaxDigits {
		return r, fmt.Errorf("%s.digits: %d out of range 1..%d", name, w.Digits, MaxDigits)
	}
	r.Digits = w.Digits
	for _, d := range []struct{ field, s string }{{"lo_decimal", w.LoDecimal}, {"hi_decimal", w.HiDecimal}} {
		if len(d.s) > 2*MaxNumberLength+MaxDigits {
			return r, fmt.Errorf("%s.%s: %d characters, over the limit", name, d.field, len(d.s))
		}
		if strings.Trim(d.s, "0123456789.") != "" {
			return r, fmt.Errorf("%s.%s: %q is not a decimal", name, d.field, abbreviate(d.s))
		}
	}
	r.LoDecimal, r.HiDecimal = w.LoDecimal, w.HiDecimal
	return r, nil
}

// checkText accepts the tool string: 1 to MaxToolLength printable ASCII
// characters other than the ones JSON or HTML would escape.
func checkText(s string) error {
	if s == "" || len(s) > MaxToolLength {
		return fmt.Errorf("%d characters; give 1 to %d", len(s), MaxToolLength)
	}
	for _, c := range s {
		if c < 0x20 || c > 0x7e || strings.ContainsRune(`"\<>&`, c) {
			return fmt.Errorf("character %q is not allowed (printable ASCII other than \" \\ < > &)", c)
		}
	}
	return nil
}

// checkToken accepts a pattern token: digits and dots only.
func checkToken(s string) error {
	if s == "" || len(s) > MaxTokenLength {
		return fmt.Errorf("pattern token of %d characters; give 1 to %d", len(s), MaxTokenLength)
	}
	if strings.Trim(s, "0123456789.") != "" {
		return fmt.Errorf("pattern token %q has characters other than digits and dots", abbreviate(s))
	}
	return nil
}

// jsonProblem describes a decoding error in a few dozen characters of the
// input at most: the decoder's own messages quote whole values (a number
// of three million digits would make a three-megabyte line).
func jsonProblem(err error) string {
	var typeErr *json.UnmarshalTypeError
	var syntaxErr *json.SyntaxError
	switch {
	case errors.As(err, &typeErr):
		return fmt.Sprintf("%s: a %s where the format has another kind of value (at byte %d)", abbreviate(typeErr.Field), abbreviate(typeErr.Value), typeErr.Offset)
	case errors.As(err, &syntaxErr):
		return fmt.Sprintf("not valid JSON at byte %d (a character out of place: the file was changed or damaged)", syntaxErr.Offset)
	}
	return abbreviate(err.Error())
}
