package profiles

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"reflect"
	"strings"
	"unicode/utf8"

	"crankside/profiles/safetext"
)

// MaxFileBytes is the largest profile file read; a real profile is a few kB.
const MaxFileBytes = 1 << 20

// ErrProfile is wrapped by every error about a profile's contents.
var ErrProfile = errors.New("profile")

// FieldError is one problem with one field.
type FieldError struct {
	Path    string // like crank.holes[2].radius_cm; empty for the whole file
	Problem string // the value and what is allowed
}

// Error is the path and the problem on one line. Both may hold text from
// the file (an unknown key, a quoted value), so both are made safe to print
// with safetext.Escape.
func (e FieldError) Error() string {
	if e.Path == "" {
		return safetext.Escape(e.Problem)
	}
	return safetext.Escape(e.Path) + ": " + safetext.Escape(e.Problem)
}

// Error lists every problem found in a profile.
type Error struct {
	Source   string // file name or embedded id, for the message
	Problems []FieldError
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString("profile")
	if e.Source != "" {
		b.WriteString(" " + safetext.Escape(e.Source))
	}
	b.WriteString(": ")
	if len(e.Problems) == 0 {
		b.WriteString("invalid")
		return b.String()
	}
	b.WriteString(e.Problems[0].Error())
	if n := len(e.Problems) - 1; n > 0 {
		fmt.Fprintf(&b, " (and %d more problem%s)", n, plural(n))
	}
	return b.String()
}

func (e *Error) Unwrap() error { return ErrProfile }

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// utf8BOM is the UTF-8 encoding of the byte order mark U+FEFF, which some
// editors put at the start of a file.
const utf8BOM = "\xef\xbb\xbf"

// Parse reads a version 1 or 2 profile strictly and validates it. source
// names the file in messages. A UTF-8 byte order mark at the start is
// skipped; optional version 2 fields that are absent get their defaults,
// listed in Profile.Defaults.
func Parse(data []byte, source string) (Profile, error) {
	fail := func(p ...FieldError) (Profile, error) {
		return Profile{}, &Error{Source: source, Problems: p}
	}
	if len(data) > MaxFileBytes {
		return fail(FieldError{Problem: fmt.Sprintf("file is %d bytes; a profile may be at most %d (1 MiB)", len(data), MaxFileBytes)})
	}
	data = bytes.TrimPrefix(data, []byte(utf8BOM))
	if problem, ok := checkUTF8(data); !ok {
		return fail(problem)
	}
	present, problems := scan(data)
	if len(problems) > 0 {
		return fail(problems...)
	}
	var p Profile
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&p); err != nil {
		return fail(decodeProblem(err, data))
	}
	if problems := append(requireFields(present, p), versionFields(present, p.Format)...); len(problems) > 0 {
		return fail(problems...)
	}
	applyDefaults(present, &p)
	if problems := validate(p); len(problems) > 0 {
		return fail(problems...)
	}
	return p, nil
}

// checkUTF8 refuses bytes that are not UTF-8: encoding/json would replace
// them silently with U+FFFD, so two labels could differ in the file and look
// the same on screen.
func checkUTF8(data []byte) (FieldError, bool) {
	if utf8.Valid(data) {
		return FieldError{}, true
	}
	for i := 0; i < len(data); {
		r, size := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && size == 1 {
			line, col := lineCol(data, int64(i))
			return FieldError{Problem: fmt.Sprintf("byte 0x%02x at line %d, column %d is not UTF-8; save the file as UTF-8 text", data[i], line, col)}, false
		}
		i += size
	}
	return FieldError{}, true
}

func decodeProblem(err error, data []byte) FieldError {
	var te *json.UnmarshalTypeError
	var se *json.SyntaxError
	switch {
	case errors.As(err, &te):
		return FieldError{Path: te.Field, Problem: fmt.Sprintf("a JSON %s is not allowed here; it must be a %s", te.Value, kindWord(te.Type))}
	case errors.As(err, &se):
		line, col := lineCol(data, se.Offset)
		return FieldError{Problem: fmt.Sprintf("JSON syntax error at line %d, column %d: %s", line, col, se.Error())}
	}
	return FieldError{Problem: err.Error()}
}

func kindWord(t reflect.Type) string {
	switch t.Kind() {
	case reflect.Float64:
		return "number"
	case reflect.String:
		return "string"
	case reflect.Slice:
		return "list"
	case reflect.Struct, reflect.Pointer:
		return "object"
	}
	return t.String()
}

