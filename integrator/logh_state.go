package integrator

import (
	"encoding/binary"
	"errors"
	"math"
)

// MarshalBinary saves what LogH fixes at its first step: the binding
// energy and the fictitious step per h, both from the initial state. A
// resumed integration must reuse them; recomputed from a later state they
// would differ in the last bits, and so would the whole continuation.
func (l *LogH) MarshalBinary() ([]byte, error) {
	if !l.ready {
		return []byte{0}, nil
	}
	b := make([]byte, 1, 1+8*(2+len(l.gm)))
	b[0] = 1
	for _, x := range append([]float64{l.binding, l.dsPerH}, l.gm...) {
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(x))
	}
	return b, nil
}

// UnmarshalBinary restores a state saved by MarshalBinary.
func (l *LogH) UnmarshalBinary(b []byte) error {
	if len(b) == 1 && b[0] == 0 {
		l.ready = false
		return nil
	}
	if len(b) < 17 || b[0] != 1 || (len(b)-1)%8 != 0 {
		return errors.New("logh state: malformed")
	}
	v := make([]float64, (len(b)-1)/8)
	for i := range v {
		v[i] = math.Float64frombits(binary.LittleEndian.Uint64(b[1+8*i:]))
	}
	l.binding, l.dsPerH, l.gm = v[0], v[1], v[2:]
	// the body lists follow from gm, as in prepare
	l.massive, l.tests = nil, nil
	for i, m := range l.gm {
		if m != 0 {
			l.massive = append(l.massive, i)
		} else {
			l.tests = append(l.tests, i)
		}
	}
	l.central = -1
	if len(l.massive) == 1 {
		l.central = l.massive[0]
	}
	l.ready = true
	return nil
}
