package segment_test

import (
	"context"
	"fmt"
	"log"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
)

// A model file's text: the demo tower joint with a coarse mesh, linear
// elastic, loaded in four increments.
const joint = `
title = "coarse demo joint"
[tower]
diameter = 4300
bolts = 120
[shell]
thickness = 28
length = 600
material = "S355"
[flange]
thickness = 90
a = 75
b = 85
material = "S355"
[bolt]
size = "M48"
grade = "10.9"
thread = "partial"
thread_length = 24
hole = 52
washer_outer = 92
washer_thickness = 8
head_height = 30
nut_height = 38
[contact]
friction = 0.2
[load]
max_displacement = 1.2
increments = 4
[mesh]
size = 16
[analysis]
materials = "elastic"
`

// Run analyses one segment in-process: the preload, then the tension
// stage, with the joint figures read off the history.
func ExampleRun() {
	spec, err := modelfile.Decode([]byte(joint))
	if err != nil {
		log.Fatal(err) // a *modelfile.Error lists every problem of the file
	}
	var done int
	res, err := segment.Run(context.Background(), spec, segment.Options{
		Progress: func(n, all int) { done = n },
	})
	if err != nil {
		log.Fatal(err)
	}
	if res.Failure != nil {
		log.Fatal(res.Failure) // a stage did not converge; res holds what did
	}
	f := res.Figures
	fmt.Printf("increments %d of %d, %s\n", done, spec.Load.Increments, res.Ending)
	fmt.Printf("preload %.0f kN (target %.0f kN)\n", f.PreloadReachedKN, f.PreloadTargetKN)
	fmt.Printf("opening load %.0f kN, largest Z %.0f kN\n", *f.OpeningLoadKN, f.PeakLoadKN)
	last := res.History[len(res.History)-1]
	fmt.Printf("bolt force at the end %.0f kN\n", last.Fs/1e3)
	fmt.Println(f.FailureLocation)
	// Output:
	// increments 4 of 4, maximum displacement reached
	// preload 1032 kN (target 1031 kN)
	// opening load 76 kN, largest Z 439 kN
	// bolt force at the end 1113 kN
	// not assessed: linear elastic materials
}
