package results

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"reflect"
	"strings"
)

// WriteJSON writes r as results.json: indented by two spaces, keys in the
// order of the struct fields, with a final newline. The chart series
// (Series, and the curves of each variant) are not part of it. JSON cannot
// hold NaN or infinity: check NonFinite first.
func WriteJSON(w io.Writer, r *Results) error {
	js, err := json.MarshalIndent(r, "", "  ")
	if err != nil {
		return err
	}
	_, err = w.Write(append(js, '\n'))
	return err
}

// NonFinite returns the JSON path (e.g. "periodic[0].decrement_factor") of
// the first NaN or infinite number in r that WriteJSON would meet, or ""
// when there is none. A chart of such a value is blank too, so a result
// that holds one is refused rather than written.
func NonFinite(r *Results) string {
	return nonFinite(reflect.ValueOf(r), "")
}

// nonFinite returns the JSON path (e.g. "periodic[0].decrement_factor") of
// the first NaN or infinite number that encoding v as JSON would meet, or
// "" when there is none.
func nonFinite(v reflect.Value, path string) string {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			return ""
		}
		return nonFinite(v.Elem(), path)
	case reflect.Float32, reflect.Float64:
		if f := v.Float(); math.IsNaN(f) || math.IsInf(f, 0) {
			if path == "" {
				return "(top level)"
			}
			return path
		}
	case reflect.Slice, reflect.Array:
		for i := 0; i < v.Len(); i++ {
			if at := nonFinite(v.Index(i), fmt.Sprintf("%s[%d]", path, i)); at != "" {
				return at
			}
		}
	case reflect.Map:
		iter := v.MapRange()
		for iter.Next() {
			if at := nonFinite(iter.Value(), fmt.Sprintf("%s[%v]", path, iter.Key())); at != "" {
				return at
			}
		}
	case reflect.Struct:
		t := v.Type()
		for i := 0; i < t.NumField(); i++ {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			name, _, _ := strings.Cut(f.Tag.Get("json"), ",")
			if name == "-" {
				continue
			}
			if name == "" {
				name = f.Name
			}
			p := name
			if f.Anonymous && f.Tag.Get("json") == "" {
				p = strings.TrimSuffix(path, ".")
			} else if path != "" {
				p = path + "." + name
			}
			if at := nonFinite(v.Field(i), p); at != "" {
				return at
			}
		}
	}
	return ""
}
