// Package planar brings 3D points into the plane of a section: a plane
// given by the user (Spec, ParseSpec: "z=240" or a point and a normal) or
// fitted by least squares (gonum SVD), the map to in-plane coordinates
// that keeps the user's own axes (Through), a band of kept points and the
// flatness of what is kept (Flatten), and the cut of a triangle mesh at a
// plane into ordered loops (Mesh.Slice).
package planar
