package scenarios

import (
	"encoding/json"
	"fmt"
	"strings"

	"tempstack/layers"
)

// SchemaFile is the name under which the JSON Schema of the scenario file
// is published (scenarios/schema/) and written beside a starter file; the
// starters' first line points editors at it.
const SchemaFile = "tempstack.schema.json"

// Schema returns the JSON Schema (draft-07) of the scenario file, made
// from the decoder's own key tables (keys.go): every mapping with its keys,
// their forms and what they mean, unknown keys refused. It checks the
// structure only (keys, shapes, words of a fixed list); units, ranges and
// rules that join keys are the decoder's (`tempstack check`).
func Schema() ([]byte, error) {
	defs := map[string]any{}
	seen := map[string]*keyTable{}
	var walk func(t *keyTable) error
	walk = func(t *keyTable) error {
		if prev, ok := seen[t.Name]; ok {
			if prev != t {
				return fmt.Errorf("two key tables are named %q", t.Name)
			}
			return nil
		}
		seen[t.Name] = t
		if t != topKeys {
			defs[t.Name] = tableSchema(t)
		}
		for _, ks := range t.Keys {
			for _, f := range ks.Forms {
				for g := &f; g != nil; g = g.item {
					if g.shape == shapeObject {
						if err := walk(g.table()); err != nil {
							return err
						}
					}
				}
			}
		}
		return nil
	}
	if err := walk(topKeys); err != nil {
		return nil, err
	}
	root := tableSchema(topKeys)
	root["$schema"] = "http://json-schema.org/draft-07/schema#"
	root["title"] = "tempstack scenario file"
	root["$comment"] = "Generated from the key tables of the tempstack decoder (`tempstack schema`); do not edit. It checks keys and shapes; `tempstack check` checks units, ranges and everything else."
	root["definitions"] = defs
	out, err := json.MarshalIndent(root, "", "  ")
	if err != nil {
		return nil, err
	}
	return append(out, '\n'), nil
}

// tableSchema is the schema of one mapping.
func tableSchema(t *keyTable) map[string]any {
	props := map[string]any{}
	for _, ks := range t.Keys {
		props[ks.Name] = keySchema(ks)
	}
	s := map[string]any{
		"type":                 "object",
		"description":          t.Doc,
		"properties":           props,
		"additionalProperties": false,
	}
	if len(t.Required) > 0 {
		s["required"] = t.Required
	}
	return s
}

// keySchema is the schema of one key: its form, or any of its forms.
func keySchema(ks keySpec) map[string]any {
	var s map[string]any
	if len(ks.Forms) == 1 {
		s = formSchema(ks.Forms[0])
	} else {
		var alts []any
		for _, f := range ks.Forms {
			alts = append(alts, formSchema(f))
		}
		s = map[string]any{"anyOf": alts}
	}
	var doc []string
	if ks.Doc != "" {
		doc = append(doc, ks.Doc)
	}
	for _, f := range ks.Forms {
		for g := &f; g != nil; g = g.item {
			if g.shape == shapeQuantity {
				doc = append(doc, unitDoc(g.kinds))
			}
		}
	}
	if len(doc) > 0 {
		s["description"] = strings.Join(doc, "; ")
	}
	return s
}

// unitDoc says in what unit a bare number of the kinds is read.
func unitDoc(kinds []layers.Kind) string {
	var parts []string
	for i, kd := range kinds {
		lead := ""
		if i > 0 {
			lead = "for " + article(kd.String()) + ": "
		}
		u := layers.DefaultUnit(kd)
		if u == "" {
			parts = append(parts, lead+"a bare number is a fraction (0.15), or write it in %")
			continue
		}
		parts = append(parts, fmt.Sprintf("%sa bare number is in %s; or a string with its unit (%s)", lead, u, strings.Join(layers.Units(kd), ", ")))
	}
	return strings.Join(parts, "; ")
}

// formSchema is the schema of one form of a value.
func formSchema(f form) map[string]any {
	switch f.shape {
	case shapeText:
		return map[string]any{"type": "string"}
	case shapeNumber:
		return map[string]any{"type": "number"}
	case shapeMeasure, shapeQuantity:
		return map[string]any{"type": []string{"number", "string"}}
	case shapeBool:
		return map[string]any{"type": "boolean"}
	case shapeInteger:
		return map[string]any{"type": "integer"}
	case shapeChoice:
		return map[string]any{"type": "string", "enum": f.enum()}
	case shapeObject:
		return map[string]any{"$ref": "#/definitions/" + f.table().Name}
	case shapeList:
		return map[string]any{"type": "array", "items": formSchema(*f.item)}
	case shapeMap:
		return map[string]any{"type": "object"}
	}
	return map[string]any{}
}

// article puts "a" or "an" before a noun by its first letter.
func article(noun string) string {
	if noun != "" && strings.ContainsRune("aeiou", rune(noun[0])) {
		return "an " + noun
	}
	return "a " + noun
}
