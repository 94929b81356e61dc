package prep

// Settings are the prep options of one section, named and typed as the
// "prepare" keys of a pipeline file (the same options as the prep command's
// flags). A nil pointer or an empty string means "not set": the geometry
// chain uses its default. Ranges are checked when the file is parsed.
type Settings struct {
	// Reading; an input may override these.
	Format  string   `json:"format,omitempty"`   // "" auto, delimited, loop, surfaces, dxf, stl
	Columns string   `json:"columns,omitempty"`  // "2,3,4" (1-based) or header names "x,y,z"
	Units   string   `json:"units,omitempty"`    // mm, in, m, chord
	Cut     string   `json:"cut,omitempty"`      // "z=240" or "px,py,pz:nx,ny,nz"
	Layer   string   `json:"layer,omitempty"`    // read only the DXF entities on this layer
	Band    *float64 `json:"band,omitempty"`     // keep 3D points within ±Band of the plane, input units
	FlatTol *float64 `json:"flat_tol,omitempty"` // refuse when points depart from their plane by more, input units

	// Cleaning.
	MergeTol     *float64 `json:"merge_tol,omitempty"`     // merge points closer than this, input units
	OutlierSigma *float64 `json:"outlier_sigma,omitempty"` // drop points beyond this many robust sigmas
	KeepOutliers *bool    `json:"keep_outliers,omitempty"` // report outliers but keep them
	Loop         *int     `json:"loop,omitempty"`          // 0 largest-area loop, K the K-th largest
	ProbeRadius  string   `json:"probe_radius,omitempty"`  // the points are centres of a probe ball this big: "1.5mm", or input units

	// Fitting and edges.
	Noise         *float64    `json:"noise,omitempty"`           // nil auto, 0 interpolate, else expected noise in input units
	FitTol        *float64    `json:"fit_tol,omitempty"`         // list points farther than this from the curve, input units
	TE            string      `json:"te,omitempty"`              // auto, keep, sharpen (or the earlier close)
	TEThickness   string      `json:"te_thickness,omitempty"`    // reshape the TE to this thickness: "0.5mm", "0.002c", or input units
	TEBlendLength string      `json:"te_blend_length,omitempty"` // length ahead of the TE over which a reshape blends in, as TEThickness
	TEBlend       *float64    `json:"te_blend,omitempty"`        // earlier form: aft chord fraction over which te close blends
	LEAt          *[2]float64 `json:"le_at,omitempty"`           // leading edge in input coordinates
	Mirror        string      `json:"mirror,omitempty"`          // auto, yes, no

	// Repanelling.
	Panels          *int     `json:"panels,omitempty"`    // 16..2000; nil chooses the count for PanelTol
	PanelTol        *float64 `json:"panel_tol,omitempty"` // largest panel-to-curve distance of an automatic count, chord units
	Spacing         string   `json:"spacing,omitempty"`   // cosine, half-cosine, uniform, curvature
	LECluster       *float64 `json:"le_cluster,omitempty"`
	TECluster       *float64 `json:"te_cluster,omitempty"`
	CurvatureWeight *float64 `json:"curvature_weight,omitempty"`

	// Properties.
	ThicknessMode string `json:"thickness_mode,omitempty"` // chord, camber
	CamberMode    string `json:"camber_mode,omitempty"`    // mean, inscribed
}
