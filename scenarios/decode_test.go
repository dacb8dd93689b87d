package scenarios

import (
	"context"
	"errors"
	"strings"
	"testing"
)

func TestDecodeEmptyAndJunk(t *testing.T) {
	cases := []struct{ in, want string }{
		{"", "file is empty"},
		{"   \n\t\n", "file is empty"},
		{"# only a comment\n", "file is empty"},
		{"- a\n- b\n", "expected a mapping"},
		{"just words", "expected a mapping"},
		{"title: a\n---\ntitle: b\n", "more than one YAML document"},
		{"\x00\x01\x02", "not valid YAML"},
	}
	for _, c := range cases {
		_, err := Decode("x.yaml", []byte(c.in))
		var se *Error
		if !errors.As(err, &se) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: %v, want an *Error saying %q", c.in, err, c.want)
		}
	}
}

func TestExamplesDecodeAndRun(t *testing.T) {
	exs := Examples()
	if len(exs) < 3 {
		t.Fatalf("only %d embedded examples", len(exs))
	}
	for _, ex := range exs {
		s, err := ex.Decode()
		if err != nil {
			t.Fatalf("%s: %v", ex.Name, err)
		}
		if testing.Short() && s.Kind == Ground {
			continue
		}
		r, err := Run(context.Background(), s, Options{})
		if err != nil {
			t.Fatalf("%s: %v", ex.Name, err)
		}
		if r.Kind == Room {
			if r.Room == nil || r.Room.Simulation == nil || r.Room.Simulation.EnergyBalanceRelativeError > 1e-9 {
				t.Errorf("%s: room simulation missing or energy balance off", ex.Name)
			}
			continue
		}
		if r.Simulation == nil || r.Simulation.EnergyBalanceRelativeError > 1e-8 {
			t.Errorf("%s: simulation missing or energy balance off: %+v", ex.Name, r.Simulation)
		}
	}
}
