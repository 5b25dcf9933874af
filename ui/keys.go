package ui

import "github.com/charmbracelet/bubbles/key"

// globalKeys work on every panel. The panel numbers and q only work when
// no text field has focus; Tab, Shift+Tab and Ctrl+C always work.
type globalKeys struct {
	Next, Prev key.Binding
	Panel      [6]key.Binding
	Yes, No    key.Binding
	Help       key.Binding
	Quit       key.Binding
	ForceQuit  key.Binding
}

func newGlobalKeys() globalKeys {
	k := globalKeys{
		Next:      key.NewBinding(key.WithKeys("tab"), key.WithHelp("tab", "next panel")),
		Prev:      key.NewBinding(key.WithKeys("shift+tab"), key.WithHelp("shift+tab", "previous panel")),
		Help:      key.NewBinding(key.WithKeys("?"), key.WithHelp("?", "all keys")),
		Quit:      key.NewBinding(key.WithKeys("q"), key.WithHelp("q", "quit")),
		ForceQuit: key.NewBinding(key.WithKeys("ctrl+c"), key.WithHelp("ctrl+c", "quit")),
	}
	k.Yes = key.NewBinding(key.WithKeys("y"), key.WithHelp("y", "quit without recording"))
	k.No = key.NewBinding(key.WithKeys("n", "esc"), key.WithHelp("n", "stay"))
	names := [6]string{"patient", "targets", "machine", "setting", "cautions", "handover"}
	for i := range k.Panel {
		d := string(rune('1' + i))
		k.Panel[i] = key.NewBinding(key.WithKeys(d), key.WithHelp(d, names[i]))
	}
	return k
}

// formKeys move between and change the fields of a form panel.
type formKeys struct {
	Down, Up, Advance key.Binding
	Left, Right       key.Binding
	Clear             key.Binding
}

func newFormKeys() formKeys {
	return formKeys{
		Down:    key.NewBinding(key.WithKeys("down"), key.WithHelp("↓", "next field")),
		Up:      key.NewBinding(key.WithKeys("up"), key.WithHelp("↑", "previous field")),
		Advance: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "next")),
		Left:    key.NewBinding(key.WithKeys("left"), key.WithHelp("←/→", "choose")),
		Right:   key.NewBinding(key.WithKeys("right"), key.WithHelp("←/→", "choose")),
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
		Pick:    key.NewBinding(key.WithKeys("p"), key.WithHelp("p", "load another profile")),
		Bench:   key.NewBinding(key.WithKeys("b"), key.WithHelp("b", "refit from a bench file")),
		Write:   key.NewBinding(key.WithKeys("w"), key.WithHelp("w", "save the refit")),
		Up:      key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/↓", "holes")),
		Down:    key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↑/↓", "holes")),
		Advance: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "to the setting")),
	}
}

// pickerKeys choose a profile from the list.
type pickerKeys struct {
	Up, Down, Choose, Cancel key.Binding
}

func newPickerKeys() pickerKeys {
	return pickerKeys{
		Up:     key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑", "up")),
		Down:   key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↓", "down")),
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
		Up:      key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/↓", "scroll")),
		Down:    key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↑/↓", "scroll")),
		Advance: key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "next panel")),
	}
}
