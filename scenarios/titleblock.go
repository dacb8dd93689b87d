package scenarios

import "tempstack/layers"

// decodeTitleBlock reads the optional title-block keys of the top level:
// project, client, prepared_by and revision (plain text for the report).
func decodeTitleBlock(top *object, s *Scenario) {
	for _, f := range []struct {
		key string
		dst *string
	}{
		{"project", &s.TitleBlock.Project},
		{"client", &s.TitleBlock.Client},
		{"prepared_by", &s.TitleBlock.PreparedBy},
		{"revision", &s.TitleBlock.Revision},
	} {
		top.str(f.key, f.dst)
	}
}

// decodeFamily reads a layer's optional family (one of
// layers.Families(): it tints the layer in the report), which names the
// family of a layer described by its own values, or overrides a library
// material's.
func decodeFamily(o *object, l *layers.Layer) {
	o.choice("family", layers.Families(), &l.Family)
}
