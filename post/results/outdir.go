package results

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"

	"flangeseg/post"
)

// MarkerFile names the file that marks a directory as a flangeseg result.
// Every result directory the command writes holds it; a directory without
// it that holds anything is not flangeseg's to replace.
const MarkerFile = "flangeseg_result.txt"

// Kinds of result directory, the first line of the marker file names one.
const (
	KindRun        = "run"          // one model's run
	KindComparison = "comparison"   // runs side by side (compare, demo) and their comparison
	KindFatigue    = "fatigue"      // a bolt fatigue assessment
	KindMesh       = "mesh"         // a mesh to look at
	KindSweep      = "sweep"        // a sweep's cases and tables, resumed in place
	KindRing       = "ring"         // a ring check: its classes run as a sweep, resumed in place, and the per-bolt tables
	KindVerify     = "verification" // the verification problems' fields or matrices (verify -o, --dump-matrix)
	KindMatrices   = "matrices"     // a run's first tangent and residual (run --dump-matrix)
)

// ErrNotResult is wrapped by the error of an output directory that exists
// and holds something other than an earlier flangeseg result.
var ErrNotResult = errors.New("holds files that are not a flangeseg result")

// CheckOutDir reports whether dir may receive a result: it does not
// exist, is empty, or is an earlier result (it holds MarkerFile). An error
// wrapping ErrNotResult says what is in the way.
func CheckOutDir(dir string) error {
	info, err := os.Stat(dir)
	switch {
	case errors.Is(err, os.ErrNotExist):
		return nil
	case err != nil:
		return fmt.Errorf("output directory %s: %w", dir, err)
	case !info.IsDir():
		return fmt.Errorf("output directory %s: is a file: %w; give -o a new or empty directory, or an earlier result", dir, ErrNotResult)
	}
	if IsResult(dir) || markingNow(dir) {
		return nil
	}
	names, err := dirNames(dir, 3)
	if err != nil {
		return fmt.Errorf("output directory %s: %w", dir, err)
	}
	if len(names) == 0 {
		return nil
	}
	return fmt.Errorf("output directory %s %w (it has %s, and no %s): flangeseg replaces only an earlier result of its own; give -o a new or empty directory",
		dir, ErrNotResult, strings.Join(names, ", "), MarkerFile)
}

// markingNow reports whether another flangeseg process is writing dir's
// marker at this moment (its temporary file, post.WriteFileAtomic's,
// stands beside no marker yet): the shards of a sweep or ring share one
// result directory, and the first to mark it must not make the others
// refuse it.
func markingNow(dir string) bool {
	tmp, _ := filepath.Glob(filepath.Join(dir, "."+MarkerFile+".tmp-*"))
	return len(tmp) > 0
}

// IsResult reports whether dir holds the marker of a flangeseg result.
func IsResult(dir string) bool {
	info, err := os.Stat(filepath.Join(dir, MarkerFile))
	return err == nil && info.Mode().IsRegular()
}

// dirNames returns up to n names of dir's entries (n+1 means "and more").
func dirNames(dir string, n int) ([]string, error) {
	f, err := os.Open(dir)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	names, err := f.Readdirnames(n + 1)
	if err != nil && !errors.Is(err, io.EOF) {
		return nil, err
	}
	if len(names) > n {
		names = append(names[:n], "…")
	}
	return names, nil
}

// Mark writes the marker file of a result of the given kind into dir.
func Mark(dir, kind string) error {
	return post.WriteFileAtomic(filepath.Join(dir, MarkerFile), func(w io.Writer) error {
		_, err := fmt.Fprintf(w, "%s\nThis directory is a flangeseg %s result, written by flangeseg %s.\nflangeseg replaces it whole when told to write here again (-o); it refuses a directory without this file that holds anything.\n",
			kind, kind, post.Version)
		return err
	})
}

// Staging is a result directory being written under a temporary name
// beside its final place (Dir), so that the final directory changes only
// once, whole, when Commit renames it into place: an interrupted or
// failed write never leaves old and new files mixed.
type Staging struct {
	Final string // where the result goes
	Dir   string // where it is written meanwhile
}

