//go:build !purego

package vortexpanel

import "golang.org/x/sys/cpu"

// haveAVX2 reports whether the CPU runs the assembly build
// (influence_amd64.s).
var haveAVX2 = cpu.X86.HasAVX2 && cpu.X86.HasFMA

// haveAVX512 reports whether the CPU runs the eight-lane row
// (vortexRowAVX512: AVX-512F, whose operations all the row's are).
var haveAVX512 = haveAVX2 && cpu.X86.HasAVX512F

//go:noescape
func vortexRowAVX2(ca, cb *float64, arr *panelArrays, n int, p *[4]float64, w *float64)

//go:noescape
func vortexRowAVX512(ca, cb *float64, arr *panelArrays, n int, p *[4]float64, w *float64)

//go:noescape
func logAVX2(dst, x *float64, n int) (special int)

//go:noescape
func atan2AVX2(dst, y, x *float64, n int) (special int)

// vortexRowAsm runs the assembly row over the first len(ca) panels of g, a
// positive multiple of 4 that g's arrays and cb hold, with scratch for
// 5·len(ca) values.
func vortexRowAsm(ca, cb []float64, g *panelArrays, p *[4]float64, scratch []float64) {
	n := len(ca)
	_, _ = cb[n-1], scratch[5*n-1]
	_, _, _, _, _, _ = g.x0[n-1], g.y0[n-1], g.tx[n-1], g.ty[n-1], g.s[n-1], g.inv[n-1]
	vortexRowAVX2(&ca[0], &cb[0], g, n, p, &scratch[0])
}

// vortexRow512 is vortexRowAsm on eight panels at a time: len(ca) a
// positive multiple of 8. The same coefficients, bit for bit.
func vortexRow512(ca, cb []float64, g *panelArrays, p *[4]float64, scratch []float64) {
	n := len(ca)
	_, _ = cb[n-1], scratch[5*n-1]
	_, _, _, _, _, _ = g.x0[n-1], g.y0[n-1], g.tx[n-1], g.ty[n-1], g.s[n-1], g.inv[n-1]
	vortexRowAVX512(&ca[0], &cb[0], g, n, p, &scratch[0])
}

// logAsm and atan2Asm run the assembly logarithm and angle over slices of
// a common length that is a positive multiple of 4; the tests compare them
// with the math package. They return the number of entries outside the
// domain the vector code covers, which are left NaN.
func logAsm(dst, x []float64) int {
	_ = x[len(dst)-1]
	return logAVX2(&dst[0], &x[0], len(dst))
}

func atan2Asm(dst, y, x []float64) int {
	_, _ = y[len(dst)-1], x[len(dst)-1]
	return atan2AVX2(&dst[0], &y[0], &x[0], len(dst))
}
