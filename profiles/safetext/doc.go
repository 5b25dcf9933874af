// Package safetext makes text from files and people safe to print on a
// terminal. It is the one place that decides which characters may reach the
// screen raw; every output path (the command line, the handover card, the
// log listing, the full-screen views) sends text from outside through it.
//
// Unsafe, and so shown escaped rather than emitted:
//
//   - control characters: C0 (U+0000-U+001F), DEL (U+007F) and C1
//     (U+0080-U+009F). A C0 character is shown as \x1b (or \n, \t, \r); a
//     C1 character as \u009b. Writer lets \n and \t through,
//     for text that is meant to have lines and columns; Escape escapes them
//     too, for single-line fields.
//   - bidirectional controls: U+061C, U+200E, U+200F, U+202A-U+202E,
//     U+2066-U+2069, shown as \u202e. They reorder what follows them and
//     can make a label read differently from what it is.
//   - invisible characters: every Unicode format character (category Cf:
//     the zero-width space, joiners U+200B-U+200D, word joiner U+2060, the
//     byte order mark U+FEFF, the soft hyphen U+00AD, tag characters, ...),
//     the line and paragraph separators U+2028 and U+2029, variation
//     selectors, the combining grapheme joiner U+034F and the Hangul and
//     Mongolian fillers. They make two labels that look the same differ.
//   - invalid UTF-8: each bad byte is shown as \xff.
//
// Characters above U+FFFF are shown as \U000e0001. A backslash is not
// escaped: the output is for reading, not for decoding back.
//
// Nothing here panics or returns an error on any input; the functions are
// pure and hold no state, except a Writer, which holds the bytes of a
// character split across two writes until the next write or Flush.
package safetext
