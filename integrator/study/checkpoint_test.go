package study

import (
	"bytes"
	"context"
	"encoding/gob"
	"errors"
	"reflect"
	"strings"
	"testing"

	"mgorbit/kernels"
	"mgorbit/scenarios"
)

// outcome is everything of a study that reaches the output files, gob
// encoded (float64 bits exactly), so two studies compare byte for byte.
func outcome(t *testing.T, st *Study) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := gob.NewEncoder(&b).Encode(struct {
		S []Summary
		M *Result
		W []string
	}{st.Summaries, st.Main, st.Warnings}); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// saver collects the checkpoints a run writes, encoded as a file would be,
// and cancels the run after the stopAfter-th periodic one (0: never).
type saver struct {
	files     [][]byte
	stopAfter int
	cancel    context.CancelFunc
}

func (s *saver) save(c *Checkpoint) error {
	var b bytes.Buffer
	if err := c.Encode(&b); err != nil {
		return err
	}
	s.files = append(s.files, b.Bytes())
	if s.stopAfter > 0 && len(s.files) == s.stopAfter {
		s.cancel()
	}
	return nil
}

func decode(t *testing.T, b []byte) *Checkpoint {
	t.Helper()
	c, err := DecodeCheckpoint(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func builtin(t *testing.T, name string) *scenarios.Scenario {
	t.Helper()
	sc, err := scenarios.Builtin(name)
	if err != nil {
		t.Fatal(err)
	}
	return sc
}

// shortened keeps a test quick: the scenario for fewer orbits.
func shortened(sc *scenarios.Scenario, orbits float64) *scenarios.Scenario {
	sc.Integrator.Orbits = orbits
	return sc
}

// TestResumeBitIdentical: a study stopped (by its context, and "killed"
// after a periodic checkpoint) and resumed from its checkpoint gives the
// same summaries, trajectory and warnings, bit for bit, as an uninterrupted
// one, and the resumed run computes only the steps that were missing.
// Cases: implicit kicks with five integrations (gr1pn + yukawa: main,
// half-step, reference pair and the Newtonian one), three massive bodies
// (system energy), and rk45, whose proposed substep carries over.
func TestResumeBitIdentical(t *testing.T) {
	newton := kernels.MustStack(kernels.Newton{})
	rk := testScenario(t, newton, 1, 1, 0.4, "rk45", 60.3, 6)
	rk.Integrator.Tolerance = 1e-10
	for _, c := range []struct {
		name string
		sc   *scenarios.Scenario
	}{{"veyra-yukawa", shortened(builtin(t, "veyra-yukawa"), 6)}, {"halden-pair", shortened(builtin(t, "halden-pair"), 15)}, {"rk45", rk},
		{"wisdom-holman-4", testScenario(t, newton, 1, 1, 0.4, "wisdom-holman-4", 100.3, 6)},
		{"logh-leapfrog", testScenario(t, newton, 1, 1, 0.9, "logh-leapfrog", 100.3, 6)}} {
		t.Run(c.name, func(t *testing.T) {
			plain, err := Run(context.Background(), c.sc, Options{})
			if err != nil {
				t.Fatal(err)
			}
			want := outcome(t, plain)
			su, _, _, _ := PlanSetup(c.sc)
			every := su.Steps / 7

			// periodic checkpoints only; the run completes
			all := &saver{}
			full := &Checkpointing{EverySteps: every, Save: all.save, Build: "test"}
			st, err := Run(context.Background(), c.sc, Options{Checkpoint: full})
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(outcome(t, st), want) {
				t.Fatal("checkpointing changed the result")
			}
			if len(all.files) < 3 {
				t.Fatalf("%d checkpoints written at every %d of %d steps, want at least 3", len(all.files), every, su.Steps)
			}
			total := full.StepsComputed

			// as after a SIGKILL: resume from the first periodic checkpoint
			first := decode(t, all.files[0])
			killed := &Checkpointing{EverySteps: every, Save: (&saver{}).save, Resume: first, Build: "test"}
			st, err = Run(context.Background(), c.sc, Options{Checkpoint: killed})
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(outcome(t, st), want) {
				t.Error("resumed from a periodic checkpoint: result differs from the uninterrupted run")
			}
			if killed.StepsResumed == 0 || killed.StepsComputed+killed.StepsResumed != total {
				t.Errorf("resumed run: %d computed + %d taken over, want %d in all with some taken over",
					killed.StepsComputed, killed.StepsResumed, total)
			}

			// interrupted by its context after the second periodic save
			ctx, cancel := context.WithCancel(context.Background())
			defer cancel()
			stop := &saver{stopAfter: 2, cancel: cancel}
			_, err = Run(ctx, c.sc, Options{Checkpoint: &Checkpointing{EverySteps: every, Save: stop.save, Build: "test"}})
			var ie *InterruptedError
			if !errors.As(err, &ie) || !ie.Saved || !errors.Is(err, ErrInterrupted) {
				t.Fatalf("interrupted run returned %v, want a saved InterruptedError", err)
			}
			last := decode(t, stop.files[len(stop.files)-1])
			// (a time-transformed stepper plans its step count only roughly)
			if done, tot := last.Done(); done != ie.Done || tot != ie.Total || done == 0 || done >= total {
				t.Errorf("checkpoint holds %d of %d steps, error says %d of %d, run has %d", done, tot, ie.Done, ie.Total, total)
			}
			again := &Checkpointing{Save: (&saver{}).save, Resume: last, Build: "test"}
			st, err = Run(context.Background(), c.sc, Options{Checkpoint: again})
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(outcome(t, st), want) {
				t.Error("resumed after an interruption: result differs from the uninterrupted run")
			}
			t.Logf("%d steps in all; SIGKILL-like resume computed %d, interrupted resume %d", total, killed.StepsComputed, again.StepsComputed)
		})
	}
}

// TestResumeRefusesOtherRuns: a checkpoint is refused for another
// scenario, another build, or without the --keep-going it was written with.
func TestResumeRefusesOtherRuns(t *testing.T) {
	sc := testScenario(t, kernels.MustStack(kernels.Newton{}), 1, 1, 0.3, "leapfrog", 300.3, 4)
	sc.Hash = "aaaa"
	s := &saver{}
	if _, err := Run(context.Background(), sc, Options{KeepGoing: true,
		Checkpoint: &Checkpointing{EverySteps: 200, Save: s.save, Build: "build-1"}}); err != nil {
		t.Fatal(err)
	}
	cp := decode(t, s.files[0])
	other := *sc
	other.Hash = "bbbb"
	finer := *sc
	finer.Integrator.StepsPerOrbit = 400.3
	for _, c := range []struct {
		name      string
		sc        *scenarios.Scenario
		build     string
		keepGoing bool
		want      string
	}{
		{"other scenario", &other, "build-1", true, "written for the scenario"},
		{"other build", sc, "build-2", true, `written by "build-1"`},
		{"without keep-going", sc, "build-1", false, "pass --keep-going again"},
		{"other step, same hash", &finer, "build-1", true, "planned as"},
	} {
		_, err := Run(context.Background(), c.sc, Options{KeepGoing: c.keepGoing,
			Checkpoint: &Checkpointing{Resume: cp, Build: c.build, Save: (&saver{}).save}})
		if !errors.Is(err, ErrCheckpointMismatch) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want a mismatch saying %q", c.name, err, c.want)
		}
	}
	if _, err := DecodeCheckpoint(strings.NewReader("name = \"x\"\n")); err == nil {
		t.Error("a TOML file was taken for a checkpoint")
	}
	if _, err := DecodeCheckpoint(bytes.NewReader(s.files[0][:len(s.files[0])/2])); err == nil {
		t.Error("a truncated checkpoint was accepted")
	}
}

// TestCheckpointCoversResult: every field of Result is either saved in a
// JobState or recomputed on resume; a new field must be added to one list.
func TestCheckpointCoversResult(t *testing.T) {
	handled := map[string]string{
		"Orbits": "measured at the end", "Isolated": "recomputed from the setup", "Steps": "from the setup",
		"MaxEnergyErr": "saved", "MaxAngMomErr": "saved", "SystemEnergyErr": "saved",
		"Trajectory": "saved", "Breaches": "saved", "Exceeded": "saved",
	}
	rt := reflect.TypeOf(Result{})
	for i := 0; i < rt.NumField(); i++ {
		if _, ok := handled[rt.Field(i).Name]; !ok {
			t.Errorf("Result.%s is neither saved in a checkpoint nor recomputed on resume", rt.Field(i).Name)
		}
	}
}
