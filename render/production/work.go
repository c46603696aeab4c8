package production

import (
	"context"
	"errors"
	"fmt"
	"runtime"
	"runtime/debug"
	"sync"
	"sync/atomic"
)

// errSkipped marks work that never ran: the run stopped before it.
var errSkipped = errors.New("skipped: the run stopped")

// each runs work(i) for every i in [0, n) on at most GOMAXPROCS
// goroutines, and hands each result to done (when not nil) in index
// order, as soon as it and every result before it are ready — the one way
// this package spreads work over the cores. It stops starting work at the
// first error in index order (from work or done) or when ctx is
// cancelled, waits for the work under way, and returns ctx's error or
// that first error. A panic in work is raised again in the caller, with
// the worker's stack, so that it is never lost in a goroutine.
func each[T any](ctx context.Context, n int, work func(i int) (T, error), done func(i int, v T) error) error {
	if n <= 0 {
		return ctx.Err()
	}
	type result struct {
		v     T
		err   error
		panic any
		stack []byte
		ready chan struct{}
	}
	res := make([]result, n)
	for i := range res {
		res[i].ready = make(chan struct{})
	}
	var next atomic.Int64
	var stop atomic.Bool
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), n) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				r := &res[i]
				if stop.Load() || ctx.Err() != nil {
					r.err = errSkipped
					close(r.ready)
					continue
				}
				func() {
					defer func() {
						if p := recover(); p != nil {
							r.panic, r.stack = p, debug.Stack()
						}
					}()
					r.v, r.err = work(i)
				}()
				close(r.ready)
			}
		}()
	}
	var first error
	var panicked *result
	for i := range n {
		r := &res[i]
		<-r.ready
		if r.panic != nil {
			panicked = r
			break
		}
		if r.err != nil {
			first = r.err
			break
		}
		if done != nil {
			if err := done(i, r.v); err != nil {
				first = err
				break
			}
		}
		var zero T
		r.v = zero // done has it; let it go
	}
	stop.Store(true)
	wg.Wait()
	if panicked != nil {
		panic(fmt.Sprintf("%v\n\nin a worker goroutine:\n%s", panicked.panic, panicked.stack))
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	return first
}
