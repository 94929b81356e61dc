package campaign

import (
	"math"
	"math/cmplx"

	"github.com/foilwright/foilwright/internal/scangen"
)

// ktFlow is the exact potential flow about a Kármán–Trefftz section: the
// flow past the circle |ζ − ζc| = R with the circulation that puts the
// rear stagnation point at ζ = 1 (the Kutta condition), carried to the
// section by the map of scangen (Milne-Thomson, Theoretical Hydrodynamics,
// 5th ed., Macmillan, 1968; Katz, J. and Plotkin, A., Low-Speed
// Aerodynamics, 2nd ed., Cambridge University Press, 2001, ch. 6).
//
// Far from the circle z ≈ ζ, so the free stream is the same in both
// planes. Angles here are in the section's normalised frame: a free stream
// at α there is at α + θ in the mapping plane, θ the chord line's angle.
type ktFlow struct {
	zc           complex128
	n, r, beta   float64
	turn, chordZ float64 // θ and the chord in the mapping plane
}

func newKTFlow(k scangen.KTSpec, sh *scangen.Shape) ktFlow {
	zc := complex(k.CentreX, k.CentreY)
	_, turn, chord := sh.RawFrame()
	return ktFlow{
		zc: zc, n: 2 - k.TEAngleDeg/180, r: cmplx.Abs(1 - zc),
		beta: math.Atan2(k.CentreY, 1-k.CentreX), turn: turn, chordZ: chord,
	}
}

// circulation returns the clockwise circulation Γ/V∞ at α (radians):
// 4πR sin(α + θ + β), β the angle of zero lift in the circle plane.
func (f ktFlow) circulation(alpha float64) float64 {
	return 4 * math.Pi * f.r * math.Sin(alpha+f.turn+f.beta)
}

// cl returns the exact lift coefficient at α, 2Γ/(V∞ c).
func (f ktFlow) cl(alpha float64) float64 { return 2 * f.circulation(alpha) / f.chordZ }

// cp returns the exact Cp = 1 − (V/V∞)² at circle angle φ for α: the
// circle's complex velocity divided by dz/dζ = 4n² w / ((1 − w)² (ζ² − 1)),
// w = ((ζ−1)/(ζ+1))ⁿ.
func (f ktFlow) cp(phi, alpha float64) float64 {
	am := alpha + f.turn
	zeta := f.zc + cmplx.Rect(f.r, phi)
	d := zeta - f.zc
	w := cmplx.Exp(complex(0, -am)) - complex(f.r*f.r, 0)*cmplx.Exp(complex(0, am))/(d*d) +
		complex(0, f.circulation(alpha))/(2*math.Pi*d)
	ratio := cmplx.Pow((zeta-1)/(zeta+1), complex(f.n, 0))
	dz := 4 * complex(f.n*f.n, 0) * ratio / ((1 - ratio) * (1 - ratio) * (zeta*zeta - 1))
	v := cmplx.Abs(w / dz)
	return 1 - v*v
}
