package main

import (
	"os"
	"path/filepath"
	"runtime/debug"
	"strings"
)

// invokedAs returns the words of a command that runs gapwise again the way
// the user ran it, for the demo's hint of what to run next, given
// os.Args[0].
//
// A binary that `go run` built lives in a temporary go-build folder (the
// go command's documented temporary work directory) and is removed when
// it ends, so the hint is a go run command: `go run PATH@VERSION` when the
// build info names a released version of the module, else a go run of the
// command's folder relative to the working directory, found by walking up
// to the go.mod that declares the main module ("go run ./cmd/gapwise" from
// the module's root, "go run ." from the command's folder); "go run
// ./cmd/gapwise" when no such go.mod is found. A binary on PATH (no
// separator in arg0) is named as typed; one given by a path keeps that
// path, which works from the same working directory.
func invokedAs(arg0 string) []string {
	if !strings.Contains(filepath.ToSlash(arg0), "/go-build") {
		return []string{arg0}
	}
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return []string{"go", "run", goRunTarget("", "", "", "")}
	}
	wd, _ := os.Getwd()
	return []string{"go", "run", goRunTarget(bi.Path, bi.Main.Path, bi.Main.Version, wd)}
}

// goRunTarget returns what to go run for the main package pkg of module
// mod at version ver, from the folder wd (see invokedAs).
func goRunTarget(pkg, mod, ver, wd string) string {
	const fallback = "./cmd/gapwise"
	if pkg == "" {
		return fallback
	}
	if ver != "" && ver != "(devel)" {
		return pkg + "@" + ver
	}
	root := moduleRoot(wd, mod)
	if root == "" || !strings.HasPrefix(pkg, mod) {
		return fallback
	}
	dir := filepath.Join(root, filepath.FromSlash(strings.TrimPrefix(pkg, mod)))
	rel, err := filepath.Rel(wd, dir)
	if err != nil {
		return fallback
	}
	rel = filepath.ToSlash(rel)
	if rel != "." && !strings.HasPrefix(rel, "../") {
		rel = "./" + rel
	}
	return rel
}

// moduleRoot returns the nearest folder at or above dir whose go.mod
// declares module mod, or "".
func moduleRoot(dir, mod string) string {
	if dir == "" || mod == "" {
		return ""
	}
	for {
		if b, err := os.ReadFile(filepath.Join(dir, "go.mod")); err == nil && modulePath(b) == mod {
			return dir
		}
		parent := filepath.Dir(dir)
		if parent == dir {
			return ""
		}
		dir = parent
	}
}

// modulePath returns the path of the module directive of a go.mod file,
// or "".
func modulePath(gomod []byte) string {
	for _, line := range strings.Split(string(gomod), "\n") {
		f := strings.Fields(line)
		if len(f) >= 2 && f[0] == "module" {
			return strings.Trim(f[1], `"`)
		}
	}
	return ""
}