func lineCol(data []byte, offset int64) (int, int) {
	if offset > int64(len(data)) {
		offset = int64(len(data))
	}
	line, col := 1, 1
	for _, c := range data[:offset] {
		if c == '\n' {
			line++
			col = 1
		} else {
			col++
		}
	}
	return line, col
}

// schema maps an object's path pattern ("" for the top, "crank.holes[]"
// for every hole) to the keys it may hold, read off Profile's JSON tags so
// the two never drift apart.
type schema map[string]map[string]bool

func profileSchema() schema {
	s := schema{}
	var walk func(path string, t reflect.Type)
	walk = func(path string, t reflect.Type) {
		for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice {
			if t.Kind() == reflect.Slice {
				path += "[]"
			}
			t = t.Elem()
		}
		if t.Kind() != reflect.Struct {
			return
		}
		keys := map[string]bool{}
		for i := 0; i < t.NumField(); i++ {
			f := t.Field(i)
			name := strings.Split(f.Tag.Get("json"), ",")[0]
			if name == "-" {
				continue
			}
			keys[name] = true
			walk(join(path, name), f.Type)
		}
		s[path] = keys
	}
	walk("", reflect.TypeOf(Profile{}))
	return s
}

func join(path, key string) string {
	if path == "" {
		return key
	}
	return path + "." + key
}

// maxDepth is deeper than any v1 or v2 profile goes (top, crank, holes, a hole).
const maxDepth = 8

// scan walks the JSON tokens once, before decoding, to refuse what
// encoding/json accepts silently (duplicate keys, trailing data) and to name
// unknown fields by their full path. It returns the paths present, with
// indices, like "crank.holes[0].label".
func scan(data []byte) (map[string]bool, []FieldError) {
	sch := profileSchema()
	present := map[string]bool{}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var problems []FieldError
	syntax := func(err error) []FieldError {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			line, col := lineCol(data, se.Offset)
			return []FieldError{{Problem: fmt.Sprintf("JSON syntax error at line %d, column %d: %s", line, col, se.Error())}}
		}
		if errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) {
			line, col := lineCol(data, int64(len(data)))
			return []FieldError{{Problem: fmt.Sprintf("JSON ends early at line %d, column %d", line, col)}}
		}
		return []FieldError{{Problem: "JSON: " + err.Error()}}
	}
	var value func(path, pattern string, depth int) error
	value = func(path, pattern string, depth int) error {
		if depth > maxDepth {
			return fmt.Errorf("nesting")
		}
		tok, err := dec.Token()
		if err != nil {
			return err
		}
		present[path] = true
		d, ok := tok.(json.Delim)
		if !ok {
			return nil
		}
		switch d {
		case '{':
			allowed := sch[pattern]
			seen := map[string]bool{}
			for dec.More() {
				kt, err := dec.Token()
				if err != nil {
					return err
				}
				key, _ := kt.(string)
				kp := join(path, key)
				switch {
				case seen[key]:
					problems = append(problems, FieldError{Path: kp, Problem: "appears twice; each key may appear once"})
				case allowed != nil && !allowed[key]:
					problems = append(problems, FieldError{Path: kp, Problem: "is not a field of a crankside profile" + fmt.Sprintf(" (allowed here: %s)", keyList(allowed))})
				case allowed == nil:
					problems = append(problems, FieldError{Path: path, Problem: "must not be an object here"})
				}
				seen[key] = true
				if err := value(kp, join(pattern, key), depth+1); err != nil {
					return err
				}
			}
			_, err := dec.Token()
			return err
		case '[':
			for i := 0; dec.More(); i++ {
				if err := value(fmt.Sprintf("%s[%d]", path, i), pattern+"[]", depth+1); err != nil {
					return err
				}
			}
			_, err := dec.Token()
			return err
		}
		return nil
	}
	if err := value("", "", 0); err != nil {
		if err.Error() == "nesting" {
			return nil, []FieldError{{Problem: fmt.Sprintf("JSON is nested deeper than %d levels; a profile is not", maxDepth)}}
		}
		return nil, syntax(err)
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		line, col := lineCol(data, dec.InputOffset())
		return nil, []FieldError{{Problem: fmt.Sprintf("extra data after the profile at line %d, column %d", line, col)}}
	}
	if len(problems) > 20 {
		problems = append(problems[:20], FieldError{Problem: "more problems not listed"})
	}
	return present, problems
}

func keyList(keys map[string]bool) string {
	var out []string
	for k := range keys {
		out = append(out, k)
	}
	sortStrings(out)
	return strings.Join(out, ", ")
}
