package main

import (
	"flag"
	"fmt"
	"io"
	"path/filepath"

	"flangeseg/fem/segment"
	"flangeseg/fem/segment/modelfile"
	"flangeseg/post"
	"flangeseg/post/results"
)

func runMesh(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("mesh", flag.ContinueOnError)
	fs.SetOutput(stderr)
	outDir := fs.String("o", "", "write mesh.vtu into this `DIR` (default: the model file's name without .toml, plus _mesh)")
	fs.Usage = func() {
		fmt.Fprintf(stderr, `Usage: flangeseg mesh MODEL.toml [-o DIR]

Meshes the strip model of MODEL.toml without solving it, writes DIR/mesh.vtu
(cell data region: the index into the region list printed here) and prints
the regions with their out-of-plane thickness and material, the contact
surfaces and the element quality (Jacobian ratio, aspect ratio, corner
angles). Exit codes: 0 done, 2 bad model file or a mesh that fails its
checks.

Flags:
`)
		fs.PrintDefaults()
	}
	if err := fs.Parse(reorderFlags(fs, args)); err != nil {
		return parseExit(err)
	}
	if fs.NArg() != 1 {
		fmt.Fprintln(stderr, "flangeseg mesh: give exactly one model file (flangeseg mesh MODEL.toml -o DIR)")
		return exitBadInput
	}
	path := fs.Arg(0)
	spec, err := modelfile.Load(path)
	if err != nil {
		fmt.Fprintln(stderr, err)
		return exitBadInput
	}
	seg, err := segment.Build(spec)
	if err != nil {
		fmt.Fprintf(stderr, "%s: %v\n", path, err)
		return exitBadInput
	}
	dir := *outDir
	if dir == "" {
		dir = trimExt(filepath.Base(path)) + "_mesh"
	}
	if err := results.CheckOutDir(dir); err != nil {
		fmt.Fprintf(stderr, "flangeseg mesh: %v\n", err)
		return exitBadInput
	}
	m := seg.Mesh()
	seg.Model().Number()
	if err := results.WriteStaged(dir, results.KindMesh, func(staged string) error {
		return post.WriteVTU(filepath.Join(staged, "mesh.vtu"), post.GridFromMesh(m), nil, []post.Field{post.RegionField(m)})
	}); err != nil {
		fmt.Fprintf(stderr, "flangeseg mesh: %v\n", err)
		return exitAnalysis
	}
	fmt.Fprintf(stdout, "%s: %d nodes, %d %v elements, %d equations\n", path, len(m.Nodes), len(m.Elements), m.Kind, seg.Model().Equations())
	fmt.Fprintln(stdout, "regions (index, name, thickness, material):")
	for i, r := range m.Regions {
		fmt.Fprintf(stdout, "  %2d  %-18s %8.2f mm  %s\n", i, r.Name, r.Thickness, r.Material)
	}
	fmt.Fprintln(stdout, "surfaces (edge sets):")
	for _, name := range m.EdgeSetNames() {
		fmt.Fprintf(stdout, "  %-18s %d sides\n", name, len(m.EdgeSets[name]))
	}
	fmt.Fprintf(stdout, "element quality:\n%s\n", m.Quality())
	fmt.Fprintf(stdout, "written %s\n", filepath.Join(dir, "mesh.vtu"))
	return exitOK
}

func trimExt(name string) string { return name[:len(name)-len(filepath.Ext(name))] }
