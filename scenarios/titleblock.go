package scenarios

import "tempstack/layers"

// decodeTitleBlock reads the optional title-block keys of the top level:
// project, client, prepared_by and revision (plain text for the report).
func decodeTitleBlock(top *object, s *Scenario) error {
	for _, f := range []struct {
		key string
		dst *string
	}{
		{"project", &s.TitleBlock.Project},
		{"client", &s.TitleBlock.Client},
		{"prepared_by", &s.TitleBlock.PreparedBy},
		{"revision", &s.TitleBlock.Revision},
	} {
		v, _, err := top.str(f.key)
		if err != nil {
			return err
		}
		*f.dst = v
	}
	return nil
}

// decodeFamily reads a layer's optional family (one of
// layers.Families(): it tints the layer in the report), which names the
// family of a layer described by its own values, or overrides a library
// material's.
func decodeFamily(o *object, l *layers.Layer) error {
	f, ok, err := o.choice("family", layers.Families())
	if err != nil || !ok {
		return err
	}
	l.Family = f
	return nil
}
