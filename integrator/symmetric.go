package integrator

// Symmetric is implemented by fixed-step methods whose step is symmetric,
// Step(-h) undoing Step(h): the compositions and the Wisdom-Holman maps.
// A partial step back from a step's end then lands on the method's own
// trajectory between steps, which is how pericentres are located to the
// method's accuracy rather than to an interpolant's.
type Symmetric interface {
	Symmetric()
}

// Symmetric implements Symmetric.
func (c *Composition) Symmetric() {}

// Symmetric implements Symmetric.
func (w *WisdomHolman) Symmetric() {}
