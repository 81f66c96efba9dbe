package report

import (
	"bytes"
	"context"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// chromiumFlags keep a headless Chromium off the network and away from the
// user's profile.
var chromiumFlags = []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
	"--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"}

// The HTML report opened in a real headless Chromium: the DOM it built has
// the title and both figures, and a screenshot shows them drawn (enough
// dark pixels in the figures' part of the page, which a blank or broken
// SVG would not give).
func TestHTMLInChromium(t *testing.T) {
	browser := findTool("chromium", "chromium-browser")
	if browser == "" {
		t.Skip("chromium is not installed (apt-get install -y chromium; .ci/run installs it): the HTML report is not opened in a browser")
	}
	dir := t.TempDir()
	var page bytes.Buffer
	if err := HTML(&page, &Document{Certificates: load(t, "cert-1342.json")}); err != nil {
		t.Fatal(err)
	}
	html := filepath.Join(dir, "report.html")
	if err := os.WriteFile(html, page.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	run := func(extra ...string) []byte {
		ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
		defer cancel()
		args := append(append(append([]string{}, chromiumFlags...), "--user-data-dir="+t.TempDir()), extra...)
		cmd := exec.CommandContext(ctx, browser, append(args, "file://"+html)...)
		var out, errb bytes.Buffer
		cmd.Stdout, cmd.Stderr = &out, &errb
		if err := cmd.Run(); err != nil {
			t.Fatalf("%s: %v\n%s", browser, err, errb.String())
		}
		return out.Bytes()
	}
	dom := string(run("--dump-dom"))
	if !strings.Contains(dom, "<title>avoidcert report</title>") {
		t.Errorf("the DOM has no title:\n%.500s", dom)
	}
	if n := strings.Count(dom, "<svg"); n != 2 {
		t.Errorf("the DOM has %d SVG figures, want 2", n)
	}
	shot := filepath.Join(dir, "report.png")
	run("--screenshot="+shot, "--window-size=1200,1600")
	f, err := os.Open(shot)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	// The figures start below the table, at about a third of the page.
	b := img.Bounds()
	dark := 0
	for y := b.Min.Y + b.Dy()/3; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			if r+g+bl < 3*0x8000 {
				dark++
			}
		}
	}
	if dark < 5000 {
		t.Errorf("only %d dark pixels in the lower two thirds of the screenshot: the figures were not drawn", dark)
	}
	t.Logf("%d dark pixels below the table", dark)
}
