package main

import (
	"flag"
	"fmt"
	"io"
	"runtime"
	"runtime/debug"

	"flangeseg/post"
)

// version is the release of the tool (post.Version, which the files it
// writes name); builds from a checkout add the revision they were built
// from.
const version = post.Version

func runVersion(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("version", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		fmt.Fprintln(stderr, "Usage: flangeseg version\n\nPrints the version, the source revision if known, and the Go release.")
	}
	if err := fs.Parse(args); err != nil {
		return parseExit(err)
	}
	rev := ""
	if info, ok := debug.ReadBuildInfo(); ok {
		for _, s := range info.Settings {
			if s.Key == "vcs.revision" {
				rev = " (" + s.Value + ")"
			}
		}
	}
	fmt.Fprintf(stdout, "flangeseg %s%s %s %s/%s\n", version, rev, runtime.Version(), runtime.GOOS, runtime.GOARCH)
	return exitOK
}

// parseExit maps a flag parse error to an exit code: asking for help is
// not an error.
func parseExit(err error) int {
	if err == flag.ErrHelp {
		return exitOK
	}
	return exitBadInput
}
