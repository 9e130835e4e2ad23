package importer

import (
	"math"
	"runtime"

	"github.com/fluecell/fluecell/funcs"
)

// The rules of a long table run in a goroutine of their own, beside the
// work on each row that reads its cells before (evaluate) and keeps its
// results after (finishRow). Rows go to it in batches, in order. The
// findings a row gives before its rules run are recorded, not added, and
// added in row order with those of its results, each rule's after the
// findings of choosing it: the report is the one a single goroutine gives,
// finding for finding, and the rules' interval models take the rows in the
// same order. A table of fewer than asyncRows rows, or a machine of one
// core, runs each row's rules in place, through the same steps.

const (
	evalBatchRows = 256  // rows per batch
	evalBatches   = 4    // batches: one filling, the rest with the goroutine or done
	asyncRows     = 2048 // the fewest rows of a table whose rules run in a goroutine
)

// evalJob is one rule of a row, run when its variables are good; the
// goroutine sets its result.
type evalJob struct {
	r            *rule
	ri           int // the column (t.rules) its result goes to
	run          bool
	value        float64
	src0, src1   int // its factors: batch.srcs[src0:src1]
	note0, note1 int // its notes: batch.notes[note0:note1]
	err          error
}

// evalRow is one row of a batch: rs nil for a row whose rules do not run
// (it has findings only).
type evalRow struct {
	i          int
	rs         *ruleSet
	ops        int // its findings end at rec.ops[ops] (they start where the row before's end)
	job0, job1 int // its rules: batch.jobs[job0:job1]
	val0       int // its variables: vals[val0:val0+len(names)] (async only)
}

type evalBatch struct {
	rows     []evalRow
	jobs     []evalJob
	vals     []any
	has      []bool
	rec      warnRec
	srcs     []*funcs.Factor
	notes    []string
	panicked any // a panic of the goroutine, raised again on the caller's
}

func (b *evalBatch) reset() {
	clear(b.vals)
	clear(b.srcs)
	b.rows, b.jobs, b.vals, b.has, b.srcs, b.notes = b.rows[:0], b.jobs[:0], b.vals[:0], b.has[:0], b.srcs[:0], b.notes[:0]
	b.rec.ops, b.rec.tag = b.rec.ops[:0], 0
	b.panicked = nil
}

// evalState is what finishing a row adds to: the table's source index,
// outlier samples, wide-table factors, and the row's notes.
type evalState struct {
	t        *table
	main     *ruleSet
	srcIndex *srcIndex
	samples  *sampleSet
	wideK    map[*column][2]float64
	rowNotes []string
}

// evalPipe runs a table's rules for evaluate.
type evalPipe struct {
	sc    *scanCtx
	st    *evalState
	async bool
	batch int      // rows per batch
	names []string // the variables a row's rules and checks read, kept per row (async)
	cur   *evalBatch
	spare []*evalBatch
	todo  chan *evalBatch // to the goroutine
	done  chan *evalBatch // back from it, in order
	quit  chan struct{}
	gone  chan struct{}
	wvars *keptVars      // the goroutine's variables
	dvars *keptVars      // the variables of the row being finished (async)
	pvars map[string]any // evaluate's own variables (in place)
	live  bool
}

// newEvalPipe starts the pipe of st.t's rules; vars is the map evaluate
// fills with a row's variables, forest the table's sum trees (maskRow).
// stop must be called.
func (sc *scanCtx) newEvalPipe(st *evalState, vars map[string]any, forest []*sumNode) *evalPipe {
	t := st.t
	async := t.n() >= asyncRows && runtime.GOMAXPROCS(0) > 1
	batch := evalBatchRows
	switch a := sc.opt.evalAsync; {
	case a > 0:
		async, batch = true, a
	case a < 0:
		async = false
	}
	p := &evalPipe{sc: sc, st: st, async: async, batch: batch, pvars: vars, cur: &evalBatch{}}
	sc.warn.rec = &p.cur.rec
	if !async {
		return p
	}
	sc.mapping() // made now, not in the goroutine (uncFor reads it)
	p.names = evalNames(t, st.main, forest)
	p.wvars, p.dvars = newKeptVars(len(p.names)), newKeptVars(len(p.names))
	for range evalBatches - 1 {
		p.spare = append(p.spare, &evalBatch{})
	}
	p.todo, p.done = make(chan *evalBatch, evalBatches), make(chan *evalBatch, evalBatches)
	p.quit, p.gone = make(chan struct{}), make(chan struct{})
	p.live = true
	go p.work()
	return p
}

