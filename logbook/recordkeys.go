package logbook

import (
	"bytes"
	"encoding"
	"encoding/json"
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"time"

	"crankside/setup"
)

// Keys of a record line as the writer writes them. encoding/json matches
// a key to a field whatever its case and keeps the last of two, so a line
// with `"bed":"B9"` and then `"BED":"B4"` decodes as bed B4. The reader
// therefore walks the keys of each line before trusting it, as the
// profile reader does (profiles: "appears twice"): a key that names a
// record field in another case than the writer's, or a key that appears
// twice in one object (in any case), makes the line damaged. Keys the
// record has no field for are left alone (the decoder ignores them too),
// unless one appears twice.

// keyNode is what the writer's keys are at one place in a record: the
// fields of an object, the element of an array, or the values of a map
// (any key, each once).
type keyNode struct {
	index  map[string]int // a field's key: its place in fields and names
	fields []*keyNode     // nil for a map or a leaf
	names  []string       // the fields' keys, for the case-blind search
	elem   *keyNode       // an array's element, a map's value
	isMap  bool
}

var (
	recordKeysOnce sync.Once
	recordKeys     *keyNode
)

func recordKeyTree() *keyNode {
	recordKeysOnce.Do(func() { recordKeys = keyTree(reflect.TypeOf(setup.Record{}), map[reflect.Type]*keyNode{}) })
	return recordKeys
}

var (
	textUnmarshaler = reflect.TypeOf((*encoding.TextUnmarshaler)(nil)).Elem()
	jsonUnmarshaler = reflect.TypeOf((*json.Unmarshaler)(nil)).Elem()
	timeType        = reflect.TypeOf(time.Time{})
)

// keyTree is the key tree of a Go type as encoding/json decodes it; nil
// for a leaf (a number, string, bool, time, or a type that reads itself).
func keyTree(t reflect.Type, seen map[reflect.Type]*keyNode) *keyNode {
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	if t == timeType || reflect.PointerTo(t).Implements(textUnmarshaler) || reflect.PointerTo(t).Implements(jsonUnmarshaler) {
		return nil
	}
	if n, ok := seen[t]; ok {
		return n
	}
	switch t.Kind() {
	case reflect.Slice, reflect.Array:
		n := &keyNode{}
		seen[t] = n
		n.elem = keyTree(t.Elem(), seen)
		return n
	case reflect.Map:
		n := &keyNode{isMap: true}
		seen[t] = n
		n.elem = keyTree(t.Elem(), seen)
		return n
	case reflect.Struct:
		n := &keyNode{index: map[string]int{}, fields: []*keyNode{}}
		seen[t] = n
		addFields(n, t, seen)
		return n
	}
	return nil
}

// addFields adds a struct's JSON keys to n, those of embedded structs
// without a name of their own as the struct's own.
func addFields(n *keyNode, t reflect.Type, seen map[reflect.Type]*keyNode) {
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		tag := f.Tag.Get("json")
		name, _, _ := strings.Cut(tag, ",")
		if name == "-" || (!f.IsExported() && !f.Anonymous) {
			continue
		}
		ft := f.Type
		for ft.Kind() == reflect.Pointer {
			ft = ft.Elem()
		}
		if f.Anonymous && name == "" && ft.Kind() == reflect.Struct {
			addFields(n, ft, seen)
			continue
		}
		if name == "" {
			name = f.Name
		}
		if _, dup := n.index[name]; dup {
			continue // the outer field wins, as in encoding/json
		}
		n.index[name] = len(n.fields)
		n.fields = append(n.fields, keyTree(f.Type, seen))
		n.names = append(n.names, name)
	}
}

// keyFrame is one open object or array while a line is walked.
type keyFrame struct {
	node    *keyNode
	object  bool
	wantKey bool
	next    *keyNode // the node of the value after the last key
	seen    []uint64 // the node's fields met so far, one bit each
	others  []string // keys met that are not the node's fields
}

// keysProblem walks the keys of a line that json.Unmarshal accepted and
// says which one the writer could not have written, or "".
func keysProblem(text []byte) string {
	stack := make([]keyFrame, 0, 8)
	root := recordKeyTree()
	for i := 0; i < len(text); i++ {
		switch c := text[i]; c {
		case '{', '[':
			node := root
			if len(stack) > 0 {
				top := &stack[len(stack)-1]
				node = top.next
				if !top.object && top.node != nil {
					node = top.node.elem
				}
			}
			stack = append(stack, keyFrame{node: node, object: c == '{', wantKey: c == '{'})
		case '}', ']':
			stack = stack[:len(stack)-1]
		case ',':
			if top := &stack[len(stack)-1]; top.object {
				top.wantKey = true
			}
		case '"':
			end := stringEnd(text, i)
			if top := &stack[len(stack)-1]; top.object && top.wantKey {
				if p := top.key(text[i : end+1]); p != "" {
					return p
				}
				top.wantKey = false
			}
			i = end
		}
	}
	return ""
}

// stringEnd is the index of the quote that closes the string opened at i.
func stringEnd(text []byte, i int) int {
	for j := i + 1; j < len(text); j++ {
		switch text[j] {
		case '\\':
			j++
		case '"':
			return j
		}
	}
	return len(text) - 1
}

// key takes one key (quoted, as in the line) of the frame's object.
func (f *keyFrame) key(quoted []byte) string {
	raw := quoted[1 : len(quoted)-1]
	n := f.node
	f.next = nil
	if n != nil && n.isMap {
		f.next = n.elem
	}
	if bytes.IndexByte(raw, '\\') < 0 && n != nil && n.fields != nil {
		if i, known := n.index[string(raw)]; known {
			f.next = n.fields[i]
			if f.seen == nil {
				f.seen = make([]uint64, (len(n.fields)+63)/64)
			}
			if f.seen[i/64]&(1<<(i%64)) != 0 {
				return fmt.Sprintf("key %s appears twice in one object", strconv.QuoteToASCII(string(raw)))
			}
			f.seen[i/64] |= 1 << (i % 64)
			return ""
		}
	}
	var key string
	if err := json.Unmarshal(quoted, &key); err != nil {
		return "a key is not a JSON string"
	}
	if n != nil && n.fields != nil {
		for _, name := range n.names {
			if strings.EqualFold(name, key) {
				if name == key {
					return fmt.Sprintf("key %s is written escaped, which the writer never does", strconv.QuoteToASCII(string(raw)))
				}
				return fmt.Sprintf("key %s is the writer's %q in another case", strconv.QuoteToASCII(key), name)
			}
		}
	}
	for _, s := range f.others {
		if strings.EqualFold(s, key) {
			return fmt.Sprintf("key %s appears twice in one object", strconv.QuoteToASCII(key))
		}
	}
	f.others = append(f.others, key)
	return ""
}
