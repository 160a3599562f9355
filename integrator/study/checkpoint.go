package study

import (
	"bufio"
	"context"
	"encoding"
	"encoding/gob"
	"errors"
	"fmt"
	"io"
	"math"
	"sync"
	"time"

	"mgorbit/integrator"
	"mgorbit/integrator/observe"
	"mgorbit/kernels/vec"
	"mgorbit/scenarios"
)

// checkpointMagic starts every checkpoint file, with the layout's version.
const checkpointMagic = "mgorbit checkpoint v1\n"

// Checkpoint is the saved state of a study in progress: every integration's
// complete state at its last saved step (floats kept to the bit), so that a
// resumed study computes exactly what an uninterrupted one would.
type Checkpoint struct {
	// Build names the program that wrote it; a resume needs the same.
	Build string
	// Source, Text and Hash are the scenario's.
	Source, Text, Hash string
	KeepGoing          bool
	Jobs               []JobState
}

// JobState is one integration's state after Step steps (Step 0: none
// saved, the integration starts afresh).
type JobState struct {
	Name string
	// Plan fingerprints the integration's setup (method, step, counts,
	// stack), so a checkpoint of another plan is refused.
	Plan string
	Step int64
	// Finished is set once the integration has taken its last step.
	Finished bool
	T        float64
	X, V, A  []vec.V
	// Stepper is the stepper's own state (encoding.BinaryMarshaler), if any.
	Stepper  []byte
	Trackers []TrackerSlot

	MaxEnergyErr, MaxAngMomErr []float64
	SystemEnergyErr            float64
	Exceeded                   []bool
	Trajectory                 []Row
	Breaches                   []string
}

// TrackerSlot holds one body's tracker; Present is false for bodies
// without a primary.
type TrackerSlot struct {
	Present bool
	State   observe.TrackerState
}

// Done and Total count the steps saved and planned over all integrations.
func (c *Checkpoint) Done() (done, total int64) {
	for _, j := range c.Jobs {
		done += j.Step
	}
	return done, c.total()
}

func (c *Checkpoint) total() int64 {
	var t int64
	for _, j := range c.Jobs {
		t += planSteps(j.Plan)
	}
	return t
}

// Encode writes the checkpoint.
func (c *Checkpoint) Encode(w io.Writer) error {
	if _, err := io.WriteString(w, checkpointMagic); err != nil {
		return err
	}
	return gob.NewEncoder(w).Encode(c)
}

// DecodeCheckpoint reads a checkpoint written by Encode.
func DecodeCheckpoint(r io.Reader) (*Checkpoint, error) {
	br := bufio.NewReader(r)
	head := make([]byte, len(checkpointMagic))
	if _, err := io.ReadFull(br, head); err != nil || string(head) != checkpointMagic {
		return nil, errors.New("not an mgorbit checkpoint (or one of another layout)")
	}
	c := new(Checkpoint)
	if err := gob.NewDecoder(br).Decode(c); err != nil {
		return nil, fmt.Errorf("damaged checkpoint: %w", err)
	}
	return c, nil
}

// Checkpointing asks Run to save its state as it goes and on interruption,
// or to continue from a saved state.
type Checkpointing struct {
	// EverySteps saves after every so many steps of the main integration
	// (the half-step companions save at the same simulated times);
	// EveryWall saves about that often in wall-clock time. Zero for both:
	// save only on interruption.
	EverySteps int64
	EveryWall  time.Duration
	// Save writes one checkpoint. Run calls it from its integrating
	// goroutines, one call at a time.
	Save func(*Checkpoint) error
	// Resume, if set, is the checkpoint to continue from.
	Resume *Checkpoint
	// Build names the program (version and toolchain); it is stored, and a
	// resume from another build is refused.
	Build string

	// Filled in by Run: steps computed in this run and taken over from the
	// checkpoint, checkpoints saved, and the last save error, if any.
	StepsComputed, StepsResumed int64
	Saved                       int
	SaveErr                     error
}

// ErrCheckpointMismatch marks a checkpoint that does not belong to the run
// it was to resume.
var ErrCheckpointMismatch = errors.New("the checkpoint does not match this run")