// evalNames lists the variables evaluate's map can hold: every variable a
// rule of t reads and the columns of the sum trees (maskRow sets them).
// The map holds no other name, so these are all a row's rules and checks
// can find there: the variables kept with each row.
func evalNames(t *table, main *ruleSet, forest []*sumNode) []string {
	seen := map[string]bool{}
	var out []string
	add := func(name string) {
		if !seen[name] {
			seen[name] = true
			out = append(out, name)
		}
	}
	var addRule func(r *rule)
	addRule = func(r *rule) {
		for _, b := range r.vars {
			add(b.name)
		}
		for _, v := range r.variants {
			addRule(v)
		}
	}
	sets := []*ruleSet{main}
	for _, rs := range t.alts {
		sets = append(sets, rs)
	}
	for _, rs := range t.modes {
		sets = append(sets, rs)
	}
	for _, rs := range sets {
		for _, b := range rs.binds {
			add(b.name)
		}
		for _, r := range rs.rules {
			addRule(r)
		}
	}
	var walk func(n *sumNode)
	walk = func(n *sumNode) {
		add(n.col.ident)
		for _, k := range n.kids {
			walk(k)
		}
	}
	for _, n := range forest {
		walk(n)
	}
	return out
}

// skipRow ends row i, whose rules do not run: it has its findings only.
func (p *evalPipe) skipRow(i int) {
	p.cur.rows = append(p.cur.rows, evalRow{i: i, ops: len(p.cur.rec.ops)})
	p.rowDone()
}

// ruleRow starts row i with rule set rs and the variables in vars (kept
// now when the rules run in the goroutine).
func (p *evalPipe) ruleRow(i int, rs *ruleSet, vars map[string]any) {
	b := p.cur
	e := evalRow{i: i, rs: rs, job0: len(b.jobs), job1: len(b.jobs), val0: len(b.vals)}
	if p.async {
		for _, name := range p.names {
			v, ok := vars[name]
			b.vals, b.has = append(b.vals, v), append(b.has, ok)
		}
	}
	b.rows = append(b.rows, e)
}

// tag marks the findings recorded from now on as those of choosing the
// row's k-th rule (finishRow adds them just before that rule's result).
func (p *evalPipe) tag(k int) { p.cur.rec.tag = k + 1 }

// job adds rule r, the row's next, whose result goes to column ri: it runs
// when run is set (its variables are good).
func (p *evalPipe) job(r *rule, ri int, run bool) {
	b := p.cur
	b.jobs = append(b.jobs, evalJob{r: r, ri: ri, run: run})
	b.rows[len(b.rows)-1].job1 = len(b.jobs)
}

// endRow ends the row ruleRow started.
func (p *evalPipe) endRow() {
	b := p.cur
	b.rows[len(b.rows)-1].ops = len(b.rec.ops)
	b.rec.tag = 0
	p.rowDone()
}

// rowDone runs and finishes the row at once in place; in a goroutine, it
// hands the batch over when it is full.
func (p *evalPipe) rowDone() {
	if !p.async {
		p.runJobs(p.cur, false)
		p.finish(p.cur)
		p.cur.reset()
		return
	}
	if len(p.cur.rows) >= p.batch {
		p.dispatch()
	}
}

// dispatch hands the filled batch to the goroutine and takes a free one,
// finishing the oldest batch first when none is free.
func (p *evalPipe) dispatch() {
	p.todo <- p.cur
	if len(p.spare) == 0 {
		b := <-p.done
		p.finish(b)
		p.spare = append(p.spare, b)
	}
	p.cur = p.spare[len(p.spare)-1]
	p.spare = p.spare[:len(p.spare)-1]
	p.cur.reset()
	p.sc.warn.rec = &p.cur.rec
}

// flush finishes every row: the rows still held, in order.
func (p *evalPipe) flush() {
	if !p.async {
		p.sc.warn.rec = nil
		return
	}
	n := evalBatches - 1 - len(p.spare) // batches with the goroutine
	if len(p.cur.rows) > 0 {
		p.todo <- p.cur
		n++
	} else {
		p.spare = append(p.spare, p.cur)
	}
	p.cur = nil
	for range n {
		b := <-p.done
		p.finish(b)
		p.spare = append(p.spare, b)
	}
	p.sc.warn.rec = nil
	p.stop()
}

// stop ends the goroutine (at once after flush; on an error or a panic of
// evaluate, without finishing the rows held) and stops recording findings.
func (p *evalPipe) stop() {
	p.sc.warn.rec = nil
	if !p.live {
		return
	}
	p.live = false
	close(p.quit)
	close(p.todo)
	<-p.gone
}

// work is the goroutine: it runs the rules of each batch and hands it back.
func (p *evalPipe) work() {
	defer close(p.gone)
	for b := range p.todo {
		func() {
			defer func() {
				if r := recover(); r != nil {
					b.panicked = r
				}
			}()
			p.runJobs(b, true)
		}()
		select {
		case p.done <- b:
		case <-p.quit:
			return
		}
	}
}

