package validation_test

import (
	"fmt"
	"log"

	"rollerbed/solver/transform"
	"rollerbed/validation"
)

// Run one case and list its checks; with the pure-Go transforms it needs no
// cgo.
func ExampleRun() {
	checks, err := validation.Run([]string{"projection"}, validation.Options{Backend: transform.Gonum})
	if err != nil {
		log.Fatal(err)
	}
	for _, c := range checks {
		fmt.Println(c.Name, c.Kind, c.Pass)
	}
	fmt.Println("failed:", len(validation.Failed(checks)))
	// Output:
	// projection/random at-most true
	// projection/idempotent at-most true
	// projection/solenoidal-unchanged at-most true
	// projection/after-steps at-most true
	// failed: 0
}

// A relative check: 0.36814 against exp(−1) within 1e-3.
func ExampleRelative() {
	c := validation.Relative("amplitude", "A(T)/A(0)", 0.36814, 0.36787944, 1e-3, "Taylor & Green 1937, Proc. R. Soc. A 158:499")
	fmt.Println(c.Kind, c.Pass)
	// Output:
	// relative true
}
