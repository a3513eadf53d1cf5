package lang

import "bytes"

// Reparse returns the tree of src, a new text of old's file, exactly as
// Parse would build it (statements, comments and syntax errors), parsing
// again only the lines an edit touched. The text is compared with old's
// to find them; every statement on other lines is taken from old, moved by
// the change of length when it follows the edit. Statements are read a
// line at a time with a stack of open blocks, so the edited lines parse
// alone when they lie inside one block (or at the top) without sharing a
// line with a statement around them and their braces balance; otherwise,
// and when limits such as MaxErrors come into play, the whole text is
// parsed. path names the file; old may be nil or of another file, and is
// not changed. m is src's mapper, or nil to make one.
func Reparse(path string, old *File, src []byte, m *Mapper) *File {
	if m == nil {
		m = NewMapper(src)
	}
	if old != nil && old.Path == path {
		if f := reparse(old, src, m, false); f != nil {
			return f
		}
	}
	f, _ := parseMapped(path, src, m, false)
	return f
}

// ReparseErrors returns the syntax errors Parse reports for src, a new
// text of old's file, when the edited lines parse on their own as Reparse
// parses them; it builds no tree, so it costs about as little however much
// of the file follows the edit. ok is false when the whole text would have
// to be parsed.
func ReparseErrors(path string, old *File, src []byte) (errs []Diagnostic, ok bool) {
	if old == nil || old.Path != path {
		return nil, false
	}
	f := reparse(old, src, nil, true)
	if f == nil {
		return nil, false
	}
	return f.Errors, true
}

// reparse is Reparse without the fallback: nil when the edit cannot be
// parsed on its own. With errorsOnly the file holds only the errors.
func reparse(old *File, src []byte, m *Mapper, errorsOnly bool) *File {
	prev := old.Src
	if len(old.Errors) >= MaxErrors || unclosed(old.Stmts) {
		return nil
	}
	// The changed bytes: [p, len(prev)-q) in the old text.
	p := commonPrefix(prev, src)
	q := commonSuffix(prev[p:], src[p:])
	delta := len(src) - len(prev)
	if p == len(prev) && p == len(src) {
		return &File{Path: old.Path, Src: src, Stmts: old.Stmts, Comments: old.Comments, Errors: old.Errors, Mapper: m}
	}
	oldEnd := len(prev) - q
	// Whole lines, in both texts: a line of the new text that joins two
	// old ones takes the second in too.
	a := lineStartAt(prev, p)
	b := lineEndAfter(prev, max(oldEnd-1, p))
	for {
		nb := b + delta
		if nb == len(src) || nb == a || src[nb-1] == '\n' {
			break
		}
		b = lineEndAfter(prev, b)
	}
	sp, ok := splicePoint(prev, old.Stmts, a, b, 0, len(prev))
	if !ok {
		return nil
	}
	a, b = sp.a, sp.b
	if a > 0 && bytes.HasPrefix(src[a:], []byte("\ufeff")) {
		return nil // a mark at the start of the region would read as a blank
	}
	// The region's own copy: the names and numbers of its nodes keep only
	// those bytes alive, not the whole text of this version.
	text := bytes.Clone(src[a : b+delta])
	region, rp := parseMapped(old.Path, text, NewMapper(text), false)
	depth := len(sp.chain)
	if (rp.stray && depth > 0) || unclosed(region.Stmts) ||
		depth+blockDepth(region.Stmts) >= MaxNesting || depth+blockDepth(sp.list[sp.i:sp.j]) >= MaxNesting {
		return nil
	}
	f := &File{Path: old.Path, Src: src, Mapper: m}
	f.Errors = spliceErrors(old.Errors, region.Errors, a, b, delta, b == len(prev))
	if len(f.Errors) >= MaxErrors {
		return nil
	}
	if errorsOnly {
		return f
	}
	in := &mover{d: a}
	for _, s := range region.Stmts {
		in.stmt(s)
	}
	f.Comments = spliceComments(old.Comments, region.Comments, a, b, delta)
	out := &mover{d: delta, copy: true, n: &nodes{}}
	list := splice(sp.list, sp.i, sp.j, region.Stmts, out)
	for k := depth - 1; k >= 0; k-- {
		c := sp.chain[k]
		nc := *c
		blk := *c.Block
		blk.Stmts = list
		blk.Close += delta
		nc.Block = &blk
		list = splice(sp.parents[k], sp.at[k], sp.at[k]+1, []*Stmt{&nc}, out)
	}
	f.Stmts = list
	return f
}

