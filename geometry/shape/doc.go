// Package shape makes the analytic reference sections of foilwright: the
// NACA 4-digit sections of NACA Report 824 (open or closed trailing edge)
// and the Kármán–Trefftz sections, images of a circle whose potential flow
// is known exactly. Points come in the node order of package geometry,
// normalised to unit chord.
package shape
