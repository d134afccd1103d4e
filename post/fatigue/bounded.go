package fatigue

import (
	"fmt"
	"io"
)

// MaxLine is the longest line, in bytes, that a load file or an S–N curve
// file may have. Their lines are a few numbers; the bound keeps a file
// without line breaks (a binary file, a mangled export) from being read
// into memory as one line.
const MaxLine = 1 << 16

// lineLimited passes a reader's bytes on until a line exceeds MaxLine.
type lineLimited struct {
	r    io.Reader
	run  int // bytes since the last line break
	line int // line number of the current line, from 1
}

func limitLines(r io.Reader) *lineLimited { return &lineLimited{r: r, line: 1} }

func (l *lineLimited) Read(p []byte) (int, error) {
	n, err := l.r.Read(p)
	for i, b := range p[:n] {
		if b == '\n' {
			l.run = 0
			l.line++
			continue
		}
		l.run++
		if l.run > MaxLine {
			return i, fmt.Errorf("line %d: longer than %d bytes: a line holds a few numbers", l.line, MaxLine)
		}
	}
	return n, err
}
