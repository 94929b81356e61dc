package builtin

import (
	"encoding/json"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plugins/stage"
)

// maxFieldPoints is the most grid points one case's flow field may have.
const maxFieldPoints = 200 * 200

// fieldParam asks a panel stage for the flow on a grid.
var fieldParam = stage.Param{
	Name:     "field_grid",
	Type:     stage.Numbers,
	Default:  json.RawMessage("[]"),
	MaxItems: 5,
	Unit:     "chord",
	Doc:      "[x0, x1, y0, y1, step]: also give the stream function and Cp on this grid, for streamlines (empty: none; at most 40000 points)",
}

// grid is a checked field_grid parameter.
type grid struct {
	x0, y0, step float64
	nx, ny       int
}

// fieldGrid reads the field_grid parameter; ok is false when it is empty.
func fieldGrid(v stage.Values) (g grid, ok bool, err error) {
	vals := v.Numbers(fieldParam.Name)
	if len(vals) == 0 {
		return grid{}, false, nil
	}
	if len(vals) != 5 {
		return grid{}, false, stage.BadInput(fmt.Errorf("parameter %q: want [x0, x1, y0, y1, step], got %d number(s)", fieldParam.Name, len(vals)))
	}
	x0, x1, y0, y1, step := vals[0], vals[1], vals[2], vals[3], vals[4]
	if !(x1 > x0) || !(y1 > y0) || !(step > 0) {
		return grid{}, false, stage.BadInput(fmt.Errorf("parameter %q: want x1 > x0, y1 > y0 and step > 0", fieldParam.Name))
	}
	nx, ny := int(math.Floor((x1-x0)/step+1e-9))+1, int(math.Floor((y1-y0)/step+1e-9))+1
	if nx*ny > maxFieldPoints {
		return grid{}, false, stage.BadInput(fmt.Errorf("parameter %q: %d × %d points, more than %d", fieldParam.Name, nx, ny, maxFieldPoints))
	}
	return grid{x0: x0, y0: y0, step: step, nx: nx, ny: ny}, true, nil
}

// sample evaluates at every grid point a function returning the stream
// function and Cp; points where it fails (inside the body) are null.
func (g grid) sample(at func(geometry.Point) (psi, cp float64, err error)) *stage.Field {
	f := &stage.Field{X0: g.x0, Y0: g.y0, DX: g.step, DY: g.step, NX: g.nx, NY: g.ny,
		Psi: make([]*float64, g.nx*g.ny), Cp: make([]*float64, g.nx*g.ny)}
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			p := geometry.Point{X: g.x0 + float64(i)*g.step, Y: g.y0 + float64(j)*g.step}
			psi, cp, err := at(p)
			if err != nil || math.IsNaN(psi) || math.IsInf(psi, 0) || math.IsNaN(cp) || math.IsInf(cp, 0) {
				continue
			}
			f.Psi[j*g.nx+i], f.Cp[j*g.nx+i] = &psi, &cp
		}
	}
	return f
}