// spliced is where an edit's lines go in the old tree: children [i, j) of
// list (inside the blocks of chain, each at index at[k] of parents[k]) are
// replaced by the statements of old bytes [a, b).
type spliced struct {
	a, b    int
	list    []*Stmt
	i, j    int
	chain   []*Stmt
	parents [][]*Stmt
	at      []int
}

// splicePoint finds, in list (whose lines lie in [lo, hi)), the innermost
// block whose interior holds the lines [a, b) and the statements of that
// block that share a line with them, widening [a, b) to those statements'
// lines. It fails when the widened lines leave [lo, hi).
func splicePoint(src []byte, list []*Stmt, a, b, lo, hi int) (spliced, bool) {
	i := 0
	for i < len(list) {
		_, e, ok := extent(src, list[i])
		if !ok {
			return spliced{}, false
		}
		if e > a {
			break
		}
		i++
	}
	// A single statement with a block whose inside holds every line: try
	// one level down.
	if i < len(list) && list[i].Block != nil {
		c := list[i]
		if _, _, ok := extent(src, c); !ok {
			return spliced{}, false
		}
		in0, in1 := lineEndAfter(src, c.Block.Open), lineStartAt(src, c.Block.Close)
		if a >= in0 && b <= in1 {
			if sp, ok := splicePoint(src, c.Block.Stmts, a, b, in0, in1); ok {
				sp.chain = append([]*Stmt{c}, sp.chain...)
				sp.parents = append([][]*Stmt{list}, sp.parents...)
				sp.at = append([]int{i}, sp.at...)
				return sp, true
			}
		}
	}
	j := i
	for j < len(list) {
		s, e, ok := extent(src, list[j])
		if !ok {
			return spliced{}, false
		}
		if s >= b {
			break
		}
		a, b = min(a, s), max(b, e)
		j++
	}
	// Widening a may take in a statement before that ends on the line.
	for i > 0 {
		s, e, ok := extent(src, list[i-1])
		if !ok {
			return spliced{}, false
		}
		if e <= a {
			break
		}
		a = min(a, s)
		i--
	}
	if a < lo || b > hi {
		return spliced{}, false
	}
	return spliced{a: a, b: b, list: list, i: i, j: j}, true
}

// extent is the whole lines a statement and its block occupy.
func extent(src []byte, s *Stmt) (start, end int, ok bool) {
	last := s.EndPos.Offset
	if s.Block != nil {
		if s.Block.Close < 0 {
			return 0, 0, false
		}
		last = s.Block.Close + 1
	}
	return lineStartAt(src, s.Pos.Offset), lineEndAfter(src, max(last-1, s.Pos.Offset)), true
}

// Changed returns where new differs from old: the bytes [start, oldEnd)
// of old became [start, newEnd) of new (start = oldEnd = newEnd = the
// length when they are the same text).
func Changed(old, new []byte) (start, oldEnd, newEnd int) {
	p := commonPrefix(old, new)
	q := commonSuffix(old[p:], new[p:])
	return p, len(old) - q, len(new) - q
}

// commonPrefix is the length of the longest common prefix of x and y.
func commonPrefix(x, y []byte) int {
	n := min(len(x), len(y))
	p := 0
	// Whole chunks first: bytes.Equal compares them many bytes at a time.
	for chunk := 256; p+chunk <= n && bytes.Equal(x[p:p+chunk], y[p:p+chunk]); p += chunk {
	}
	for p < n && x[p] == y[p] {
		p++
	}
	return p
}

// commonSuffix is the length of the longest common suffix of x and y.
func commonSuffix(x, y []byte) int {
	n := min(len(x), len(y))
	q := 0
	for chunk := 256; q+chunk <= n && bytes.Equal(x[len(x)-q-chunk:len(x)-q], y[len(y)-q-chunk:len(y)-q]); q += chunk {
	}
	for q < n && x[len(x)-1-q] == y[len(y)-1-q] {
		q++
	}
	return q
}

// lineStartAt is the offset of the start of the line holding off.
func lineStartAt(src []byte, off int) int {
	return bytes.LastIndexByte(src[:off], '\n') + 1
}