// runJobs runs the rules of every row of b (in the goroutine when kept
// is set: with the variables kept per row).
func (p *evalPipe) runJobs(b *evalBatch, kept bool) {
	t := p.st.t
	vars := p.pvars
	for ri := range b.rows {
		e := &b.rows[ri]
		if e.rs == nil || e.job0 == e.job1 {
			continue
		}
		if kept {
			vars = p.restore(p.wvars, b, e)
		}
		for j := e.job0; j < e.job1; j++ {
			jb := &b.jobs[j]
			if !jb.run {
				continue
			}
			out, err := p.sc.runRule(t, e.i, e.rs, jb.r, jb.ri, vars)
			if jb.err = err; err != nil {
				continue
			}
			jb.value = out.Value
			jb.src0 = len(b.srcs)
			b.srcs = append(b.srcs, out.Sources...) // the Runner reuses its slices
			jb.src1, jb.note0 = len(b.srcs), len(b.notes)
			b.notes = append(b.notes, out.Notes...)
			jb.note1 = len(b.notes)
		}
	}
}

// keptVars is a map of variables restored row by row (restore) and what
// it holds, so that a variable the row before had too is not set again.
type keptVars struct {
	m    map[string]any
	vals []any
	has  []bool
}

func newKeptVars(n int) *keptVars {
	return &keptVars{m: make(map[string]any, n), vals: make([]any, n), has: make([]bool, n)}
}

// restore sets kv's map to the variables kept with row e: as evaluate's
// map held them for it.
func (p *evalPipe) restore(kv *keptVars, b *evalBatch, e *evalRow) map[string]any {
	for k, name := range p.names {
		v, has := b.vals[e.val0+k], b.has[e.val0+k]
		if has == kv.has[k] && (!has || sameValue(v, kv.vals[k])) {
			continue
		}
		if has {
			kv.m[name] = v
		} else {
			delete(kv.m, name)
		}
		kv.vals[k], kv.has[k] = v, has
	}
	return kv.m
}

// sameValue reports whether a and b are the same number or text (false
// for any other kind of value, which is then set again).
func sameValue(a, b any) bool {
	switch x := a.(type) {
	case float64:
		y, ok := b.(float64)
		return ok && (x == y && math.Signbit(x) == math.Signbit(y))
	case string:
		y, ok := b.(string)
		return ok && x == y
	}
	return false
}

// finish adds the findings and results of b's rows, in order.
func (p *evalPipe) finish(b *evalBatch) {
	if b.panicked != nil {
		panic(b.panicked)
	}
	rec := p.sc.warn.rec
	p.sc.warn.rec = nil
	start := 0
	for ri := range b.rows {
		e := &b.rows[ri]
		ops := b.rec.ops[start:e.ops]
		start = e.ops
		if e.rs == nil {
			p.sc.warn.replay(ops)
			continue
		}
		vars := p.pvars
		if p.async {
			vars = p.restore(p.dvars, b, e)
		}
		p.sc.finishRow(p.st, b, e, ops, vars)
	}
	p.sc.warn.rec = rec
}

// finishRow keeps row e's results and adds its findings: those recorded
// before its rules ran, each rule's after the findings of choosing it.
func (sc *scanCtx) finishRow(st *evalState, b *evalBatch, e *evalRow, ops []warnOp, vars map[string]any) {
	t, i, rs := st.t, e.i, e.rs
	ops = sc.replayTag(ops, 0)
	all := len(rs.rules) > 0
	var key srcKey
	nk := 0
	var long []*funcs.Factor
	st.rowNotes = st.rowNotes[:0]
	for j := e.job0; j < e.job1; j++ {
		ops = sc.replayTag(ops, j-e.job0+1)
		jb := &b.jobs[j]
		if !jb.run {
			all = false
			continue
		}
		if jb.err != nil {
			sc.ruleError(t, i, jb.r, jb.err)
			all = false
			continue
		}
		t.res[jb.ri].set(i, jb.value)
		for _, f := range b.srcs[jb.src0:jb.src1] {
			if nk < len(key) {
				key[nk] = f
				nk++
			} else {
				long = append(long, f)
			}
		}
		for _, note := range b.notes[jb.note0:jb.note1] {
			if !slicesContains(st.rowNotes, note) {
				st.rowNotes = append(st.rowNotes, note)
				sc.noteCount(note)
			}
		}
	}
	sc.warn.replay(ops)
	if nk > 0 {
		t.src.set(i, sc.sourceIndex(t, st.srcIndex, key, long))
	}
	state := rowFound
	if all {
		t.computed++
		state = rowComputed
	}
	sc.biogenicSplit(t, i, vars, st.rowNotes)
	sc.wideBiogenicRow(t, i)
	t.markRow(i, state, rs)
	sc.rowTotals(t, i, vars, st.wideK, rs.key)
	rowNum := t.rowNum(i)
	if rs == st.main {
		sc.collectSamples(t, i, rowNum, vars, st.samples)
	}
	sc.checkExisting(t, i, rowNum)
}

// replayTag adds the leading findings of ops with tag and returns the rest.
func (sc *scanCtx) replayTag(ops []warnOp, tag int) []warnOp {
	k := 0
	for k < len(ops) && ops[k].tag == tag {
		k++
	}
	sc.warn.replay(ops[:k])
	return ops[k:]
}
