package room

import (
	"context"
	"math"

	"tempstack/climate"
	"tempstack/scenarios/results"
	"tempstack/solver"
)

// simulation is a simulation of a room and what is read from its last cycle.
type simulation struct {
	res       *solver.RoomResult
	operative []float64
	summary   results.RoomSimulation
}

// simulate runs room r from the exact state warm_up before the cycle.
func (p *plan) simulate(ctx context.Context, rs *Spec, r solver.Room, meshes []*solver.Mesh, x *cycle) (*simulation, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	warm := rs.WarmUp
	if rs.WarmUpAuto {
		warm = 0
	}
	start := -warm
	init, air, err := p.cellsAt(r, meshes, x, start)
	if err != nil {
		return nil, err
	}
	prob := solver.RoomProblem{
		Room: r, Meshes: meshes, Outdoor: p.outdoor, Back: p.back, Gains: p.gains, Surface: p.surface, Conductance: p.cond,
		InitialAir: air, Initial: init, Start: start, Duration: warm + p.period, Step: rs.Step, OutputStep: rs.Step,
	}
	cycles, settled, change := 0, !rs.WarmUpAuto, 0.0
	if rs.WarmUpAuto {
		// Settle: repeat the cycle from the exact periodic state until the
		// air and every cell repeat within SettleTolerance. The exact
		// state is the periodic answer of the linear room; night
		// ventilation and the clipped sun move it, by up to tenths of a
		// kelvin in a heavy room, over a week or more.
		maxCycles := int(math.Max(1, math.Min(200, math.Floor(3*climate.Year/p.period))))
		cyc := prob
		cyc.OutputStep = p.period
		for cycles < maxCycles {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
			res, err := solver.RoomSimulate(cyc)
			if err != nil {
				return nil, err
			}
			cycles++
			change = math.Abs(res.FinalAir - cyc.InitialAir)
			for k := range res.Final {
				for i, v := range res.Final[k] {
					change = math.Max(change, math.Abs(v-cyc.Initial[k][i]))
				}
			}
			cyc.Initial, cyc.InitialAir = res.Final, res.FinalAir
			if change < SettleTolerance {
				settled = true
				break
			}
		}
		prob.Initial, prob.InitialAir = cyc.Initial, cyc.InitialAir
		warm = float64(cycles) * p.period
	}
	res, err := solver.RoomSimulate(prob)
	if err != nil {
		return nil, err
	}
	sim := &simulation{res: res, operative: make([]float64, len(res.Times))}
	surf := make([]complex128, len(r.Elements))
	for j, t := range res.Times {
		for e := range r.Elements {
			surf[e] = complex(res.Surface[e][j], 0)
		}
		sim.operative[j] = real(p.operative(r, complex(res.Air[j], 0), complex(p.outdoor(t), 0), surf))
	}
	sm := &sim.summary
	sm.AirMax_C, sm.AirMin_C = math.Inf(-1), math.Inf(1)
	sm.OperativeMax_C, sm.OperativeMin_C = math.Inf(-1), math.Inf(1)
	first := -1
	for j, t := range res.Times {
		if t < -1e-6 {
			continue
		}
		if first < 0 {
			first = j
		}
		sm.AirMax_C, sm.AirMin_C = math.Max(sm.AirMax_C, res.Air[j]), math.Min(sm.AirMin_C, res.Air[j])
		sm.OperativeMax_C, sm.OperativeMin_C = math.Max(sm.OperativeMax_C, sim.operative[j]), math.Min(sm.OperativeMin_C, sim.operative[j])
	}
	days := p.period / climate.Day
	for _, th := range rs.Thresholds {
		sm.HoursAbove = append(sm.HoursAbove, results.HoursAbove{Threshold_C: th, Hours: hoursAbove(res.Times[first:], sim.operative[first:], th) / 3600 / days})
	}
	sm.HoursAboveBasis = "operative temperature"
	last := len(res.Times) - 1
	sm.CycleChange_K = math.Abs(res.Air[last] - res.Air[first])
	for e := range r.Elements {
		sm.CycleChange_K = math.Max(sm.CycleChange_K, math.Abs(res.Surface[e][last]-res.Surface[e][first]))
	}
	sm.EnergyBalanceRelativeError = res.Energy.RelativeError
	sm.Step_h, sm.WarmUp_h, sm.Cycle_h = rs.Step/3600, warm/3600, p.period/3600
	sm.SettleCycles, sm.Settled = cycles, settled
	if rs.WarmUpAuto {
		sm.SettleChange_K = &change
	}
	for _, m := range meshes {
		if m != nil {
			sm.Cells += m.Cells()
		}
	}
	// Heat to and from the air over the cycle, per path.
	perDay := 3.6e6 * days
	path := func(name string, mean []float64) results.RoomPath {
		var to, from float64
		for j := first + 1; j < len(res.Times); j++ {
			q := mean[j] * (res.Times[j] - res.Times[j-1])
			if q > 0 {
				to += q
			} else {
				from -= q
			}
		}
		return results.RoomPath{Name: name, ToAir_kWh_day: to / perDay, FromAir_kWh_day: from / perDay}
	}
	gainsPath := "gains and sun through windows"
	if p.surface != nil {
		gainsPath = "gains and the part of the windows' sun that heats the air"
	}
	sm.Paths = append(sm.Paths, path("ventilation and window conduction", res.MeanOutdoor), path(gainsPath, res.MeanGains))
	for e, el := range r.Elements {
		sm.Paths = append(sm.Paths, path(el.Name, res.MeanFlow[e]))
	}
	return sim, nil
}

// exactCheck returns the largest difference (K) between the simulated air
// temperature over the reported cycle (t in [0, period]) and the exact
// periodic one, interpolated linearly between the exact samples.
func exactCheck(p *plan, x *cycle, res *solver.RoomResult) float64 {
	n := len(x.air)
	worst := 0.0
	for j, t := range res.Times {
		if t < -1e-6 {
			continue
		}
		u := math.Mod(t/p.period*float64(n), float64(n))
		i := int(u)
		if i >= n {
			i = n - 1
		}
		f := u - float64(i)
		ex := (1-f)*x.air[i] + f*x.air[(i+1)%n]
		worst = math.Max(worst, math.Abs(res.Air[j]-ex))
	}
	return worst
}

// hoursAbove returns the time (s) that the piecewise-linear series v(t)
// spends above th.
func hoursAbove(t, v []float64, th float64) float64 {
	sum := 0.0
	for j := 1; j < len(t); j++ {
		a, b, dt := v[j-1]-th, v[j]-th, t[j]-t[j-1]
		switch {
		case a >= 0 && b >= 0:
			sum += dt
		case a <= 0 && b <= 0:
		default:
			sum += dt * math.Max(a, b) / math.Abs(b-a)
		}
	}
	return sum
}
