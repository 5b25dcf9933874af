package tests

import (
	"os/exec"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// TestArchitecture keeps the dependency arrows of DEVELOPERS.md true:
// ui -> report -> logbook -> setup -> {machine, physiology, profiles}, one
// way: physiology and machine import the standard library and gonum only;
// profiles the standard library only; setup never imports logbook, report
// or ui; logbook (the handover log store) imports setup and what setup
// may, never report or ui; report (the text, card and sheet for people)
// imports logbook, setup and what they may, never ui; and nothing but ui
// and main imports a terminal library.
func TestArchitecture(t *testing.T) {
	out, err := exec.Command("go", "list", "-f", "{{.ImportPath}}|{{join .Imports \" \"}}", "crankside/...").CombinedOutput()
	require.NoError(t, err, "%s", out)
	imports := map[string][]string{}
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		pkg, deps, _ := strings.Cut(line, "|")
		imports[pkg] = strings.Fields(deps)
	}
	require.Contains(t, imports, "crankside/physiology")
	require.Contains(t, imports, "crankside/ui/cli")
	require.Contains(t, imports, "crankside/profiles/safetext")
	require.Contains(t, imports, "crankside/logbook")
	require.Contains(t, imports, "crankside/report")
	std := func(p string) bool {
		return !strings.Contains(strings.Split(p, "/")[0], ".") && !strings.HasPrefix(p, "crankside")
	}
	gonum := func(p string) bool { return strings.HasPrefix(p, "gonum.org/v1/gonum/") }
	terminal := func(p string) bool {
		return strings.HasPrefix(p, "github.com/charmbracelet/") || strings.HasPrefix(p, "github.com/NimbleMarkets/") ||
			strings.HasPrefix(p, "github.com/muesli/")
	}
	// safetext is the one terminal-safe text function, below everything, so
	// any package may use it; it imports the standard library only.
	safetext := func(p string) bool { return p == "crankside/profiles/safetext" }
	core := func(p string) bool {
		return std(p) || gonum(p) || safetext(p) || p == "crankside/physiology" || p == "crankside/machine" || p == "crankside/profiles"
	}
	allowed := map[string]func(string) bool{
		"crankside/physiology":        func(p string) bool { return std(p) || gonum(p) || safetext(p) },
		"crankside/machine":           func(p string) bool { return std(p) || gonum(p) || safetext(p) },
		"crankside/profiles/safetext": std,
		"crankside/profiles":          func(p string) bool { return std(p) || safetext(p) },
		"crankside/setup":             core,
		"crankside/logbook":           func(p string) bool { return core(p) || p == "crankside/setup" },
		"crankside/report":            func(p string) bool { return core(p) || p == "crankside/setup" || p == "crankside/logbook" },
	}
	for pkg, ok := range allowed {
		for _, dep := range imports[pkg] {
			require.True(t, ok(dep), "%s must not import %s", pkg, dep)
		}
	}
	for pkg, deps := range imports {
		// main dispatches to ui/cli, whose screen command starts ui.
		if pkg == "crankside" || pkg == "crankside/ui" || pkg == "crankside/ui/cli" {
			continue
		}
		for _, dep := range deps {
			require.False(t, terminal(dep), "%s imports the terminal library %s: only ui and main may", pkg, dep)
			require.NotEqual(t, "crankside/ui", dep, "%s must not import ui", pkg)
		}
	}
	// The UI computes nothing of its own: it reaches the core through setup.
	for _, pkg := range []string{"crankside/ui", "crankside/ui/cli"} {
		for _, dep := range imports[pkg] {
			require.NotEqual(t, "crankside/machine", dep, "%s must not use machine directly", pkg)
		}
	}
}
