package safetext

import (
	"bytes"
	"math/rand/v2"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/stretchr/testify/require"
)

// The byte sequences a terminal acts on, which must never be in the output:
// ESC (ECMA-48 C0 set), CSI as the C1 character U+009B written in UTF-8
// (C2 9B), and the right-to-left override U+202E (E2 80 AE, Unicode UAX #9).
// Source: ECMA-48 5th edition 1991 and Unicode UAX #9 (the code points);
// the UTF-8 bytes derived by hand from RFC 3629's bit layout.
var forbidden = [][]byte{{0x1b}, {0xc2, 0x9b}, {0xe2, 0x80, 0xae}, {0x07}, {0x7f}}

func requireClean(t *testing.T, out string, keepLayout bool) {
	t.Helper()
	for _, f := range forbidden {
		require.False(t, bytes.Contains([]byte(out), f), "output %q holds the bytes % x", out, f)
	}
	require.True(t, utf8.ValidString(out), "output %q is not valid UTF-8", out)
	for _, r := range out {
		if keepLayout && (r == '\n' || r == '\t') {
			continue
		}
		require.False(t, Unsafe(r), "output %q holds the unsafe rune %U", out, r)
	}
}

func TestEscapeEachClass(t *testing.T) {
	// Expected strings are written out from the package's stated escape
	// forms (doc.go); the code points from Unicode (named in each case).
	cases := []struct{ name, in, single, text string }{
		{"plain text is unchanged", "Ward 3 unit, hole 12", "Ward 3 unit, hole 12", "Ward 3 unit, hole 12"},
		{"non-ASCII letters are kept", "Unité B – façade", "Unité B – façade", "Unité B – façade"},
		{"ESC of a clear-screen sequence", "a\x1b[2Jb", `a\x1b[2Jb`, `a\x1b[2Jb`},
		{"OSC 52 clipboard write with BEL", "\x1b]52;c;aGk=\x07", `\x1b]52;c;aGk=\x07`, `\x1b]52;c;aGk=\x07`},
		{"NUL and CR", "a\x00b\rc", `a\x00b\rc`, `a\x00b\rc`},
		{"newline and tab", "a\nb\tc", `a\nb\tc`, "a\nb\tc"},
		{"DEL", "a\x7fb", `a\x7fb`, `a\x7fb`},
		{"C1 CSI U+009B", "a\u009b2Jb", `a\u009b2Jb`, `a\u009b2Jb`},
		{"C1 NEL U+0085", "a\u0085b", `a\u0085b`, `a\u0085b`},
		{"bidi RLO U+202E", "abc\u202edef", `abc\u202edef`, `abc\u202edef`},
		{"bidi isolates U+2066..U+2069", "\u2066x\u2069", `\u2066x\u2069`, `\u2066x\u2069`},
		{"Arabic letter mark U+061C and LRM/RLM", "\u061c\u200e\u200f", `\u061c\u200e\u200f`, `\u061c\u200e\u200f`},
		{"zero-width space U+200B", "8\u200b", `8\u200b`, `8\u200b`},
		{"ZWNJ, ZWJ, word joiner", "\u200c\u200d\u2060", `\u200c\u200d\u2060`, `\u200c\u200d\u2060`},
		{"byte order mark U+FEFF", "\ufeffid", `\ufeffid`, `\ufeffid`},
		{"soft hyphen U+00AD", "A\u00adB", `A\u00adB`, `A\u00adB`},
		{"line separator U+2028", "a\u2028b", `a\u2028b`, `a\u2028b`},
		{"variation selector U+FE0F", "1\ufe0f", `1\ufe0f`, `1\ufe0f`},
		{"Hangul filler U+3164", "\u3164", `\u3164`, `\u3164`},
		{"tag character above U+FFFF", "a\U000e0041", `a\U000e0041`, `a\U000e0041`},
		{"invalid UTF-8 bytes", "a\xffb\xc2", `a\xffb\xc2`, `a\xffb\xc2`},
		{"C1 written as a raw byte (not UTF-8)", "a\x9bb", `a\x9bb`, `a\x9bb`},
		{"a literal replacement character is printable", "a\ufffdb", "a\ufffdb", "a\ufffdb"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := Escape(c.in)
			require.Equal(t, c.single, got, "Escape(%q)", c.in)
			requireClean(t, got, false)
			got = escapeText(c.in)
			require.Equal(t, c.text, got, "escapeText(%q)", c.in)
			requireClean(t, got, true)
		})
	}
}

func TestFirstUnsafeAndKind(t *testing.T) {
	// Code points and classes as Unicode and ECMA-48 define them (doc.go).
	cases := []struct {
		in     string
		r      rune
		offset int
		found  bool
		kind   string
	}{
		{"hole 8", 0, 0, false, ""},
		{"Unité", 0, 0, false, ""},
		{"8\u200b", 0x200b, 1, true, "an invisible character"},
		{"ab\u202ec", 0x202e, 2, true, "a bidirectional control"},
		{"é\x1b", 0x1b, 2, true, "a control character"}, // é is 2 bytes
		{"x\u009b", 0x9b, 1, true, "a control character"},
		{"a\tb", '\t', 1, true, "a control character"},
		{"ok\xff", utf8.RuneError, 2, true, "invalid UTF-8"},
		{"\u00ad", 0xad, 0, true, "an invisible character"},
	}
	for _, c := range cases {
		r, off, found := FirstUnsafe(c.in)
		require.Equal(t, c.found, found, "FirstUnsafe(%q)", c.in)
		if !found {
			continue
		}
		require.Equal(t, c.r, r, "FirstUnsafe(%q) rune", c.in)
		require.Equal(t, c.offset, off, "FirstUnsafe(%q) offset", c.in)
		require.Equal(t, c.kind, Kind(r), "Kind(%U)", r)
	}
	require.Equal(t, "", Kind('A'))
}

