package safetext

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Unsafe reports whether r must not reach a terminal raw. Tab and newline
// are unsafe here; Writer is the one that allows them.
// utf8.RuneError (U+FFFD) itself is printable and safe: invalid bytes are
// found by FirstUnsafe and Escape, which see the bytes.
func Unsafe(r rune) bool {
	switch {
	case r < 0x20 || r == 0x7f || (r >= 0x80 && r <= 0x9f):
		return true
	case bidi(r):
		return true
	case r > unicode.MaxRune || (r >= 0xd800 && r <= 0xdfff):
		return true
	}
	return invisible(r)
}

// bidi is the set of bidirectional controls (Unicode UAX #9, explicit
// formatting characters and the Arabic letter mark).
func bidi(r rune) bool {
	return r == 0x061c || r == 0x200e || r == 0x200f || (r >= 0x202a && r <= 0x202e) || (r >= 0x2066 && r <= 0x2069)
}

// invisible is every character that draws nothing (or only modifies its
// neighbour) and so can make two strings that look equal differ.
func invisible(r rune) bool {
	switch {
	case unicode.Is(unicode.Cf, r): // format characters: U+00AD, U+200B-U+200D, U+2060-U+2064, U+FEFF, tags, ...
		return true
	case r == 0x2028 || r == 0x2029: // line and paragraph separators
		return true
	case r == 0x034f: // combining grapheme joiner
		return true
	case r == 0x115f || r == 0x1160 || r == 0x3164 || r == 0xffa0: // Hangul fillers
		return true
	case r == 0x17b4 || r == 0x17b5: // Khmer inherent vowels, drawn as nothing
		return true
	case r >= 0x180b && r <= 0x180f: // Mongolian variation selectors and vowel separator
		return true
	case r >= 0xfe00 && r <= 0xfe0f, r >= 0xe0100 && r <= 0xe01ef: // variation selectors
		return true
	}
	return false
}

// Kind names the class of an unsafe rune for a message: "a control
// character", "a bidirectional control", "an invisible character", or
// "invalid UTF-8" for utf8.RuneError as FirstUnsafe returns it for a bad
// byte. It returns "" for a safe rune.
func Kind(r rune) string {
	switch {
	case r == utf8.RuneError:
		return "invalid UTF-8"
	case r < 0x20 || r == 0x7f || (r >= 0x80 && r <= 0x9f):
		return "a control character"
	case bidi(r):
		return "a bidirectional control"
	case Unsafe(r):
		return "an invisible character"
	}
	return ""
}

// FirstUnsafe finds the first unsafe rune of s (tab and newline count as
// unsafe) and returns it with its byte offset. Invalid UTF-8 is returned as
// utf8.RuneError; a literal U+FFFD in valid text is safe and not reported.
func FirstUnsafe(s string) (r rune, byteOffset int, found bool) {
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if (r == utf8.RuneError && size == 1) || Unsafe(r) {
			return r, i, true
		}
		i += size
	}
	return 0, 0, false
}

// Escape returns s for one line of a terminal: every unsafe rune,
// including tab and newline, and every invalid byte is written escaped.
// Safe text is returned unchanged.
func Escape(s string) string { return escape(s, false) }

func escape(s string, keepLayout bool) string {
	clean := true
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if (r == utf8.RuneError && size == 1) || (Unsafe(r) && !(keepLayout && layout(r))) {
			clean = false
			break
		}
		i += size
	}
	if clean {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 8)
	appendEscaped(&b, s, keepLayout)
	return b.String()
}

func layout(r rune) bool { return r == '\n' || r == '\t' }

// appendEscaped writes s to b, escaping as Escape does, or keeping newline and tab for the Writer. It
// treats every byte that does not start a whole valid rune as invalid, so a
// caller holding back an incomplete tail must do so before calling it.
func appendEscaped(b *strings.Builder, s string, keepLayout bool) {
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			fmt.Fprintf(b, `\x%02x`, s[i])
		case keepLayout && layout(r), !Unsafe(r):
			b.WriteString(s[i : i+size])
		default:
			b.WriteString(escapeRune(r))
		}
		i += size
	}
}

func escapeRune(r rune) string {
	switch {
	case r == '\n':
		return `\n`
	case r == '\t':
		return `\t`
	case r == '\r':
		return `\r`
	case r < 0x80:
		return fmt.Sprintf(`\x%02x`, r)
	case r <= 0xffff:
		return fmt.Sprintf(`\u%04x`, r)
	}
	return fmt.Sprintf(`\U%08x`, r)
}
