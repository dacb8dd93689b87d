package scenarios

import (
	"context"
	"io/fs"

	"gopkg.in/yaml.v3"

	"tempstack/climate"
	"tempstack/layers"
	"tempstack/scenarios/results"
	"tempstack/scenarios/room"
	"tempstack/solver"
)

// decodeRoomDoc finishes the decoding of a room scenario.
func (d *decoder) decodeRoomDoc(top *object, s *Scenario, root *yaml.Node, fsys fs.FS, cache *seriesCache) (*Scenario, error) {
	d.decodeRoom(top, s)
	d.decodeStudy(top, s)
	if err := d.err(); err != nil {
		return nil, err
	}
	s.root, s.fsys, s.cache = root, fsys, cache
	if err := s.checkRoom(); err != nil {
		return nil, err
	}
	if err := checkStudy(s); err != nil {
		return nil, err
	}
	return s, nil
}

// runRoomStudy runs a room scenario and its study, if any.
func runRoomStudy(s *run) (*results.Results, error) {
	if err := planStudy(s.Scenario); err != nil {
		return nil, err
	}
	r, err := runRoom(s.ctx, s.Scenario)
	if err != nil {
		return nil, err
	}
	if s.Study != nil {
		if err := runStudy(s, r); err != nil {
			return nil, err
		}
	}
	return r, nil
}

// roomSpec hands the decoded room to the runner (package room): each
// element's back environment is the wall kind's outside, the outdoor air
// or its sol-air temperature in the sun.
func (s *Scenario) roomSpec() (*room.Spec, error) {
	rs := s.Room
	if rs == nil || rs.Outdoor == nil {
		return nil, &Error{File: s.File, Key: "room", Msg: "the room or its outdoor temperature is missing"}
	}
	sp := &room.Spec{
		File: s.File, Line: rs.Line,
		Outdoor:     room.Forcing{At: rs.Outdoor.At, Harmonics: rs.Outdoor.Harmonics},
		Volume:      rs.Volume,
		Ventilation: rs.Ventilation,
		Gains:       room.Forcing{At: rs.Gains.At, Harmonics: rs.Gains.Harmonics},
		Thresholds:  rs.Thresholds,
		Step:        rs.Step, WarmUp: rs.WarmUp, WarmUpAuto: rs.WarmUpAuto,
	}
	for _, e := range rs.Elements {
		el := room.Element{
			Name: e.Name, Area: e.Area, Orientation: e.Orientation, Layers: e.Layers,
			Construction: e.Construction, Back: e.Back, Sunlit: e.Solar != nil,
			Report: layerResults(e.Layers, climate.Day), Line: e.Line,
		}
		if e.Back == solver.BackOutside {
			_, rse := layers.SurfaceResistances(e.Orientation)
			el.Environment = Environment{Temperature: rs.Outdoor, Resistance: rse, Solar: e.Solar}.env()
			if e.Solar != nil && e.Solar.Irradiance != nil {
				el.BackHarmonics = e.Solar.Irradiance.Harmonics
			}
		}
		sp.Elements = append(sp.Elements, el)
	}
	for _, w := range rs.Windows {
		rw := room.Window{Name: w.Name, Area: w.Area, U: w.U, G: w.G}
		for _, sh := range w.SunTo {
			rw.SunTo = append(rw.SunTo, room.SunShare{Element: sh.Element, Fraction: sh.Fraction})
		}
		if w.Irradiance != nil {
			rw.Sun = &room.Forcing{At: w.Irradiance.At, Harmonics: w.Irradiance.Harmonics}
		}
		sp.Windows = append(sp.Windows, rw)
	}
	return sp, nil
}

// checkRoom runs the room's checks before solving (room.Check).
func (s *Scenario) checkRoom() error {
	sp, err := s.roomSpec()
	if err != nil {
		return err
	}
	return room.Check(sp)
}

// runRoom solves a room scenario with room.Run and adds what every kind
// reports: title, the outdoor forcing, warnings and cautions.
func runRoom(ctx context.Context, sc *Scenario) (*results.Results, error) {
	sp, err := sc.roomSpec()
	if err != nil {
		return nil, err
	}
	rm, warnings, err := room.Run(ctx, sp)
	if err != nil {
		return nil, err
	}
	r := &results.Results{Title: sc.Title, Kind: sc.Kind, ScenarioFile: sc.File, TitleBlock: sc.TitleBlock}
	r.Warnings = append(r.Warnings, warnings...)
	r.Room = rm
	// The outdoor air; each element's sun is in room.elements.
	r.Forcing = &results.ForcingInfo{Outside: results.SideForcing{Kind: "harmonic", Mean_C: sc.Room.Outdoor.Mean, Harmonics: harmonicsInfo(sc.Room.Outdoor.Harmonics)}}
	r.Cautions = append(results.CautionsWith(r, nil), room.CautionsFor(sp)...)
	return r, nil
}
