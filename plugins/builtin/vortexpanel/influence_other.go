//go:build !amd64 || purego

package vortexpanel

const haveAVX2, haveAVX512 = false, false

func vortexRowAsm(ca, cb []float64, g *panelArrays, p *[4]float64, scratch []float64) {
	panic("vortexpanel: no assembly build")
}

func vortexRow512(ca, cb []float64, g *panelArrays, p *[4]float64, scratch []float64) {
	panic("vortexpanel: no assembly build")
}

func logAsm(dst, x []float64) int { panic("vortexpanel: no assembly build") }

func atan2Asm(dst, y, x []float64) int { panic("vortexpanel: no assembly build") }