// InterruptedError is returned when the run was stopped by its context. It
// matches ErrInterrupted.
type InterruptedError struct {
	Saved       bool  // a checkpoint with the last complete steps was written
	SaveErr     error // why not, if not
	Done, Total int64 // steps done (saved) and planned over all integrations
}

func (e *InterruptedError) Error() string {
	if e.Saved {
		return fmt.Sprintf("interrupted after %d of %d steps, all saved", e.Done, e.Total)
	}
	if e.SaveErr != nil {
		return fmt.Sprintf("interrupted after %d of %d steps; no checkpoint could be written: %v", e.Done, e.Total, e.SaveErr)
	}
	return fmt.Sprintf("interrupted after %d of %d steps", e.Done, e.Total)
}

// Is makes errors.Is(err, ErrInterrupted) hold.
func (e *InterruptedError) Is(target error) bool { return target == ErrInterrupted }

// planOf fingerprints a job. The step count leads, so total() can read it.
func planOf(j *job) string {
	su := j.setup
	return fmt.Sprintf("steps=%d method=%s h=%x every=%d tol=%x etol=%x jtol=%x record=%v bodies=%d stack=%s",
		su.Steps, su.Method, math.Float64bits(su.H), su.OutputEvery, math.Float64bits(su.Tolerance),
		math.Float64bits(su.EnergyTol), math.Float64bits(su.AngMomTol), j.record, len(su.GM), su.Stack.String())
}

func planSteps(plan string) int64 {
	var n int64
	fmt.Sscanf(plan, "steps=%d", &n)
	return n
}

// coordinator gathers the jobs' snapshots and writes a checkpoint once
// every unfinished job has passed the next saving point.
type coordinator struct {
	cp        *Checkpointing
	sc        *scenarios.Scenario
	keepGoing bool

	mu      sync.Mutex
	states  []JobState
	passed  []int64 // saving points passed per job; finishedMark when done
	written int64
	hooks   []*jobHook
}

const finishedMark = math.MaxInt64

// newCoordinator prepares the hooks, checking a checkpoint to resume
// against the planned jobs. It returns nil when cp is nil.
func newCoordinator(cp *Checkpointing, sc *scenarios.Scenario, keepGoing bool, jobs []*job) (*coordinator, error) {
	if cp == nil {
		return nil, nil
	}
	co := &coordinator{cp: cp, sc: sc, keepGoing: keepGoing,
		states: make([]JobState, len(jobs)), passed: make([]int64, len(jobs))}
	if r := cp.Resume; r != nil {
		if err := co.match(r, jobs); err != nil {
			return nil, err
		}
	}
	mainSteps := jobs[0].setup.Steps
	least := int64(finishedMark)
	for k, j := range jobs {
		h := &jobHook{co: co, index: k, name: j.name, plan: planOf(j), wall: cp.EveryWall, last: time.Now()}
		co.states[k] = JobState{Name: h.name, Plan: h.plan}
		if cp.EverySteps > 0 && mainSteps > 0 {
			h.every = max(1, cp.EverySteps*j.setup.Steps/mainSteps)
		}
		if r := cp.Resume; r != nil && r.Jobs[k].Step > 0 {
			s := r.Jobs[k]
			h.resume = &s
			co.states[k] = s
			cp.StepsResumed += s.Step
			switch {
			case s.Finished:
				co.passed[k] = finishedMark
			case h.every > 0:
				co.passed[k] = s.Step / h.every
			}
		}
		least = min(least, co.passed[k])
		co.hooks = append(co.hooks, h)
	}
	if least != finishedMark {
		co.written = least
	}
	return co, nil
}

func (co *coordinator) match(r *Checkpoint, jobs []*job) error {
	mismatch := func(format string, args ...any) error {
		return fmt.Errorf("%w: %s; resume with the same scenario, program and flags, or remove the checkpoint to start afresh",
			ErrCheckpointMismatch, fmt.Sprintf(format, args...))
	}
	switch {
	case r.Hash != co.sc.Hash:
		return mismatch("it was written for the scenario %s (sha256 %.12s...), this run is of %s (sha256 %.12s...)", r.Source, r.Hash, co.sc.Source, co.sc.Hash)
	case r.Build != co.cp.Build:
		return mismatch("it was written by %q, this is %q", r.Build, co.cp.Build)
	case r.KeepGoing && !co.keepGoing:
		// With --keep-going the saved state may hold breaches a stopping
		// run would not have passed. The other way round is sound: up to
		// the checkpoint there was no breach.
		return mismatch("it was written with --keep-going; pass --keep-going again")
	case len(r.Jobs) != len(jobs):
		return mismatch("it holds %d integrations, this run plans %d", len(r.Jobs), len(jobs))
	}
	for k, j := range jobs {
		s := r.Jobs[k]
		if s.Name != j.name || s.Plan != planOf(j) {
			return mismatch("its %s integration was planned as %q, this run plans %q", s.Name, s.Plan, planOf(j))
		}
		if s.Step < 0 {
			return mismatch("its %s integration is at step %d", s.Name, s.Step)
		}
	}
	return nil
}

