package ui

import (
	"testing"

	"flag"
	"github.com/stretchr/testify/require"
	"unicode"

	tea "github.com/charmbracelet/bubbletea"
)

// fullKeyWalk makes the key walks press every key at every focus state
// (about 1,700 models built, over a minute of CPU). By default they press a
// covering sample: go test ./ui -run Keys -keys.full for the whole walk.
var fullKeyWalk = flag.Bool("keys.full", false, "key walks: every key at every focus state, not the covering sample")

// keyKind names what sort of key k is: what a field must take or refuse
// (digit, letter, mark, space) or how it acts (function key, Alt+digit,
// Ctrl+letter, a navigation key, a rune command such as ?).
func keyKind(k tea.KeyMsg) string {
	switch {
	case k.Alt:
		return "alt"
	case k.Type == tea.KeySpace:
		return "space"
	case k.Type >= tea.KeyF20 && k.Type <= tea.KeyF1:
		return "function"
	case k.Type >= tea.KeyCtrlAt && k.Type <= tea.KeyCtrlUnderscore && k.Type != tea.KeyTab && k.Type != tea.KeyEnter && k.Type != tea.KeyEsc:
		return "ctrl"
	case k.Type == tea.KeyRunes && len(k.Runes) > 0:
		switch r := k.Runes[0]; {
		case unicode.IsDigit(r):
			return "digit"
		case unicode.IsLetter(r):
			return "letter"
		}
		return "mark"
	}
	return "navigation"
}

// keyWalk is, for each focus state, the keys a key walk presses there. The
// whole product with -keys.full; otherwise a sample that still covers
//   - every key on every panel (the panel's fields take the keys in turn),
//   - every kind of key at every focus state (the member of the kind
//     turns with the state, so across the states each member is pressed
//     at several places),
//
// about a third of the product, each case on a fresh model as before.
func keyWalk(states [][2]int, keys []tea.KeyMsg) map[[2]int][]tea.KeyMsg {
	out := map[[2]int][]tea.KeyMsg{}
	if *fullKeyWalk {
		for _, st := range states {
			out[st] = keys
		}
		return out
	}
	seen := map[[3]int]bool{} // panel, field, key index
	add := func(st [2]int, ki int) {
		if id := [3]int{st[0], st[1], ki}; !seen[id] {
			seen[id] = true
			out[st] = append(out[st], keys[ki])
		}
	}
	byPanel := map[int][][2]int{}
	var panels []int
	for _, st := range states {
		if _, ok := byPanel[st[0]]; !ok {
			panels = append(panels, st[0])
		}
		byPanel[st[0]] = append(byPanel[st[0]], st)
	}
	for _, p := range panels {
		fields := byPanel[p]
		for ki := range keys {
			add(fields[ki%len(fields)], ki)
		}
	}
	kinds := map[string][]int{}
	var kindOrder []string
	for ki, k := range keys {
		kind := keyKind(k)
		if _, ok := kinds[kind]; !ok {
			kindOrder = append(kindOrder, kind)
		}
		kinds[kind] = append(kinds[kind], ki)
	}
	for si, st := range states {
		for _, kind := range kindOrder {
			members := kinds[kind]
			add(st, members[si%len(members)])
		}
	}
	return out
}

// The sample keeps its promise on the real focus states and key lists:
// every key on every panel, every kind at every focus state, and fewer
// cases than the whole product (else the flag would be pointless).
func TestKeyWalkCoversEveryPanelStateAndKind(t *testing.T) {
	if *fullKeyWalk {
		t.Skip("-keys.full presses every key everywhere")
	}
	states := focusStates(filledModel(t))
	for name, keys := range map[string][]tea.KeyMsg{"typing": typingKeys, "action": actionKeys} {
		walk := keyWalk(states, keys)
		onPanel := map[int]map[string]bool{}
		cases := 0
		for _, st := range states {
			kinds := map[string]bool{}
			for _, k := range walk[st] {
				if onPanel[st[0]] == nil {
					onPanel[st[0]] = map[string]bool{}
				}
				onPanel[st[0]][k.String()] = true
				kinds[keyKind(k)] = true
				cases++
			}
			for _, k := range keys {
				require.True(t, kinds[keyKind(k)], "%s keys: no %s key at %v", name, keyKind(k), st)
			}
		}
		for _, st := range states {
			for _, k := range keys {
				require.True(t, onPanel[st[0]][k.String()], "%s keys: %q never pressed on panel %d", name, k.String(), st[0])
			}
		}
		require.Less(t, cases, len(states)*len(keys), "%s keys: the sample is smaller than the walk", name)
		t.Logf("%s keys: %d cases of %d", name, cases, len(states)*len(keys))
	}
}
