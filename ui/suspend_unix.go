//go:build unix

package ui

import (
	"os"
	"os/signal"
	"syscall"

	tea "github.com/charmbracelet/bubbletea"
)

// keepTerminal leaves the terminal as it was across a stop from outside
// the program (kill -TSTP, or kill -STOP) and the shell's fg: a caught stop
// signal suspends through the program, which releases the terminal first
// and takes it back on resume; a resume the program did not see coming
// (after an uncatchable stop, while the shell set the terminal back to
// echo) takes the terminal back too. It returns a function that stops
// watching.
func keepTerminal(p *tea.Program) (stop func()) {
	tstp := make(chan os.Signal, 1)
	cont := make(chan os.Signal, 1)
	done := make(chan struct{})
	signal.Notify(tstp, syscall.SIGTSTP)
	signal.Notify(cont, syscall.SIGCONT)
	go func() {
		for {
			select {
			case <-done:
				return
			case <-tstp:
				// Give the terminal back, then really stop; on fg take
				// it again.
				_ = p.ReleaseTerminal()
				// The Go runtime keeps its own handler for SIGTSTP, so the
				// stop itself is SIGSTOP, which nothing can catch.
				_ = syscall.Kill(os.Getpid(), syscall.SIGSTOP)
				select {
				case <-cont:
				case <-done:
					return
				}
				_ = p.RestoreTerminal()
			case <-cont:
				_ = p.ReleaseTerminal()
				_ = p.RestoreTerminal()
			}
		}
	}()
	return func() {
		close(done)
		signal.Stop(tstp)
		signal.Stop(cont)
	}
}

// suspendSelf stops the program as an outside stop would, so that one
// path (keepTerminal's) releases the terminal and takes it back.
func suspendSelf() tea.Msg {
	_ = syscall.Kill(os.Getpid(), syscall.SIGTSTP)
	return nil
}
