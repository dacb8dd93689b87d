package room

import (
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/dsp/fourier"

	"tempstack/solver"
)

// cycle is the exact periodic solution of a room.
type cycle struct {
	mean      solver.RoomResponse
	meanF     solver.RoomForcing
	harm      []int // harmonic numbers kept
	resp      []solver.RoomResponse
	forcing   []solver.RoomForcing
	air, oper []float64 // over one cycle, samples points
	outdoor   []float64
}

// fourierOf returns the mean and the phasors (exp(+i omega t)) of the
// harmonics 1..n/2-1 of f sampled n times over one period from t = 0.
func fourierOf(fft *fourier.FFT, f func(float64) float64, period float64, n int) (float64, []complex128) {
	x := make([]float64, n)
	for j := range x {
		x[j] = f(period * float64(j) / float64(n))
	}
	c := fft.Coefficients(nil, x)
	ph := make([]complex128, n/2)
	for k := 1; k < n/2; k++ {
		ph[k] = c[k] * complex(2/float64(n), 0)
	}
	return real(c[0]) / float64(n), ph
}

// exact solves room r (the planned room or the bare one) for the Fourier
// series of the forcing over one cycle, and evaluates the air and
// operative temperatures at the samples of the cycle.
//
// Each harmonic k of period P/k is solved exactly (solver.RoomHarmonic,
// ISO 13786 matrices); the mean with the steady conductances. The
// ventilation enters with its daily mean: the exact method is linear.
func (p *plan) exact(r solver.Room) (*cycle, error) {
	n := p.samples
	fft := fourier.NewFFT(n)
	ne := len(r.Elements)
	mo, po := fourierOf(fft, p.outdoor, p.period, n)
	mg, pg := fourierOf(fft, p.gains, p.period, n)
	mb := make([]float64, ne)
	pb := make([][]complex128, ne)
	for k := range r.Elements {
		if p.back[k] != nil {
			mb[k], pb[k] = fourierOf(fft, p.back[k], p.period, n)
		}
	}
	// The windows' sun absorbed at the elements' surfaces, W.
	var ms []float64
	var ps [][]complex128
	if p.surface != nil {
		ms, ps = make([]float64, ne), make([][]complex128, ne)
		for k := range r.Elements {
			if p.surface[k] != nil {
				ms[k], ps[k] = fourierOf(fft, p.surface[k], p.period, n)
			}
		}
	}
	x := &cycle{}
	x.meanF = solver.RoomForcing{Outdoor: complex(mo, 0), Gains: complex(mg, 0), Back: make([]complex128, ne)}
	for k := range mb {
		x.meanF.Back[k] = complex(mb[k], 0)
	}
	if ms != nil {
		x.meanF.Surface = make([]complex128, ne)
		for k := range ms {
			x.meanF.Surface[k] = complex(ms[k], 0)
		}
	}
	var err error
	if x.mean, err = solver.RoomHarmonic(r, 0, x.meanF); err != nil {
		return nil, err
	}
	// Keep the harmonics that carry forcing above round-off.
	scale := 1e-9 * (1 + math.Abs(mo) + math.Abs(mg))
	for k := range mb {
		scale += 1e-9 * math.Abs(mb[k])
	}
	for k := range ms {
		scale += 1e-9 * math.Abs(ms[k])
	}
	cAir := make([]complex128, n/2+1)
	cOp := make([]complex128, n/2+1)
	cAir[0] = complex(real(x.mean.Air)*float64(n), 0)
	cOp[0] = complex(real(p.operative(r, x.mean.Air, x.meanF.Outdoor, x.mean.Surface))*float64(n), 0)
	for k := 1; k < n/2; k++ {
		big := cmplx.Abs(po[k]) > scale || cmplx.Abs(pg[k]) > scale
		f := solver.RoomForcing{Outdoor: po[k], Gains: pg[k], Back: make([]complex128, ne)}
		for e := range pb {
			if pb[e] != nil {
				f.Back[e] = pb[e][k]
				big = big || cmplx.Abs(pb[e][k]) > scale
			}
		}
		if ps != nil {
			f.Surface = make([]complex128, ne)
			for e := range ps {
				if ps[e] != nil {
					f.Surface[e] = ps[e][k]
					big = big || cmplx.Abs(ps[e][k]) > scale
				}
			}
		}
		if !big {
			continue
		}
		res, err := solver.RoomHarmonic(r, p.period/float64(k), f)
		if err != nil {
			return nil, err
		}
		x.harm = append(x.harm, k)
		x.resp = append(x.resp, res)
		x.forcing = append(x.forcing, f)
		half := complex(float64(n)/2, 0)
		cAir[k] = res.Air * half
		cOp[k] = p.operative(r, res.Air, f.Outdoor, res.Surface) * half
	}
	x.air = fft.Sequence(nil, cAir)
	x.oper = fft.Sequence(nil, cOp)
	x.outdoor = make([]float64, n)
	for j := range x.air {
		x.air[j] /= float64(n)
		x.oper[j] /= float64(n)
		x.outdoor[j] = p.outdoor(p.period * float64(j) / float64(n))
	}
	return x, nil
}

// cellsAt returns the exact cell temperatures of every element and the
// air temperature at time t.
func (p *plan) cellsAt(r solver.Room, meshes []*solver.Mesh, x *cycle, t float64) ([][]float64, float64, error) {
	mc, err := solver.RoomCellAmplitudes(r, meshes, 0, x.meanF, x.mean)
	if err != nil {
		return nil, 0, err
	}
	out := make([][]float64, len(mc))
	for e := range mc {
		for _, v := range mc[e] {
			out[e] = append(out[e], real(v))
		}
	}
	air := real(x.mean.Air)
	for i, k := range x.harm {
		per := p.period / float64(k)
		rot := cmplx.Rect(1, 2*math.Pi*t/per)
		air += real(x.resp[i].Air * rot)
		hc, err := solver.RoomCellAmplitudes(r, meshes, per, x.forcing[i], x.resp[i])
		if err != nil {
			return nil, 0, err
		}
		for e := range hc {
			for j, v := range hc[e] {
				out[e][j] += real(v * rot)
			}
		}
	}
	return out, air, nil
}
