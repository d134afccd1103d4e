package main

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"
)

// The binary the child-process tests run, built once per test binary.
var built struct {
	once sync.Once
	path string
	err  error
	out  []byte
}

// TestMain removes the binary the child-process tests built.
func TestMain(m *testing.M) {
	code := m.Run()
	if built.path != "" {
		os.RemoveAll(filepath.Dir(built.path))
	}
	os.Exit(code)
}

// flangesegBinary builds the command into a temporary directory (once)
// and returns its path.
func flangesegBinary(t *testing.T) string {
	t.Helper()
	built.once.Do(func() {
		dir, err := os.MkdirTemp("", "flangeseg-bin-")
		if err != nil {
			built.err = err
			return
		}
		built.path = filepath.Join(dir, "flangeseg")
		built.out, built.err = exec.Command("go", "build", "-o", built.path, ".").CombinedOutput()
	})
	if built.err != nil {
		t.Fatalf("go build: %v\n%s", built.err, built.out)
	}
	return built.path
}

// child is a running flangeseg process whose stderr is read line by line.
type child struct {
	cmd    *exec.Cmd
	lines  chan string
	stderr strings.Builder
	mu     sync.Mutex
	stdout strings.Builder
	peak   float64 // bytes, see watchPeak
}

// startChild starts the binary with args (and extra environment) in dir.
func startChild(t *testing.T, dir string, env []string, args ...string) *child {
	t.Helper()
	c := &child{cmd: exec.Command(flangesegBinary(t), args...), lines: make(chan string, 1024)}
	c.cmd.Dir = dir
	c.cmd.Env = append(append(os.Environ(), "CI=1"), env...)
	c.cmd.Stdout = &lockedWriter{mu: &c.mu, b: &c.stdout}
	pipe, err := c.cmd.StderrPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := c.cmd.Start(); err != nil {
		t.Fatal(err)
	}
	c.watchPeak()
	go func() {
		defer close(c.lines)
		sc := bufio.NewScanner(pipe)
		sc.Buffer(make([]byte, 1<<16), 1<<20)
		for sc.Scan() {
			c.mu.Lock()
			c.stderr.WriteString(sc.Text() + "\n")
			c.mu.Unlock()
			select {
			case c.lines <- sc.Text():
			default: // nobody waits for lines any more
			}
		}
		io.Copy(io.Discard, pipe)
	}()
	return c
}

// waitFor reads stderr until a line starts with prefix; it fails the test
// after timeout or when the child ends first.
func (c *child) waitFor(t *testing.T, prefix string, timeout time.Duration) {
	t.Helper()
	deadline := time.After(timeout)
	for {
		select {
		case l, ok := <-c.lines:
			if !ok {
				t.Fatalf("the child ended before a line %q:\n%s", prefix, c.errText())
			}
			if strings.HasPrefix(l, prefix) {
				return
			}
		case <-deadline:
			c.cmd.Process.Kill()
			t.Fatalf("no line %q within %v:\n%s", prefix, timeout, c.errText())
		}
	}
}

// wait waits for the child's end (draining stderr) and returns its exit
// code, stdout and stderr.
func (c *child) wait(t *testing.T) (int, string, string) {
	t.Helper()
	for range c.lines {
	}
	err := c.cmd.Wait()
	if _, ok := err.(*exec.ExitError); err != nil && !ok {
		t.Fatal(err)
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.cmd.ProcessState.ExitCode(), c.stdout.String(), c.stderr.String()
}

// watchPeak polls the child's VmHWM (the high-water mark of its resident
// memory since its exec, in /proc/PID/status) until it ends. getrusage's
// ru_maxrss cannot serve: it keeps the parent's resident size from before
// the exec, which in a test binary is larger than the child's.
func (c *child) watchPeak() {
	path := fmt.Sprintf("/proc/%d/status", c.cmd.Process.Pid)
	go func() {
		for {
			data, err := os.ReadFile(path)
			if err != nil {
				return
			}
			for _, l := range strings.Split(string(data), "\n") {
				if rest, ok := strings.CutPrefix(l, "VmHWM:"); ok {
					var kb float64
					if _, err := fmt.Sscanf(strings.TrimSpace(rest), "%g kB", &kb); err == nil {
						c.mu.Lock()
						c.peak = max(c.peak, kb*1024)
						c.mu.Unlock()
					}
				}
			}
			time.Sleep(5 * time.Millisecond)
		}
	}()
}

// maxRSS is the largest VmHWM read while the child ran, bytes; 0 where
// /proc is missing.
func (c *child) maxRSS() float64 {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.peak
}

func (c *child) errText() string {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.stderr.String()
}

type lockedWriter struct {
	mu *sync.Mutex
	b  *strings.Builder
}

func (w *lockedWriter) Write(p []byte) (int, error) {
	w.mu.Lock()
	defer w.mu.Unlock()
	return w.b.Write(p)
}
