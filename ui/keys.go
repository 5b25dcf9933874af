package ui

import "github.com/charmbracelet/bubbles/key"

// Keys come in two kinds that never overlap. Keys that type (digits,
// letters, the decimal point and comma) only ever go to the focused field;
// where no field has the focus they are refused with a visible note. Keys
// that act or navigate are never characters a field accepts: function
// keys, Ctrl or Alt chords, Tab, arrows, Enter, Esc, page keys. So no habit
// learned on one panel can change a value on another.

// globalKeys work on every panel.
type globalKeys struct {
	Next, Prev key.Binding
	Panel      [6]key.Binding
	Help       key.Binding
	Quit       key.Binding
	// Confirm quits without recording once the screen has asked; Stay
	// closes the question.
	Confirm, Stay  key.Binding
	PageUp, PageDn key.Binding
	Ward           key.Binding
	Suspend        key.Binding
}

func newGlobalKeys() globalKeys {
	k := globalKeys{
		Next:    key.NewBinding(key.WithKeys("tab"), key.WithHelp("tab", "next panel")),
		Prev:    key.NewBinding(key.WithKeys("shift+tab"), key.WithHelp("shift+tab", "previous panel")),
		Help:    key.NewBinding(key.WithKeys("?"), key.WithHelp("?", "all keys")),
		Quit:    key.NewBinding(key.WithKeys("ctrl+c", "ctrl+q"), key.WithHelp("ctrl+c", "quit")),
		Confirm: key.NewBinding(key.WithKeys("ctrl+c", "ctrl+q"), key.WithHelp("ctrl+c", "quit without recording")),
		Stay:    key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "stay")),
		PageUp:  key.NewBinding(key.WithKeys("pgup"), key.WithHelp("pgup/pgdn", "scroll the panel")),
		PageDn:  key.NewBinding(key.WithKeys("pgdown"), key.WithHelp("pgup/pgdn", "scroll the panel")),
		Ward:    key.NewBinding(key.WithKeys("f7", "alt+7"), key.WithHelp("F7", "ward")),
		Suspend: key.NewBinding(key.WithKeys("ctrl+z"), key.WithHelp("ctrl+z", "suspend (fg resumes)")),
	}
	names := [6]string{"patient", "targets", "machine", "setting", "cautions", "handover"}
	for i := range k.Panel {
		f := "f" + string(rune('1'+i))
		alt := "alt+" + string(rune('1'+i))
		k.Panel[i] = key.NewBinding(key.WithKeys(f, alt), key.WithHelp(f+"/"+alt, names[i]))
	}
	return k
}

// formKeys move between and change the fields of a form panel.
type formKeys struct {
	Down, Up, Advance key.Binding
	Left, Right       key.Binding
	Choose            key.Binding
	Clear             key.Binding
}

func newFormKeys() formKeys {
	return formKeys{
		Down:    key.NewBinding(key.WithKeys("down"), key.WithHelp("↓", "next field")),
		Up:      key.NewBinding(key.WithKeys("up"), key.WithHelp("↑", "previous field")),
		Advance: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "next field")),
		Left:    key.NewBinding(key.WithKeys("left"), key.WithHelp("←/→", "move in the value")),
		Right:   key.NewBinding(key.WithKeys("right"), key.WithHelp("←/→", "move in the value")),
		Choose:  key.NewBinding(key.WithKeys(" "), key.WithHelp("letter/space", "choose")),
		Clear:   key.NewBinding(key.WithKeys("ctrl+u"), key.WithHelp("ctrl+u", "clear field")),
	}
}

// machineKeys load another profile and refit the calibration.
type machineKeys struct {
	Pick, Bench, Write key.Binding
	Up, Down           key.Binding
	Advance            key.Binding
}

func newMachineKeys() machineKeys {
	return machineKeys{
		Pick:    key.NewBinding(key.WithKeys("ctrl+p"), key.WithHelp("ctrl+p", "load another profile")),
		Bench:   key.NewBinding(key.WithKeys("ctrl+b"), key.WithHelp("ctrl+b", "refit from a bench file")),
		Write:   key.NewBinding(key.WithKeys("ctrl+w"), key.WithHelp("ctrl+w", "save the refit")),
		Up:      key.NewBinding(key.WithKeys("up"), key.WithHelp("↑/↓", "scroll")),
		Down:    key.NewBinding(key.WithKeys("down"), key.WithHelp("↑/↓", "scroll")),
		Advance: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "to the setting")),
	}
}

// pickerKeys choose a profile from the list.
type pickerKeys struct {
	Up, Down, Choose, Cancel key.Binding
}

func newPickerKeys() pickerKeys {
	return pickerKeys{
		Up:     key.NewBinding(key.WithKeys("up"), key.WithHelp("↑", "up")),
		Down:   key.NewBinding(key.WithKeys("down"), key.WithHelp("↓", "down")),
		Choose: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "load")),
		Cancel: key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "cancel")),
	}
}

// scrollKeys move through a long view.
type scrollKeys struct {
	Up, Down, Advance key.Binding
}

func newScrollKeys() scrollKeys {
	return scrollKeys{
		Up:      key.NewBinding(key.WithKeys("up"), key.WithHelp("↑/↓", "scroll")),
		Down:    key.NewBinding(key.WithKeys("down"), key.WithHelp("↑/↓", "scroll")),
		Advance: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "next panel")),
	}
}
