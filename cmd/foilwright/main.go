// Command foilwright turns measured or exported coordinates of a lifting
// section into a clean, normalised, repanelled section and runs analysis
// stages on it. Run "foilwright help" for the commands.
package main

import "os"

func main() {
	os.Exit(execute(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
