package report

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"
)

// The browser test loads the notes in headless Chromium (Debian package
// chromium): it checks that a browser renders them without a console
// message — the pages hold no script, so any message is the browser
// reporting a fault: a blocked load, a parse error — and that the parsed
// DOM holds the sections, and it keeps a screenshot as a test artefact
// outside the repository (FLANGESEG_ARTIFACTS, or the system's temporary
// folder). Without chromium on PATH the test is skipped, except under CI,
// where it fails.

// chromiumTimeout bounds one browser run; a run takes a few seconds.
const chromiumTimeout = 90 * time.Second

func chromium(t *testing.T) string {
	t.Helper()
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("CI") != "" {
		t.Fatal("chromium is not on PATH; CI must install it (apt-get install -y chromium)")
	}
	t.Skip("chromium is not on PATH; install it with apt-get install -y chromium")
	return ""
}

// artefactDir is where the pages and screenshots are kept: never inside
// the repository.
func artefactDir(t *testing.T) string {
	t.Helper()
	dir := os.Getenv("FLANGESEG_ARTIFACTS")
	if dir == "" {
		dir = filepath.Join(os.TempDir(), "flangeseg-artifacts")
	}
	dir, err := filepath.Abs(filepath.Join(dir, "report"))
	if err != nil {
		t.Fatal(err)
	}
	root, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	if rel, err := filepath.Rel(root, dir); err == nil && !strings.HasPrefix(rel, "..") {
		t.Fatalf("artefact folder %s lies inside the repository %s; set FLANGESEG_ARTIFACTS to a folder outside it", dir, root)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	return dir
}

var consoleRE = regexp.MustCompile(`:CONSOLE[(:]`)

// runChromium loads page in a fresh headless browser with the extra
// flags and returns its standard output and the console messages it
// logged.
func runChromium(t *testing.T, bin, page string, flags ...string) (stdout string, console []string) {
	t.Helper()
	profile, err := os.MkdirTemp("", "flangeseg-chromium-")
	if err != nil {
		t.Fatal(err)
	}
	// Not t.TempDir: a browser helper may still be closing its files, and
	// a profile left behind is no fault of the page.
	defer os.RemoveAll(profile)
	args := append([]string{
		"--headless=new", "--no-sandbox", "--disable-gpu",
		"--enable-logging=stderr", "--v=0",
		"--user-data-dir=" + profile,
		"--no-first-run", "--no-default-browser-check", "--disable-extensions",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
	}, flags...)
	args = append(args, "file://"+page)
	ctx, cancel := context.WithTimeout(context.Background(), chromiumTimeout)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, args...)
	cmd.WaitDelay = 5 * time.Second
	var out, errOut bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errOut
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium %s: %v\n%s", strings.Join(flags, " "), err, tail(errOut.String(), 2000))
	}
	for _, line := range strings.Split(errOut.String(), "\n") {
		if consoleRE.MatchString(line) || strings.Contains(line, "Uncaught") {
			console = append(console, line)
		}
	}
	return out.String(), console
}

func tail(s string, n int) string {
	if len(s) > n {
		return "…" + s[len(s)-n:]
	}
	return s
}

func TestChromiumRendersNotes(t *testing.T) {
	bin := chromium(t)
	dir := artefactDir(t)
	for _, tc := range []struct {
		name     string
		write    func(path string) error
		sections []string
	}{
		{"report", func(p string) error { return Write(p, exampleReport()) }, reportSections},
		{"compare", func(p string) error { return WriteCompare(p, exampleCompare()) }, compareSections()},
		{"sweep", func(p string) error { return WriteSweep(p, exampleSweep()) }, sweepSections},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			page := filepath.Join(dir, tc.name+".html")
			if err := tc.write(page); err != nil {
				t.Fatal(err)
			}
			src, err := os.ReadFile(page)
			if err != nil {
				t.Fatal(err)
			}
			dom, console := runChromium(t, bin, page, "--dump-dom")
			if len(console) > 0 {
				t.Errorf("%d console messages:\n%s", len(console), strings.Join(console, "\n"))
			}
			if got := headings(dom); strings.Join(got, "\n") != strings.Join(tc.sections, "\n") {
				t.Errorf("headings in the browser's DOM:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(tc.sections, "\n"))
			}
			// Every picture survives the HTML parser as an svg element, and
			// both cautions stand outside them.
			if got, want := strings.Count(dom, "<svg"), strings.Count(string(src), "<svg"); got != want {
				t.Errorf("DOM holds %d svg elements, the file %d", got, want)
			}
			if got := strings.Count(dom, `<aside class="caution"`); got != 2 {
				t.Errorf("DOM holds %d caution boxes, want 2", got)
			}

			shot := filepath.Join(dir, tc.name+".png")
			os.Remove(shot)
			_, console = runChromium(t, bin, page, "--screenshot="+shot, "--window-size=1200,3000", "--hide-scrollbars")
			if len(console) > 0 {
				t.Errorf("%d console messages while taking the screenshot:\n%s", len(console), strings.Join(console, "\n"))
			}
			png, err := os.ReadFile(shot)
			if err != nil {
				t.Fatalf("no screenshot: %v", err)
			}
			if !bytes.HasPrefix(png, []byte("\x89PNG\r\n\x1a\n")) || len(png) < 20000 {
				t.Errorf("screenshot %s: %d bytes, not a PNG of a rendered page", shot, len(png))
			}
			t.Logf("page %s, screenshot %s", page, shot)
		})
	}
}

// TestChromiumSeesConsoleErrors shows that the browser test can fail: a
// page with a script and an image from outside the file, both blocked by
// the notes' content policy, yields console messages.
func TestChromiumSeesConsoleErrors(t *testing.T) {
	bin := chromium(t)
	page := filepath.Join(t.TempDir(), "bad.html")
	bad := "<!DOCTYPE html><html><head><meta charset=\"utf-8\">" +
		"<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'\">" +
		"<title>bad</title></head><body><h2>x</h2><svg><rect width=\"5\" height=\"5\"/></svg>" +
		"<img alt=\"\" src=\"missing.png\"><script>throw new Error(\"never runs\")</script></body></html>"
	if err := os.WriteFile(page, []byte(bad), 0o644); err != nil {
		t.Fatal(err)
	}
	_, console := runChromium(t, bin, page, "--dump-dom")
	if len(console) == 0 {
		t.Fatal("a page loading an image from outside the file logged no console message: the browser test cannot see faults")
	}
	if !strings.Contains(strings.Join(console, "\n"), "Content Security Policy") {
		t.Errorf("console messages do not name the blocked load:\n%s", strings.Join(console, "\n"))
	}
}
