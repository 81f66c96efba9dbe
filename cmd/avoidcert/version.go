package main

import (
	"fmt"
	"io"
	"runtime/debug"
)

// version is the release of avoidcert; the build information adds which
// build of it this is.
const version = "0.1.0"

const versionUsage = `Usage: avoidcert version

Prints the version of avoidcert, the module version and the version
control revision it was built from (with "modified" when the working tree
had uncommitted changes), and the Go release. Builds made by 'go run' or
'go test', or outside a repository, carry no revision: it says "unknown"
then. Certificates record the same in their "tool" field.
`

// build is what the build information says of this binary.
type build struct {
	module   string // the main module's version, e.g. v0.1.0 or (devel)
	revision string // the VCS revision, "" when the build carries none
	modified bool   // the working tree had uncommitted changes
	goVer    string
}

// readBuild reads the build information (runtime/debug.ReadBuildInfo).
func readBuild() build {
	b := build{module: "unknown"}
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return b
	}
	b.goVer = info.GoVersion
	if v := info.Main.Version; v != "" {
		b.module = v
	}
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			b.revision = s.Value
		case "vcs.modified":
			b.modified = s.Value == "true"
		}
	}
	return b
}

// revisionWords is the revision with its dirty flag, or "unknown".
func (b build) revisionWords(short bool) string {
	if b.revision == "" {
		return "unknown"
	}
	r := b.revision
	if short && len(r) > 12 {
		r = r[:12]
	}
	if b.modified {
		r += ", modified"
	}
	return r
}

// toolName is what certificates record as their producing tool: the
// version, the module version and the revision (within the format's 200
// characters).
func toolName() string {
	b := readBuild()
	return fmt.Sprintf("avoidcert %s (module %s, revision %s)", version, b.module, b.revisionWords(true))
}

// printVersion is the output of 'avoidcert version'.
func printVersion(w io.Writer) {
	b := readBuild()
	fmt.Fprintf(w, "avoidcert %s\n", version)
	fmt.Fprintf(w, "module:   %s\n", b.module)
	fmt.Fprintf(w, "revision: %s\n", b.revisionWords(false))
	if b.goVer != "" {
		fmt.Fprintf(w, "go:       %s\n", b.goVer)
	}
}
