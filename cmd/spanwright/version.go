package main

import (
	"runtime/debug"
	"strings"
)

// version is what --version prints after the program's name: the module version and the
// version control revision the binary was built from, read from its build information.
func version() string {
	info, ok := debug.ReadBuildInfo()
	return versionText(info, ok)
}

// versionText formats build information: the main module's version ("devel" when the build
// has none, as `go build` in a checkout without a tag gives "(devel)"), then the revision
// (12 hex digits), its commit time and "modified" when the tree had uncommitted changes.
func versionText(info *debug.BuildInfo, ok bool) string {
	if !ok || info == nil {
		return "unknown (no build information in this binary)"
	}
	v := info.Main.Version
	if v == "" || v == "(devel)" {
		v = "devel"
	}
	var rev, at string
	modified := false
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.time":
			at = s.Value
		case "vcs.modified":
			modified = s.Value == "true"
		}
	}
	var parts []string
	if rev != "" {
		if len(rev) > 12 {
			rev = rev[:12]
		}
		parts = append(parts, "revision "+rev)
	}
	if at != "" {
		parts = append(parts, at)
	}
	if modified {
		parts = append(parts, "modified: built with uncommitted changes")
	}
	if rev == "" {
		return v + "; no revision recorded: built outside a checkout, or with -buildvcs=false"
	}
	return v + " (" + strings.Join(parts, ", ") + ")"
}
