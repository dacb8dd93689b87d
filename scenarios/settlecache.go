package scenarios

import (
	"sync"

	"tempstack/solver"
)

// settleCache shares settled starts between the simulations of one run:
// the base scenario and the cases of its study. A settled state is keyed
// by solver.SettleKey, a hash of the numbers the spin-up reads (column,
// mesh, initial state, time step, boundaries at every time a cycle
// evaluates them, options), never by which scenario keys a case changed:
// cases that differ only in what comes after the spin-up (the probes, the
// output step, the years simulated, a report-only key) share one spin-up,
// and a case that changes anything the spin-up reads has a key of its own.
// Cases running at once that need the same state wait for the one that
// computes it. Safe for concurrent use.
type settleCache struct {
	mu sync.Mutex
	m  map[string]*settleEntry
	// runs counts the spin-ups computed (for tests).
	runs int
}

type settleEntry struct {
	done chan struct{} // closed when st and err are set
	st   *solver.Settled
	err  error
}

func newSettleCache() *settleCache { return &settleCache{m: map[string]*settleEntry{}} }

// settle returns the settled state of p under o, computing it once per
// key. The state is shared: callers must not change it.
func (c *settleCache) settle(p solver.Problem, o solver.SettleOptions) (*solver.Settled, error) {
	key, err := solver.SettleKey(p, o)
	if err != nil || c == nil {
		return solver.Settle(p, o)
	}
	c.mu.Lock()
	e, ok := c.m[key]
	if !ok {
		e = &settleEntry{done: make(chan struct{})}
		c.m[key] = e
		c.runs++
	}
	c.mu.Unlock()
	if ok {
		<-e.done
		return e.st, e.err
	}
	e.st, e.err = solver.Settle(p, o)
	close(e.done)
	return e.st, e.err
}