func TestWriterKeepsLinesAndEscapesTheRest(t *testing.T) {
	var b bytes.Buffer
	w := NewWriter(&b)
	n, err := w.Write([]byte("bed B4\tok\n\x1b[31mred\u202e\n"))
	require.NoError(t, err)
	require.Equal(t, 22, n, "Write reports the 22 bytes it was given (10 + 8 + 3 + 1, counted by hand)")
	require.NoError(t, w.Flush())
	// Expected: written out by hand from doc.go's escape forms.
	require.Equal(t, "bed B4\tok\n\\x1b[31mred\\u202e\n", b.String())
}

func TestWriterAcrossSplitCharacters(t *testing.T) {
	// U+202E is E2 80 AE and U+00E9 is C3 A9 in UTF-8 (RFC 3629); each split
	// point must still give the escape of the whole character, or the whole
	// letter, never raw bytes.
	in := []byte("é\u202e\u009b€")
	for cut := 0; cut <= len(in); cut++ {
		var b bytes.Buffer
		w := NewWriter(&b)
		_, err := w.Write(in[:cut])
		require.NoError(t, err)
		_, err = w.Write(in[cut:])
		require.NoError(t, err)
		require.NoError(t, w.Flush())
		require.Equal(t, `é\u202e\u009b€`, b.String(), "split at byte %d", cut)
	}
	// One byte at a time.
	var b bytes.Buffer
	w := NewWriter(&b)
	for i := range in {
		_, err := w.Write(in[i : i+1])
		require.NoError(t, err)
	}
	require.NoError(t, w.Flush())
	require.Equal(t, `é\u202e\u009b€`, b.String())
	// An incomplete character at the very end is shown as bad bytes on Flush.
	b.Reset()
	w = NewWriter(&b)
	_, err := w.Write([]byte("a\xe2\x80"))
	require.NoError(t, err)
	require.Equal(t, "a", b.String(), "the incomplete tail is held")
	require.NoError(t, w.Flush())
	require.Equal(t, `a\xe2\x80`, b.String())
}

// randomText mixes safe letters with every unsafe class and broken bytes.
func randomText(rng *rand.Rand) string {
	pieces := []string{"a", "Z", "7", " ", "é", "€", "\n", "\t", "\r", "\x1b", "\x00", "\x7f", "\u0085", "\u009b",
		"\u202e", "\u2066", "\u200b", "\ufeff", "\u00ad", "\U000e0041", "\xff", "\xe2\x80", "\xc2", "\x9b", "\xed\xa0\x80"}
	var b strings.Builder
	for n := rng.IntN(30); n > 0; n-- {
		b.WriteString(pieces[rng.IntN(len(pieces))])
	}
	return b.String()
}

func TestPropertyOutputIsAlwaysClean(t *testing.T) {
	// Property: whatever the input, no output holds a forbidden byte
	// sequence or an unsafe rune, and the Writer, however the input is cut,
	// writes what EscapeText returns for the whole (two paths, one answer).
	rng := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 3000; i++ {
		s := randomText(rng)
		requireClean(t, Escape(s), false)
		requireClean(t, escapeText(s), true)
		var b bytes.Buffer
		w := NewWriter(&b)
		rest := []byte(s)
		for len(rest) > 0 {
			k := 1 + rng.IntN(len(rest))
			_, err := w.Write(rest[:k])
			require.NoError(t, err)
			rest = rest[k:]
		}
		require.NoError(t, w.Flush())
		require.Equal(t, escapeText(s), b.String(), "input %q", s)
	}
}

func FuzzEscape(f *testing.F) {
	for _, s := range []string{"hole 8", "\x1b]52;c;aGk=\x07", "8\u200b", "\u202eabc", "\u009b2J", "\xff\xfe", "a\xe2\x80", "\ufeff{}"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for _, out := range []string{Escape(s), escapeText(s)} {
			for _, bad := range forbidden {
				if bytes.Contains([]byte(out), bad) {
					t.Fatalf("Escape(%q) = %q holds % x", s, out, bad)
				}
			}
			if !utf8.ValidString(out) {
				t.Fatalf("Escape(%q) = %q is not valid UTF-8", s, out)
			}
		}
		for _, r := range Escape(s) {
			if Unsafe(r) {
				t.Fatalf("Escape(%q) holds %U", s, r)
			}
		}
		if _, _, found := FirstUnsafe(s); !found && Escape(s) != s {
			t.Fatalf("safe text %q was changed to %q", s, Escape(s))
		}
		var b bytes.Buffer
		w := NewWriter(&b)
		half := len(s) / 2
		w.Write([]byte(s[:half]))
		w.Write([]byte(s[half:]))
		w.Flush()
		if b.String() != escapeText(s) {
			t.Fatalf("Writer gave %q, EscapeText %q, for %q", b.String(), escapeText(s), s)
		}
	})
}

// escapeText is what Writer writes for s as a whole: newline and tab kept,
// every other unsafe rune escaped (the reference the Writer is held to).
func escapeText(s string) string { return escape(s, true) }
