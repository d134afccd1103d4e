package main

import (
	"bufio"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"runtime"
	"slices"
	"strconv"
	"strings"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
)

// memoryLimit is the --max-memory flag: the most memory a command may
// plan to use, in bytes; 0 means the machine's memory (MemTotal of
// /proc/meminfo).
type memoryLimit struct{ bytes float64 }

func (m *memoryLimit) String() string {
	if m == nil || m.bytes == 0 {
		return ""
	}
	return formatBytes(m.bytes)
}

// Set reads a size: a number with an optional unit, B, kB, MB, GB, TB
// (powers of 1000) or KiB, MiB, GiB, TiB (powers of 1024).
func (m *memoryLimit) Set(s string) error {
	units := []struct {
		suffix string
		factor float64
	}{{"KiB", 1 << 10}, {"MiB", 1 << 20}, {"GiB", 1 << 30}, {"TiB", 1 << 40}, {"kB", 1e3}, {"MB", 1e6}, {"GB", 1e9}, {"TB", 1e12}, {"B", 1}}
	text, factor := strings.TrimSpace(s), 1.0
	for _, u := range units {
		if rest, ok := strings.CutSuffix(text, u.suffix); ok {
			text, factor = strings.TrimSpace(rest), u.factor
			break
		}
	}
	x, err := strconv.ParseFloat(text, 64)
	if err != nil || !(x > 0) || x*factor > 1e18 {
		return fmt.Errorf("%q: want a size above 0 such as 2GB, 1.5GiB or 800MB", s)
	}
	m.bytes = x * factor
	return nil
}

// addMemoryFlag adds --max-memory to fs.
func addMemoryFlag(fs *flag.FlagSet) *memoryLimit {
	m := &memoryLimit{}
	fs.Var(m, "max-memory", "refuse a model whose estimated peak memory exceeds `SIZE` (e.g. 2GB, 1.5GiB; default: the machine's memory, MemTotal of /proc/meminfo)")
	return m
}

// limit returns the limit in bytes and where it comes from; 0 when the
// machine's memory cannot be read and no flag was given.
func (m *memoryLimit) limit() (float64, string) {
	if m.bytes > 0 {
		return m.bytes, "--max-memory"
	}
	total, err := machineMemory()
	if err != nil {
		return 0, ""
	}
	return total, "the machine's memory, MemTotal in /proc/meminfo"
}

// machineMemory reads MemTotal from /proc/meminfo, bytes.
func machineMemory() (float64, error) {
	f, err := os.Open("/proc/meminfo")
	if err != nil {
		return 0, err
	}
	defer f.Close()
	return memTotal(f)
}

// memTotal finds "MemTotal: N kB" in the text of /proc/meminfo.
func memTotal(r io.Reader) (float64, error) {
	sc := bufio.NewScanner(r)
	for sc.Scan() {
		rest, ok := strings.CutPrefix(sc.Text(), "MemTotal:")
		if !ok {
			continue
		}
		fields := strings.Fields(rest)
		if len(fields) == 2 && fields[1] == "kB" {
			if kb, err := strconv.ParseFloat(fields[0], 64); err == nil && kb > 0 {
				return kb * 1024, nil
			}
		}
		return 0, fmt.Errorf("/proc/meminfo: cannot read %q", sc.Text())
	}
	return 0, errors.New("/proc/meminfo: no MemTotal")
}

func formatBytes(b float64) string {
	switch {
	case b >= 1e9:
		return fmt.Sprintf("%.1f GB", b/1e9)
	case b >= 1e6:
		return fmt.Sprintf("%.0f MB", b/1e6)
	}
	return fmt.Sprintf("%.0f kB", b/1e3)
}

// sizeLine describes an estimate in one line.
func sizeLine(s segment.Size) string {
	return fmt.Sprintf("%.0f elements, %.0f equations, %d kept states, peak memory about %s",
		s.Elements, s.Equations, s.States, formatBytes(s.PeakBytes))
}

// checkSize estimates a model's size (segment.EstimateSize) and refuses
// it as refuseSize does.
func checkSize(spec *modelfile.Spec, limit *memoryLimit, others float64) (segment.Size, error) {
	s, err := segment.EstimateSize(spec)
	if err != nil {
		return s, err
	}
	return s, refuseSize(spec, s, limit, others)
}

// refuseSize refuses a model of size s, in the form of the model file's
// errors (key = value: rule), when its peak memory plus others (the peaks
// of the models that run beside it) exceeds the limit.
func refuseSize(spec *modelfile.Spec, s segment.Size, limit *memoryLimit, others float64) error {
	max, from := limit.limit()
	if max == 0 || s.PeakBytes+others <= max {
		return nil
	}
	m := spec.Mesh
	need := formatBytes(s.PeakBytes)
	if others > 0 {
		need = fmt.Sprintf("%s (with the models that run beside it, %s)", need, formatBytes(s.PeakBytes+others))
	}
	return fmt.Errorf("mesh.size = %s, mesh.refine = %s, load.increments = %d: the model needs about %.0f equations and %s of memory, more than the limit of %s (%s); raise mesh.size or mesh.refine (the equations grow as 1/size²), or lower load.increments (every increment keeps its fields), or give --max-memory",
		modelfile.FormatNumber(m.Size), modelfile.FormatNumber(m.Refine), spec.Load.Increments, s.Equations, need, formatBytes(max), from)
}

// checkSizes checks the models that run side by side, as many at once
// as there are cores: each against the limit with the largest others
// that may run beside it. It reports every refusal, prefixed with the
// model's path, and whether all fit.
func checkSizes(specs []*modelfile.Spec, paths []string, limit *memoryLimit, stderr io.Writer) bool {
	peaks := make([]float64, len(specs))
	for i, s := range specs {
		est, err := segment.EstimateSize(s)
		if err == nil {
			peaks[i] = est.PeakBytes
		}
	}
	ok := true
	for i, s := range specs {
		others := slices.Clone(peaks)
		others = slices.Delete(others, i, i+1)
		slices.Sort(others)
		slices.Reverse(others)
		beside := 0.0
		for _, p := range others[:min(len(others), max(1, runtime.NumCPU())-1)] {
			beside += p
		}
		if _, err := checkSize(s, limit, beside); err != nil {
			reportModelError(paths[i], err, stderr)
			ok = false
		}
	}
	return ok
}
