package integrator

import (
	"encoding/binary"
	"errors"
	"math"
)

// rk45StateLen is the size of RK45's saved state: Tol, the proposed
// substep, and the two counters, 8 bytes each.
const rk45StateLen = 32

// MarshalBinary saves what RK45 carries from one Step to the next (the
// proposed substep and the counters), so that a resumed integration takes
// exactly the substeps an uninterrupted one would. Floats are stored as
// their IEEE bits.
func (r *RK45) MarshalBinary() ([]byte, error) {
	b := make([]byte, rk45StateLen)
	binary.LittleEndian.PutUint64(b[0:], math.Float64bits(r.Tol))
	binary.LittleEndian.PutUint64(b[8:], math.Float64bits(r.hsub))
	binary.LittleEndian.PutUint64(b[16:], uint64(r.Substeps))
	binary.LittleEndian.PutUint64(b[24:], uint64(r.Rejected))
	return b, nil
}

// UnmarshalBinary restores a state saved by MarshalBinary.
func (r *RK45) UnmarshalBinary(b []byte) error {
	if len(b) != rk45StateLen {
		return errors.New("rk45 state: wrong length")
	}
	r.Tol = math.Float64frombits(binary.LittleEndian.Uint64(b[0:]))
	r.hsub = math.Float64frombits(binary.LittleEndian.Uint64(b[8:]))
	r.Substeps = int(binary.LittleEndian.Uint64(b[16:]))
	r.Rejected = int(binary.LittleEndian.Uint64(b[24:]))
	return nil
}
