// Package layers keeps foilwright's import arrows pointing one way. It
// holds no code: its test reads the table of which packages each package
// may import (imports.txt, shown in DEVELOPERS.md) and fails on any import
// the table does not allow, on a package the table does not list, and on a
// DEVELOPERS.md that no longer shows the table.
package layers