// Stage checks final (CheckOutDir) and creates the temporary directory
// beside it, named .NAME.writing-HOST-PID-*: the host and process that
// write it. Staging directories of the same NAME that a process of this
// host left behind when it was killed outright (a signal it could not
// catch, a power cut) are removed first; those of live processes and of
// other hosts (a shared file system on a cluster) are left alone.
func Stage(final string) (*Staging, error) {
	if err := CheckOutDir(final); err != nil {
		return nil, err
	}
	parent, base := filepath.Split(filepath.Clean(final))
	if parent == "" {
		parent = "."
	}
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, fmt.Errorf("output directory %s: %w", final, err)
	}
	host := stagingHost()
	removeOrphans(parent, base, host)
	dir, err := os.MkdirTemp(parent, fmt.Sprintf(".%s.writing-%s-%d-", base, host, os.Getpid()))
	if err != nil {
		return nil, fmt.Errorf("output directory %s: %w", final, err)
	}
	if err := os.Chmod(dir, 0o755); err != nil {
		os.RemoveAll(dir)
		return nil, fmt.Errorf("output directory %s: %w", final, err)
	}
	return &Staging{Final: final, Dir: dir}, nil
}

// Empty reports whether nothing has been written into the staging
// directory.
func (s *Staging) Empty() bool {
	names, err := dirNames(s.Dir, 1)
	return err == nil && len(names) == 0
}

// Discard removes the staging directory; the final one stays as it was.
func (s *Staging) Discard() error { return os.RemoveAll(s.Dir) }

// Commit marks the staging directory as a result of kind and puts it in
// place of the final directory, which, if it exists, must still be empty
// or an earlier result; that is removed whole.
func (s *Staging) Commit(kind string) error {
	if err := Mark(s.Dir, kind); err != nil {
		return err
	}
	if err := CheckOutDir(s.Final); err != nil {
		return err
	}
	old := ""
	if _, err := os.Stat(s.Final); err == nil {
		// Rename the old result aside first: a rename onto a directory
		// that is not empty fails.
		old = s.Dir + ".old"
		if err := os.Rename(s.Final, old); err != nil {
			return fmt.Errorf("output directory %s: moving the earlier result aside: %w", s.Final, err)
		}
	}
	if err := os.Rename(s.Dir, s.Final); err != nil {
		if old != "" {
			err = errors.Join(err, os.Rename(old, s.Final))
		}
		return fmt.Errorf("output directory %s: %w", s.Final, err)
	}
	if old != "" {
		if err := os.RemoveAll(old); err != nil {
			return fmt.Errorf("output directory %s: removing the earlier result (moved to %s): %w", s.Final, old, err)
		}
	}
	return nil
}

// WriteStaged writes a result of kind into dir whole: it stages dir
// (Stage), lets write fill the staging directory and commits it; if
// write fails, the staging directory is removed and dir stays as it was.
func WriteStaged(dir, kind string, write func(staged string) error) error {
	st, err := Stage(dir)
	if err != nil {
		return err
	}
	if err := write(st.Dir); err != nil {
		st.Discard()
		return err
	}
	return st.Commit(kind)
}

// stagingHost is this host's name as a staging directory carries it
// (no separators, no dashes, so that the name parses back).
func stagingHost() string {
	h, err := os.Hostname()
	if err != nil || h == "" {
		return "host"
	}
	return strings.Map(func(r rune) rune {
		if r == '-' || r == '/' || r == os.PathSeparator {
			return '_'
		}
		return r
	}, h)
}

// removeOrphans removes the staging directories of base in parent whose
// writer ran on host and is no longer running. Errors are ignored: an
// orphan that stays is only clutter.
func removeOrphans(parent, base, host string) {
	prefix := "." + base + ".writing-" + host + "-"
	entries, err := os.ReadDir(parent)
	if err != nil {
		return
	}
	for _, e := range entries {
		rest, ok := strings.CutPrefix(e.Name(), prefix)
		if !ok || !e.IsDir() {
			continue
		}
		pidText, _, ok := strings.Cut(rest, "-")
		pid, err := strconv.Atoi(pidText)
		if !ok || err != nil || pid <= 0 || processRunning(pid) {
			continue
		}
		os.RemoveAll(filepath.Join(parent, e.Name()))
	}
}

// processRunning reports whether a process with this id runs on this
// host (signal 0 checks without sending anything).
func processRunning(pid int) bool {
	p, err := os.FindProcess(pid)
	if err != nil {
		return false
	}
	err = p.Signal(syscall.Signal(0))
	return err == nil || errors.Is(err, syscall.EPERM)
}