// lineEndAfter is the offset just after the newline that ends the line
// holding off (the end of the text for the last line).
func lineEndAfter(src []byte, off int) int {
	if off >= len(src) {
		return len(src)
	}
	i := bytes.IndexByte(src[off:], '\n')
	if i < 0 {
		return len(src)
	}
	return off + i + 1
}

// unclosed reports whether a block was left open at the end of the text;
// such blocks are always the last statements at their level.
func unclosed(list []*Stmt) bool {
	for len(list) > 0 {
		s := list[len(list)-1]
		if s.Block == nil {
			return false
		}
		if s.Block.Close < 0 {
			return true
		}
		list = s.Block.Stmts
	}
	return false
}

// blockDepth is how deeply blocks nest in list.
func blockDepth(list []*Stmt) int {
	d := 0
	for _, s := range list {
		if s.Block != nil {
			d = max(d, 1+blockDepth(s.Block.Stmts))
		}
	}
	return d
}

// splice returns a new list: list[:i], then mid, then list[j:] moved.
func splice(list []*Stmt, i, j int, mid []*Stmt, mv *mover) []*Stmt {
	n := i + len(mid) + len(list) - j
	if n == 0 {
		return nil
	}
	out := make([]*Stmt, 0, n)
	out = append(out, list[:i]...)
	out = append(out, mid...)
	for _, s := range list[j:] {
		out = append(out, mv.stmt(s))
	}
	return out
}

// spliceErrors keeps old's errors before a, then mid's (at a), then old's
// from b on, moved by delta. An error at the end of the text (atEnd: b is
// that end) belongs to the last line.
func spliceErrors(old, mid []Diagnostic, a, b, delta int, atEnd bool) []Diagnostic {
	return spliceSpans(old, mid, a, delta, func(d *Diagnostic) *Span { return &d.Loc.Span },
		func(s Span) bool { return s.Start > b || (s.Start == b && !atEnd) })
}

// spliceComments keeps old's comments before a, then mid's (at a), then
// old's from b on, moved by delta.
func spliceComments(old, mid []Comment, a, b, delta int) []Comment {
	return spliceSpans(old, mid, a, delta, func(c *Comment) *Span { return &c.Span },
		func(s Span) bool { return s.Start >= b })
}

// spliceSpans keeps the items of old that start before a, then those of
// mid moved by a, then those of old that kept accepts, moved by delta; span
// gives an item's span. It returns nil for no items.
func spliceSpans[T any](old, mid []T, a, delta int, span func(*T) *Span, kept func(Span) bool) []T {
	if len(old)+len(mid) == 0 {
		return nil
	}
	out := make([]T, 0, len(old)+len(mid))
	for _, x := range old {
		if span(&x).Start < a {
			out = append(out, x)
		}
	}
	for _, x := range mid {
		sp := span(&x)
		sp.Start += a
		sp.End += a
		out = append(out, x)
	}
	for _, x := range old {
		if sp := span(&x); kept(*sp) {
			sp.Start += delta
			sp.End += delta
			out = append(out, x)
		}
	}
	if len(out) == 0 {
		return nil
	}
	return out
}

// mover moves syntax nodes by d bytes: in place, or (copy) into new nodes
// so that a tree another version still reads stays as it is. A copy by
// zero bytes is the node itself.
type mover struct {
	d    int
	copy bool
	n    *nodes
}

func (m *mover) pos(p Pos) Pos { return Pos{Offset: p.Offset + m.d} }

func (m *mover) stmt(s *Stmt) *Stmt {
	if m.copy && m.d == 0 {
		return s
	}
	t := s
	if m.copy {
		t = m.n.stmts.alloc()
		*t = *s
	}
	t.Pos, t.EndPos = m.pos(s.Pos), m.pos(s.EndPos)
	t.Word = m.ident(s.Word)
	if len(s.Args) > 0 {
		args := s.Args
		if m.copy {
			args = m.n.argPtrs.carve(s.Args)
		}
		for i, a := range s.Args {
			args[i] = m.arg(a)
		}
		t.Args = args
	}
	if s.Block != nil {
		blk := s.Block
		if m.copy {
			blk = &Block{}
			*blk = *s.Block
		}
		blk.Open += m.d
		if s.Block.Close >= 0 {
			blk.Close += m.d
		}
		if len(s.Block.Stmts) > 0 {
			list := s.Block.Stmts
			if m.copy {
				list = m.n.stmtPtrs.carve(s.Block.Stmts)
			}
			for i, c := range s.Block.Stmts {
				list[i] = m.stmt(c)
			}
			blk.Stmts = list
		}
		t.Block = blk
	}
	return t
}

