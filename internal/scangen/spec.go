package scangen

// Spec is a case: everything that decides a generated scan except the
// random draws, which come from the seed given to Generate. It encodes to
// JSON so a case can be written down and rerun.
type Spec struct {
	// Category names the kind of measurement the spec imitates (see Draw):
	// general, cmm, scan, cad, lift, dense.
	Category  string    `json:"category"`
	Shape     ShapeSpec `json:"shape"`
	Sampling  Sampling  `json:"sampling"`
	Noise     Noise     `json:"noise"`
	Defects   Defects   `json:"defects"`
	Order     Order     `json:"order"`
	Placement Placement `json:"placement"`
	File      FileSpec  `json:"file"`
}

// Sampling says where along the outline the points fall.
type Sampling struct {
	// Points is the number of points drawn on the outline, before
	// missing stretches take theirs away.
	Points int `json:"points"`
	// Sigma is the σ of the log-normal factor of each arc-length gap.
	Sigma float64 `json:"sigma"`
	// Wave is the amplitude of a slow random wave in the log of the point
	// density (a few periods round the outline).
	Wave float64 `json:"wave"`
	// Zone is "" (none), "nose" (a denser nose: the probe operator slows
	// there) or "sparse" (a stretch the scanner's beam grazed).
	Zone string `json:"zone,omitempty"`
	// ZoneFactor is the density at the zone's centre relative to
	// elsewhere: > 1 denser, < 1 sparser.
	ZoneFactor float64 `json:"zone_factor,omitempty"`
	// Missing stretches of the outline hold no point; each is MissingLen
	// of the perimeter long.
	Missing    int     `json:"missing,omitempty"`
	MissingLen float64 `json:"missing_len,omitempty"`
	// CAD, when set, replaces all of the above by the stations of a CAD
	// export: "cosine" (chord stations by the cosine law on a NACA
	// section, even steps of the circle angle on a Kármán–Trefftz one) or
	// "uniform" (even arc-length steps), PerSurface intervals a surface.
	CAD        string `json:"cad,omitempty"`
	PerSurface int    `json:"per_surface,omitempty"`
}

// Noise is the scatter of the points normal to the surface (and out of
// the plane of 3D points), a standard deviation: either a fraction of the
// chord or an absolute figure in millimetres.
type Noise struct {
	Chord float64 `json:"chord,omitempty"`
	MM    float64 `json:"mm,omitempty"`
}

// Defects are the lines that are not clean points of the outline.
type Defects struct {
	// Outliers is the share of points moved off the surface by 0.5–5 % of
	// the chord (at least ten times the noise), either side: probe slips.
	Outliers float64 `json:"outliers,omitempty"`
	// Bursts groups the outliers in runs of 2–4 neighbouring points off
	// by about the same distance, as a scanner's reflections leave them.
	Bursts bool `json:"bursts,omitempty"`
	// Duplicates is the share of points written twice; NearShare of those
	// copies differ from their original by a hair (1e-7 to 3e-5 chord).
	Duplicates float64 `json:"duplicates,omitempty"`
	NearShare  float64 `json:"near_share,omitempty"`
	// CloseLoop repeats the first point at the end (a CAD export that
	// closes its polyline by repeating the start).
	CloseLoop bool `json:"close_loop,omitempty"`
}

// Order is the order of the lines in the file.
type Order struct {
	// Mode is "loop" (along the outline from a random start), "two-pass"
	// (upper surface nose to tail, then lower surface nose to tail, as a
	// probe program runs) or "shuffled".
	Mode    string `json:"mode"`
	Reverse bool   `json:"reverse,omitempty"` // a loop the other way round
}

// Placement puts the normalised section onto the part.
type Placement struct {
	ChordMM  float64 `json:"chord_mm"`
	TwistDeg float64 `json:"twist_deg"` // nose-up, before the orientation
	// Orientation is "standard" (nose towards −x, upper side +y),
	// "reversed" (nose towards +x), "upside-down" or
	// "reversed-upside-down".
	Orientation string     `json:"orientation"`
	LEMM        [2]float64 `json:"le_mm"` // leading edge in the plane, mm
	// Plane is "" (2D points), "z" (3D points at a constant z) or
	// "tilted" (3D points in a plane tilted by TiltDeg about a horizontal
	// axis at SpinDeg, through a point at height ZMM).
	Plane   string  `json:"plane,omitempty"`
	ZMM     float64 `json:"z_mm,omitempty"`
	TiltDeg float64 `json:"tilt_deg,omitempty"`
	SpinDeg float64 `json:"spin_deg,omitempty"`
}

// FileSpec is the format of the file.
type FileSpec struct {
	// Format is "csv", "blank" (blank-separated columns), "tab",
	// "semicolon" (with decimal commas), "dxf-points" or "dxf-polyline".
	Format string `json:"format"`
	Units  string `json:"units"` // mm, m or in
	// Header is "none" (units in a comment), "names" (x,y[,z] and a units
	// comment), "units" (x [mm],y [mm]...), "idx" (idx,x,y,z) or "point"
	// (point,x,y).
	Header string `json:"header,omitempty"`
	// Decimals is the number of decimals written; -1 writes every digit.
	Decimals int `json:"decimals"`
}
