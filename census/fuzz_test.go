package census

import (
	"context"
	"os"
	"path/filepath"
	"testing"
)

// FuzzVerify feeds Verify any census.json beside honest stand-in
// certificates: it must never panic, and whatever it accepts states each
// class's lambda as the class's certificate does.
func FuzzVerify(f *testing.F) {
	seedDir := f.TempDir()
	if _, err := Run(context.Background(), options(seedDir, 3, &fakeCertifier{})); err != nil {
		f.Fatal(err)
	}
	honest, err := os.ReadFile(filepath.Join(seedDir, JSONFile))
	if err != nil {
		f.Fatal(err)
	}
	f.Add(honest)
	f.Add([]byte(`{"format":"avoidcert-census","version":2,"rows":[{"representative":"123","certificate":"../x"}]}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		dir := t.TempDir()
		if err := os.CopyFS(dir, os.DirFS(seedDir)); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, JSONFile), data, 0o644); err != nil {
			t.Fatal(err)
		}
		rep, err := Verify(context.Background(), dir, fakeCheck, 1)
		if err != nil {
			return
		}
		for _, r := range rep.Rows {
			want := fakeCertificate(r.Representative, 5, defaultValue(r.Representative)).Statement.Lambda
			if r.Lambda.Lo != want.LoDecimal || r.Lambda.Hi != want.HiDecimal {
				t.Errorf("accepted class %s with lambda %v, its certificate states [%s, %s]", r.Representative, r.Lambda, want.LoDecimal, want.HiDecimal)
			}
		}
	})
}
