package results

import (
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// Staging directories that a killed process of this host left behind are
// removed when the same result is staged again; those of a live process,
// of another host and of another result stay.
func TestStageRemovesOrphans(t *testing.T) {
	done := exec.Command("true")
	if err := done.Run(); err != nil {
		t.Skipf("no process to take a finished id from: %v", err)
	}
	dead := done.Process.Pid
	if processRunning(dead) {
		t.Skipf("process id %d was taken again at once", dead)
	}
	parent := t.TempDir()
	host := stagingHost()
	dirs := map[string]bool{ // name: should stay
		fmt.Sprintf(".res.writing-%s-%d-111", host, dead):        false,
		fmt.Sprintf(".res.writing-%s-%d-222.old", host, dead):    false,
		fmt.Sprintf(".res.writing-%s-%d-333", host, os.Getpid()): true,
		fmt.Sprintf(".res.writing-%s_other-%d-444", host, dead):  true,
		fmt.Sprintf(".other.writing-%s-%d-555", host, dead):      true,
	}
	for name := range dirs {
		if err := os.Mkdir(filepath.Join(parent, name), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	st, err := Stage(filepath.Join(parent, "res"))
	if err != nil {
		t.Fatal(err)
	}
	defer st.Discard()
	for name, stay := range dirs {
		_, err := os.Stat(filepath.Join(parent, name))
		if exists := err == nil; exists != stay {
			t.Errorf("%s: exists %v, want %v", name, exists, stay)
		}
	}
	if want := fmt.Sprintf(".res.writing-%s-%d-", host, os.Getpid()); !strings.HasPrefix(filepath.Base(st.Dir), want) {
		t.Errorf("staging directory %s does not carry host and process (%s…)", st.Dir, want)
	}
}

// TestCheckOutDirWhileMarking: the shards of a sweep share one result
// directory; while one writes the marker (its temporary file stands there
// alone) the others must take the directory as a result being made, not
// as foreign files. Any other file still makes it foreign.
func TestCheckOutDirWhileMarking(t *testing.T) {
	dir := t.TempDir()
	tmp := filepath.Join(dir, "."+MarkerFile+".tmp-1805121898")
	if err := os.WriteFile(tmp, []byte("sweep\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := CheckOutDir(dir); err != nil {
		t.Errorf("a marker being written: %v", err)
	}
	if err := os.Remove(tmp); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := CheckOutDir(dir); !errors.Is(err, ErrNotResult) {
		t.Errorf("a foreign file: %v, want ErrNotResult", err)
	}
}
