package main

import "github.com/foilwright/foilwright/internal/dense"

// factorisation names the LU factorisation the solver runs. (In a build of
// this program at a commit before package dense, scripts/solver-bench.sh
// replaces this file.)
func factorisation() string { return dense.Current().String() }
