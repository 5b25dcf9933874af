package ui

import (
	"bytes"
	"fmt"
	"regexp"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/x/exp/teatest"
	"github.com/stretchr/testify/require"

	"crankside/physiology"
)

// TestWholeFlowInATerminal drives a real program at two sizes from the
// empty start to a setting and checks the hole, speed and dwell on screen
// against setup.MakePlan's.
func TestWholeFlowInATerminal(t *testing.T) {
	for _, size := range [][2]int{{80, 24}, {120, 40}} {
		t.Run(fmt.Sprintf("%dx%d", size[0], size[1]), func(t *testing.T) {
			p, src := demoProfile(t, "demo-a")
			m := New(Options{Profile: p, Source: src, ProfilesDir: t.TempDir(), Now: testNow})
			tm := teatest.NewTestModel(t, m, teatest.WithInitialTermSize(size[0], size[1]))
			tm.Type("175")
			tm.Send(tea.KeyMsg{Type: tea.KeyEnter})
			tm.Type("m")
			tm.Send(tea.KeyMsg{Type: tea.KeyF4})
			want := wantPlan(t, 175, physiology.Male, "demo-a")
			strip := regexp.MustCompile(regexp.QuoteMeta(fmt.Sprintf("Hole %s | %.1f rpm | dwell %.1f s", want.Hole.Label, want.Timing.RPM, want.Timing.DwellS)))
			teatest.WaitFor(t, tm.Output(), func(b []byte) bool {
				return strip.Match(b) && bytes.Contains(b, []byte("SET ON THE MACHINE"))
			}, teatest.WithDuration(20*time.Second), teatest.WithCheckInterval(20*time.Millisecond))
			tm.Send(tea.KeyMsg{Type: tea.KeyCtrlC})
			tm.WaitFinished(t, teatest.WithFinalTimeout(20*time.Second))
			final := tm.FinalModel(t).(*Model)
			require.Equal(t, panelSetting, final.focus)
			require.Equal(t, want.Hole.Label, final.out.plan.Hole.Label)
			require.Equal(t, want.Timing.RPM, final.out.plan.Timing.RPM)
			require.Equal(t, want.Timing.DwellS, final.out.plan.Timing.DwellS)
			v := screen(final)
			require.Regexp(t, `Pin hole\s+`+want.Hole.Label+` `, v)
			require.Regexp(t, `Motor speed\s+`+regexp.QuoteMeta(f1(want.Timing.RPM))+` rpm`, v)
			require.Regexp(t, `Dwell\s+`+regexp.QuoteMeta(f1(want.Timing.DwellS))+` s`, v)
		})
	}
}
