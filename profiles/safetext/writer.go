package safetext

import (
	"io"
	"strings"
	"unicode/utf8"
)

// Writer passes text to an underlying writer keeping newline
// and tab through, every other unsafe rune and invalid byte escaped. A
// character split across two calls to Write is held until the rest
// arrives, so it is judged whole; call Flush at the end to write a held
// incomplete tail (escaped, as invalid bytes). A Writer is not safe for
// concurrent use.
type Writer struct {
	w       io.Writer
	pending []byte // at most utf8.UTFMax-1 bytes of an incomplete character
}

// NewWriter returns a Writer writing to w.
func NewWriter(w io.Writer) *Writer { return &Writer{w: w} }

// Write escapes p and writes it. It returns len(p) when everything given
// was written or held; when the underlying writer fails it returns 0 and
// that error (how much of the escaped text reached it is then unknown).
func (w *Writer) Write(p []byte) (int, error) {
	data := string(w.pending) + string(p)
	w.pending = w.pending[:0]
	cut := incompleteTail(data)
	w.pending = append(w.pending, data[cut:]...)
	var b strings.Builder
	appendEscaped(&b, data[:cut], true)
	if b.Len() == 0 {
		return len(p), nil
	}
	if _, err := io.WriteString(w.w, b.String()); err != nil {
		return 0, err
	}
	return len(p), nil
}

// Flush writes any held incomplete character, escaped as invalid bytes.
func (w *Writer) Flush() error {
	if len(w.pending) == 0 {
		return nil
	}
	var b strings.Builder
	appendEscaped(&b, string(w.pending), true)
	w.pending = w.pending[:0]
	_, err := io.WriteString(w.w, b.String())
	return err
}

// incompleteTail returns where a trailing incomplete but so far valid UTF-8
// sequence starts, or len(s) when there is none.
func incompleteTail(s string) int {
	for back := 1; back < utf8.UTFMax && back <= len(s); back++ {
		i := len(s) - back
		c := s[i]
		if c < 0x80 {
			return len(s)
		}
		if utf8.RuneStart(c) {
			if !utf8.FullRuneInString(s[i:]) && validPrefix(s[i:]) {
				return i
			}
			return len(s)
		}
	}
	return len(s)
}

// validPrefix reports whether s (shorter than its lead byte says) could
// still become a valid character: the lead byte is a multi-byte lead and the
// second byte, if present, is in the range the lead allows.
func validPrefix(s string) bool {
	lead := s[0]
	var lo, hi byte = 0x80, 0xbf
	switch {
	case lead >= 0xc2 && lead <= 0xdf:
	case lead == 0xe0:
		lo = 0xa0
	case lead >= 0xe1 && lead <= 0xec, lead == 0xee, lead == 0xef:
	case lead == 0xed:
		hi = 0x9f
	case lead == 0xf0:
		lo = 0x90
	case lead >= 0xf1 && lead <= 0xf3:
	case lead == 0xf4:
		hi = 0x8f
	default:
		return false
	}
	for i := 1; i < len(s); i++ {
		c := s[i]
		if i == 1 && (c < lo || c > hi) || i > 1 && (c < 0x80 || c > 0xbf) {
			return false
		}
	}
	return true
}
