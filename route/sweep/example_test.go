package sweep_test

import (
	"fmt"

	"spanwright/route/sweep"
)

// ExampleLoad lists the scenarios of a sweep file in sweep order: the product of the axes,
// the first varying slowest, then the cases.
func ExampleLoad() {
	f, err := sweep.Load("../../testdata/sweep/small.yaml")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range f.Scenarios() {
		fmt.Println(s.Index, s.ID, s.Describe())
	}
	// Output:
	// 0 adm-10g-c77f63ba hub=ADM defaults.rate=10G
	// 1 adm-25g-4d0c3e53 hub=ADM defaults.rate=25G
	// 2 eng-10g-505394b2 hub=ENG defaults.rate=10G
	// 3 eng-25g-aa1f3d10 hub=ENG defaults.rate=25G
	// 4 all-diverse-bcb3603c case all-diverse: defaults.redundancy=diverse
	// 5 bad-hub-0d4d7434 case bad-hub: hub=NOWHERE
}

// ExampleParseShard shows which scenarios a shard of an array job plans.
func ExampleParseShard() {
	s, err := sweep.ParseShard("2/3")
	if err != nil {
		fmt.Println(err)
		return
	}
	for i := 0; i < 8; i++ {
		if s.Has(i) {
			fmt.Print(i, " ")
		}
	}
	fmt.Println()
	// Output: 1 4 7
}
