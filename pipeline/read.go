package pipeline

import (
	"math"
	"strconv"
	"strings"

	"github.com/tidwall/gjson"
)

// The typed readers below check a value's JSON type before converting it:
// gjson converts quietly (Int of the string "3" is 3, Bool of "yes" is
// false), so each reader reports a wrong type or an out-of-range value at the
// value's position and returns ok=false.

// describe names a JSON value for an error message.
func describe(v gjson.Result) string {
	switch v.Type {
	case gjson.Null:
		return "null"
	case gjson.False, gjson.True:
		return "boolean " + v.Raw
	case gjson.Number:
		return v.Raw
	case gjson.String:
		s := v.Str
		if len(s) > 40 {
			s = s[:37] + "..."
		}
		return "string " + strconv.Quote(s)
	case gjson.JSON:
		if v.IsArray() {
			return "array"
		}
		return "object"
	}
	return "nothing"
}

func (c *collector) wantType(path string, v gjson.Result, want string, ok bool) bool {
	if !ok {
		c.add(v.Index, path, "want %s, got %s", want, describe(v))
	}
	return ok
}

// wantString reads a string; empty strings are refused when nonEmpty.
func (c *collector) wantString(path string, v gjson.Result, nonEmpty bool) (string, bool) {
	if !c.wantType(path, v, "string", v.Type == gjson.String) {
		return "", false
	}
	if nonEmpty && strings.TrimSpace(v.Str) == "" {
		c.add(v.Index, path, "must not be empty")
		return "", false
	}
	return v.Str, true
}

// wantBool reads true or false.
func (c *collector) wantBool(path string, v gjson.Result) (bool, bool) {
	if !c.wantType(path, v, "true or false", v.Type == gjson.True || v.Type == gjson.False) {
		return false, false
	}
	return v.Type == gjson.True, true
}

// wantEnum reads a string that must be one of allowed.
func (c *collector) wantEnum(path string, v gjson.Result, allowed ...string) (string, bool) {
	list := `"` + strings.Join(allowed, `", "`) + `"`
	if !c.wantType(path, v, "one of "+list, v.Type == gjson.String) {
		return "", false
	}
	for _, a := range allowed {
		if v.Str == a {
			return a, true
		}
	}
	c.add(v.Index, path, "want one of %s, got %q", list, v.Str)
	return "", false
}

// numRange is a closed interval, or open at the low end when loOpen.
type numRange struct {
	lo, hi float64
	loOpen bool
}

func (r numRange) contains(x float64) bool { // x is finite
	if r.loOpen {
		return x > r.lo && x <= r.hi
	}
	return x >= r.lo && x <= r.hi
}

func (r numRange) String() string {
	switch {
	case math.IsInf(r.hi, 1) && r.loOpen:
		return "greater than " + fmtNum(r.lo)
	case math.IsInf(r.hi, 1):
		return "at least " + fmtNum(r.lo)
	case r.loOpen:
		return "in (" + fmtNum(r.lo) + ", " + fmtNum(r.hi) + "]"
	}
	return "in [" + fmtNum(r.lo) + ", " + fmtNum(r.hi) + "]"
}

func fmtNum(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

var anyFinite = numRange{lo: -math.MaxFloat64, hi: math.MaxFloat64}

// wantNumber reads a finite number within r.
func (c *collector) wantNumber(path string, v gjson.Result, r numRange) (float64, bool) {
	if !c.wantType(path, v, "number", v.Type == gjson.Number) {
		return 0, false
	}
	x := v.Num
	if math.IsNaN(x) || math.IsInf(x, 0) {
		c.add(v.Index, path, "number %s is out of range", v.Raw)
		return 0, false
	}
	if !r.contains(x) {
		c.add(v.Index, path, "want a number %s, got %s", r, v.Raw)
		return 0, false
	}
	return x, true
}

// wantInt reads an integer within [lo, hi].
func (c *collector) wantInt(path string, v gjson.Result, lo, hi int) (int, bool) {
	if v.Type != gjson.Number || math.Trunc(v.Num) != v.Num {
		c.add(v.Index, path, "want integer, got %s", describe(v))
		return 0, false
	}
	// gjson clamps big integers and turns 1e400 into +Inf: range-check the
	// float before converting.
	if v.Num < float64(lo) || v.Num > float64(hi) {
		c.add(v.Index, path, "want an integer in [%d, %d], got %s", lo, hi, v.Raw)
		return 0, false
	}
	return int(v.Num), true
}

// wantObject checks that v is an object and walks its keys in order: it
// reports duplicate keys and, when allowed is not nil, keys not in allowed,
// at the key's position. visit is called once per distinct, allowed key,
// with c.keyAt set to the key's offset.
func (c *collector) wantObject(path string, v gjson.Result, allowed map[string]bool, visit func(key string, kpath string, val gjson.Result)) bool {
	if !c.wantType(path, v, "object", v.IsObject()) {
		return false
	}
	seen := map[string]int{}
	v.ForEach(func(k, val gjson.Result) bool {
		kpath := joinKey(path, k.Str)
		if first, dup := seen[k.Str]; dup {
			l, col := c.pos.at(first)
			c.add(k.Index, kpath, "duplicate key %q (first at %d:%d)", k.Str, l, col)
			return true
		}
		seen[k.Str] = k.Index
		if allowed != nil && !allowed[k.Str] {
			c.add(k.Index, kpath, "unknown key %q%s", k.Str, suggest(k.Str, allowed))
			return true
		}
		if visit != nil {
			c.keyAt = k.Index
			visit(k.Str, kpath, val)
		}
		return true
	})
	return true
}

// wantArray checks that v is an array and calls visit for each element.
func (c *collector) wantArray(path string, v gjson.Result, visit func(i int, ipath string, val gjson.Result)) bool {
	if !c.wantType(path, v, "array", v.IsArray()) {
		return false
	}
	i := 0
	v.ForEach(func(_, val gjson.Result) bool {
		visit(i, path+"["+strconv.Itoa(i)+"]", val)
		i++
		return true
	})
	return true
}

// checkDuplicates reports duplicate keys in every object inside v; it is
// used on values passed on raw (stage parameters), where gjson and
// encoding/json would disagree on which duplicate wins.
func (c *collector) checkDuplicates(path string, v gjson.Result) {
	switch {
	case v.IsObject():
		c.wantObject(path, v, nil, func(_, kpath string, val gjson.Result) {
			c.checkDuplicates(kpath, val)
		})
	case v.IsArray():
		c.wantArray(path, v, func(_ int, ipath string, val gjson.Result) {
			c.checkDuplicates(ipath, val)
		})
	}
}

// joinKey appends key to a key path, quoting keys that are not plain names.
func joinKey(path, key string) string {
	plain := key != ""
	for _, r := range key {
		if !(r == '_' || r == '-' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9') {
			plain = false
			break
		}
	}
	if !plain {
		key = strconv.Quote(key)
	}
	if path == "" {
		return key
	}
	return path + "." + key
}

// suggest returns ` (did you mean "x"?)` for the allowed key closest to key
// by edit distance, when one is close: at most one edit in three characters.
func suggest(key string, allowed map[string]bool) string {
	limit := max(1, len([]rune(key))/3)
	best, bestD := "", limit+1
	for a := range allowed {
		if d := editDistance(key, a); d < bestD || d == bestD && a < best {
			best, bestD = a, d
		}
	}
	if best == "" {
		return ""
	}
	return " (did you mean " + strconv.Quote(best) + "?)"
}

func editDistance(as, bs string) int {
	a, b := []rune(as), []rune(bs)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
