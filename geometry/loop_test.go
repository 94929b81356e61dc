package geometry

import "testing"

func TestLoop(t *testing.T) {
	square := []Point{{0, 0}, {1, 0}, {1, 1}, {0, 1}}
	if !InsideLoop(square, Point{0.5, 0.5}) || InsideLoop(square, Point{1.5, 0.5}) {
		t.Error("InsideLoop of the unit square")
	}
	bowtie := []Point{{0, 0}, {1, 1}, {1, 0}, {0, 1}}
	if i, j, ok := LoopCrossing(bowtie); !ok || i != 0 || j != 2 {
		t.Errorf("bow tie: (%d, %d, %v), want (0, 2, true)", i, j, ok)
	}
}