func (co *coordinator) hook(k int) *jobHook {
	if co == nil {
		return nil
	}
	return co.hooks[k]
}

// deposit records job k's snapshot after its saving point number n
// (finishedMark when the job is done) and saves a checkpoint when every
// unfinished job has passed a new saving point.
func (co *coordinator) deposit(k int, s JobState, n int64) {
	co.mu.Lock()
	defer co.mu.Unlock()
	co.states[k] = s
	co.passed[k] = n
	least := int64(finishedMark)
	for _, p := range co.passed {
		least = min(least, p)
	}
	if least == finishedMark || least <= co.written {
		return // all done (the outputs follow), or some job is behind
	}
	co.written = least
	co.save()
}

// ended marks job k as not going to deposit any more (it failed).
func (co *coordinator) ended(k int) {
	if co == nil {
		return
	}
	co.mu.Lock()
	defer co.mu.Unlock()
	co.passed[k] = finishedMark
}

func (co *coordinator) snapshot() *Checkpoint {
	return &Checkpoint{Build: co.cp.Build, Source: co.sc.Source, Text: co.sc.Text, Hash: co.sc.Hash,
		KeepGoing: co.keepGoing, Jobs: append([]JobState(nil), co.states...)}
}

// save writes the current states; co.mu must be held.
func (co *coordinator) save() error {
	if co.cp.Save == nil {
		return errors.New("no place to save a checkpoint")
	}
	if err := co.cp.Save(co.snapshot()); err != nil {
		co.cp.SaveErr = err
		return err
	}
	co.cp.Saved++
	return nil
}

// settle sorts out the jobs' errors once all have returned: a failure is
// reported as such (the checkpoints already written stay, and resuming
// them reproduces it); otherwise an interruption writes the checkpoint of
// the last completed steps.
func (co *coordinator) settle(jobs []*job) error {
	interrupted := false
	for _, j := range jobs {
		switch {
		case j.err == nil:
		case errors.Is(j.err, ErrInterrupted):
			interrupted = true
		case j.name != "newton": // the Newtonian comparison may fail; it only informs
			return fmt.Errorf("%s run: %w", j.name, j.err)
		}
	}
	if co == nil {
		if interrupted {
			return ErrInterrupted
		}
		return nil
	}
	for _, h := range co.hooks {
		co.cp.StepsComputed += h.computed
	}
	if !interrupted {
		return nil
	}
	co.mu.Lock()
	defer co.mu.Unlock()
	ie := &InterruptedError{}
	cp := co.snapshot()
	ie.Done, ie.Total = cp.Done()
	if err := co.save(); err != nil {
		ie.SaveErr = err
	} else {
		ie.Saved = true
	}
	return ie
}

// jobHook is one integration's link to the coordinator. Its methods accept
// a nil receiver (no checkpointing): then only the interruption is seen.
type jobHook struct {
	co    *coordinator
	index int
	name  string
	plan  string
	every int64 // steps between saving points, 0 for none
	wall  time.Duration
	last  time.Time
	// wallPassed counts the wall-clock saving points passed.
	wallPassed int64

	resume *JobState
	// computed counts the steps this run took.
	computed int64

	sys      *integrator.System
	stepper  integrator.Stepper
	trackers []*observe.Tracker
	res      *Result
}

