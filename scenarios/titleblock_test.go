package scenarios

import (
	"testing"

	"tempstack/scenarios/results"
)

// TestTitleBlockAndFamily: the optional title-block keys reach the
// results as written, and a layer described by its own values takes the
// family it names (a library material keeps its own unless overridden).
func TestTitleBlockAndFamily(t *testing.T) {
	r := mustRun(t, `
title: title block
project: Mill Lane extension, phase 2
client: "A. Client & Co <ltd>"
prepared_by: J. Engineer
revision: C
kind: wall
layers:
  - {name: rammed earth, conductivity: 1.1, density: 1900, specific_heat: 900, thickness: 0.4, family: masonry}
  - {material: concrete, thickness: 0.1, family: stone}
  - {material: gypsum-plaster, thickness: 15 mm}
outside:
  temperature: {mean: 10, daily: {amplitude: 5, peak_hour: 15}}
analysis:
  simulate: false
`)
	tb := r.TitleBlock
	if tb.Project != "Mill Lane extension, phase 2" || tb.Client != "A. Client & Co <ltd>" || tb.PreparedBy != "J. Engineer" || tb.Revision != "C" {
		t.Errorf("title block %+v", tb)
	}
	if got := []string{r.Layers[0].Family, r.Layers[1].Family, r.Layers[2].Family}; got[0] != "masonry" || got[1] != "stone" || got[2] != "plaster" {
		t.Errorf("families %q, want masonry (named), stone (overridden), plaster (library)", got)
	}
	if r := mustRun(t, "title: bare\nkind: wall\nlayers:\n  - {material: concrete, thickness: 0.1}\noutside:\n  temperature: 5\nanalysis:\n  simulate: false\n"); (r.TitleBlock != results.TitleBlock{}) {
		t.Errorf("a file without title-block keys gives %+v", r.TitleBlock)
	}
}