func (m *mover) ident(x *Ident) *Ident {
	if x == nil {
		return nil
	}
	t := x
	if m.copy {
		t = m.n.idents.alloc()
	}
	*t = Ident{Pos: m.pos(x.Pos), EndPos: m.pos(x.EndPos), Name: x.Name}
	return t
}

func (m *mover) arg(x *Arg) *Arg {
	t := x
	if m.copy {
		t = m.n.args.alloc()
		*t = *x
	}
	t.Pos, t.EndPos = m.pos(x.Pos), m.pos(x.EndPos)
	if x.Expr != nil {
		t.Expr = m.expr(x.Expr)
	}
	return t
}

func (m *mover) expr(x *Expr) *Expr {
	t := x
	if m.copy {
		t = m.n.exprs.alloc()
		*t = *x
	}
	t.Pos, t.EndPos = m.pos(x.Pos), m.pos(x.EndPos)
	t.Left = m.term(x.Left)
	if len(x.Ops) > 0 {
		ops := x.Ops
		if m.copy {
			ops = make([]*ExprOp, len(x.Ops))
		}
		for i, o := range x.Ops {
			op := o
			if m.copy {
				op = m.n.exprOps.alloc()
			}
			*op = ExprOp{Op: o.Op, Term: m.term(o.Term)}
			ops[i] = op
		}
		t.Ops = ops
	}
	return t
}

func (m *mover) term(x *Term) *Term {
	if x == nil {
		return nil
	}
	t := x
	if m.copy {
		t = m.n.terms.alloc()
		*t = *x
	}
	t.Pos, t.EndPos = m.pos(x.Pos), m.pos(x.EndPos)
	t.Left = m.factor(x.Left)
	if len(x.Ops) > 0 {
		ops := x.Ops
		if m.copy {
			ops = make([]*TermOp, len(x.Ops))
		}
		for i, o := range x.Ops {
			op := o
			if m.copy {
				op = m.n.termOps.alloc()
			}
			*op = TermOp{Op: o.Op, Factor: m.factor(o.Factor)}
			ops[i] = op
		}
		t.Ops = ops
	}
	return t
}

func (m *mover) factor(x *Factor) *Factor {
	if x == nil {
		return nil
	}
	t := x
	if m.copy {
		t = m.n.factors.alloc()
		*t = *x
	}
	t.Pos, t.EndPos = m.pos(x.Pos), m.pos(x.EndPos)
	t.Atom = m.atom(x.Atom)
	if x.Power != nil {
		pw := x.Power
		if m.copy {
			pw = m.n.powers.alloc()
		}
		*pw = Power{Pos: m.pos(x.Power.Pos), EndPos: m.pos(x.Power.EndPos), Sign: x.Power.Sign, Digits: x.Power.Digits}
		t.Power = pw
	}
	return t
}

func (m *mover) atom(x *Atom) *Atom {
	if x == nil {
		return nil
	}
	t := x
	if m.copy {
		t = m.n.atoms.alloc()
		*t = *x
	}
	t.Pos, t.EndPos = m.pos(x.Pos), m.pos(x.EndPos)
	t.Ref = m.ident(x.Ref)
	if x.Str != nil {
		s := x.Str
		if m.copy {
			s = m.n.strs.alloc()
		}
		*s = Str{Pos: m.pos(x.Str.Pos), EndPos: m.pos(x.Str.EndPos), Quoted: x.Str.Quoted}
		t.Str = s
	}
	if len(x.Group) > 0 {
		g := x.Group
		if m.copy {
			g = make([]*Expr, len(x.Group))
		}
		for i, e := range x.Group {
			g[i] = m.expr(e)
		}
		t.Group = g
	}
	if x.Unit != nil {
		u := x.Unit
		if m.copy {
			u = m.n.unitsT.alloc()
		}
		*u = UnitTok{Pos: m.pos(x.Unit.Pos), EndPos: m.pos(x.Unit.EndPos), Text: x.Unit.Text}
		t.Unit = u
	}
	return t
}