// start restores the saved state into the integration's variables, if
// there is one, binds them for later snapshots, and returns the first
// step to compute.
func (h *jobHook) start(sys *integrator.System, st integrator.Stepper, trackers []*observe.Tracker, res *Result) (int64, error) {
	if h == nil {
		return 1, nil
	}
	h.sys, h.stepper, h.trackers, h.res = sys, st, trackers, res
	s := h.resume
	if s == nil {
		return 1, nil
	}
	n := len(sys.X)
	if len(s.X) != n || len(s.V) != n || len(s.A) != n || len(s.Trackers) != n ||
		len(s.MaxEnergyErr) != n || len(s.MaxAngMomErr) != n || len(s.Exceeded) != n {
		return 0, fmt.Errorf("%w: its %s integration has the wrong number of bodies", ErrCheckpointMismatch, s.Name)
	}
	sys.T = s.T
	copy(sys.X, s.X)
	copy(sys.V, s.V)
	copy(sys.A, s.A)
	if m, ok := st.(encoding.BinaryUnmarshaler); ok {
		if err := m.UnmarshalBinary(s.Stepper); err != nil {
			return 0, fmt.Errorf("%w: %s stepper: %v", ErrCheckpointMismatch, s.Name, err)
		}
	}
	for i, slot := range s.Trackers {
		if slot.Present != (trackers[i] != nil) {
			return 0, fmt.Errorf("%w: its %s integration follows other orbits", ErrCheckpointMismatch, s.Name)
		}
		if slot.Present {
			trackers[i] = observe.RestoreTracker(slot.State)
		}
	}
	copy(res.MaxEnergyErr, s.MaxEnergyErr)
	copy(res.MaxAngMomErr, s.MaxAngMomErr)
	copy(res.Exceeded, s.Exceeded)
	res.SystemEnergyErr = s.SystemEnergyErr
	res.Trajectory = append(res.Trajectory[:0], s.Trajectory...)
	res.Breaches = append([]string(nil), s.Breaches...)
	return s.Step + 1, nil
}

// after is called at the end of step k; cadence is set at the output
// cadence, where the context is polled, and last after the last step. It
// returns ErrInterrupted once the context is done, after saving the state
// of step k.
func (h *jobHook) after(ctx context.Context, k int64, cadence, last bool) error {
	if h == nil {
		if cadence && ctx.Err() != nil {
			return ErrInterrupted
		}
		return nil
	}
	h.computed++
	if cadence && ctx.Err() != nil {
		h.co.deposit(h.index, h.snapshot(k), h.passedAt(k))
		return ErrInterrupted
	}
	switch {
	case last:
		s := h.snapshot(k)
		s.Finished = true
		h.co.deposit(h.index, s, finishedMark)
	case h.every > 0 && k%h.every == 0:
		h.co.deposit(h.index, h.snapshot(k), h.passedAt(k))
	case h.wall > 0 && cadence && time.Since(h.last) >= h.wall:
		h.last = time.Now()
		h.wallPassed++
		h.co.deposit(h.index, h.snapshot(k), h.wallPassed)
	}
	return nil
}

// passedAt is the number of step-count saving points passed by step k.
func (h *jobHook) passedAt(k int64) int64 {
	if h.every > 0 {
		return k / h.every
	}
	return h.wallPassed
}

// snapshot copies what later steps change; the trajectory is append-only,
// so its first rows are shared, not copied.
func (h *jobHook) snapshot(k int64) JobState {
	sys, res := h.sys, h.res
	s := JobState{Name: h.name, Plan: h.plan, Step: k, T: sys.T,
		X: append([]vec.V(nil), sys.X...), V: append([]vec.V(nil), sys.V...), A: append([]vec.V(nil), sys.A...),
		MaxEnergyErr: append([]float64(nil), res.MaxEnergyErr...), MaxAngMomErr: append([]float64(nil), res.MaxAngMomErr...),
		SystemEnergyErr: res.SystemEnergyErr, Exceeded: append([]bool(nil), res.Exceeded...),
		Trajectory: res.Trajectory[:len(res.Trajectory):len(res.Trajectory)],
		Breaches:   append([]string(nil), res.Breaches...),
		Trackers:   make([]TrackerSlot, len(h.trackers))}
	if m, ok := h.stepper.(encoding.BinaryMarshaler); ok {
		s.Stepper, _ = m.MarshalBinary()
	}
	for i, tr := range h.trackers {
		if tr != nil {
			s.Trackers[i] = TrackerSlot{Present: true, State: tr.Snapshot()}
		}
	}
	return s
}
