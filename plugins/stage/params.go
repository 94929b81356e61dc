package stage

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/tidwall/gjson"
)

// ParamType is the type of a parameter value.
type ParamType string

// The parameter types.
const (
	Number  ParamType = "number"  // a JSON number
	Integer ParamType = "integer" // a JSON number with no fractional part
	String  ParamType = "string"
	Boolean ParamType = "boolean"
	Numbers ParamType = "numbers" // an array of JSON numbers
)

// Param describes one key of the parameters object of a Request.
type Param struct {
	Name string // snake_case, with the unit as a suffix where there is one: "alpha_deg"
	Type ParamType
	// Default is the JSON text of the default value; nil means the
	// parameter is required.
	Default json.RawMessage
	// Min and Max are inclusive bounds on a number, an integer or each
	// element of numbers; nil means unbounded.
	Min, Max *float64
	// MinItems and MaxItems bound the length of a numbers value; 0 means
	// no bound.
	MinItems, MaxItems int
	// Choices lists the allowed values of a string; empty means any.
	Choices []string
	Unit    string // "degrees", "chord", or empty
	Doc     string
}

// Bound returns a pointer to v, for Param.Min and Param.Max.
func Bound(v float64) *float64 { return &v }

// ParamError reports a parameter that is missing, unknown, of the wrong type
// or out of range. It wraps ErrBadInput.
type ParamError struct {
	Name   string
	Reason string
}

func (e *ParamError) Error() string { return fmt.Sprintf("parameter %q: %s", e.Name, e.Reason) }

// Is reports whether target is ErrBadInput.
func (e *ParamError) Is(target error) bool { return target == ErrBadInput }

// Values are parameters checked by Validate, defaults filled in. The getters
// panic if the name is not a declared parameter of that type: that is a bug
// in the stage, not bad input.
type Values struct {
	types map[string]ParamType
	raw   map[string]gjson.Result
}

// Validate checks the JSON object params against ps: it must be an object,
// with no unknown or duplicate keys, every value of its declared type and in
// range, and every required parameter present. Absent parameters take their
// defaults. nil or empty params means {}. Errors are *ParamError or wrap
// ErrBadInput.
func Validate(ps []Param, params []byte) (Values, error) {
	v := Values{types: map[string]ParamType{}, raw: map[string]gjson.Result{}}
	byName := map[string]*Param{}
	for i := range ps {
		byName[ps[i].Name] = &ps[i]
		v.types[ps[i].Name] = ps[i].Type
	}
	if len(strings.TrimSpace(string(params))) == 0 {
		params = []byte("{}")
	}
	if !gjson.ValidBytes(params) {
		return Values{}, BadInputf("parameters are not valid JSON: %s", excerpt(params))
	}
	obj := gjson.ParseBytes(params)
	if !obj.IsObject() {
		return Values{}, BadInputf("parameters must be a JSON object, got %s", excerpt([]byte(obj.Raw)))
	}
	var err error
	obj.ForEach(func(k, val gjson.Result) bool {
		name := k.String()
		p, ok := byName[name]
		switch {
		case !ok:
			err = &ParamError{name, "unknown parameter" + suggest(ps)}
		case v.raw[name].Exists():
			err = &ParamError{name, "given twice"}
		default:
			err = p.check(val)
			v.raw[name] = val
		}
		return err == nil
	})
	if err != nil {
		return Values{}, err
	}
	for _, p := range ps {
		if v.raw[p.Name].Exists() {
			continue
		}
		if p.Default == nil {
			return Values{}, &ParamError{p.Name, "required"}
		}
		v.raw[p.Name] = gjson.ParseBytes(p.Default)
	}
	return v, nil
}

func suggest(ps []Param) string {
	if len(ps) == 0 {
		return " (the stage takes none)"
	}
	names := make([]string, len(ps))
	for i, p := range ps {
		names[i] = p.Name
	}
	return " (known: " + strings.Join(names, ", ") + ")"
}

// check checks one value against p.
func (p *Param) check(val gjson.Result) error {
	fail := func(format string, args ...any) error {
		return &ParamError{p.Name, fmt.Sprintf(format, args...)}
	}
	switch p.Type {
	case Number, Integer:
		x, err := p.number(val)
		if err != nil {
			return fail("%v", err)
		}
		return p.inRange(x, "", fail)
	case String:
		if val.Type != gjson.String {
			return fail("want a string, got %s", describe(val))
		}
		if len(p.Choices) > 0 {
			for _, c := range p.Choices {
				if val.Str == c {
					return nil
				}
			}
			return fail("%q is not one of %s", val.Str, strings.Join(p.Choices, ", "))
		}
		return nil
	case Boolean:
		if val.Type != gjson.True && val.Type != gjson.False {
			return fail("want true or false, got %s", describe(val))
		}
		return nil
	case Numbers:
		if !val.IsArray() {
			return fail("want an array of numbers, got %s", describe(val))
		}
		n := 0
		var err error
		val.ForEach(func(_, e gjson.Result) bool {
			var x float64
			if x, err = p.number(e); err != nil {
				err = fail("element %d: %v", n, err)
				return false
			}
			if err = p.inRange(x, fmt.Sprintf("element %d ", n), fail); err != nil {
				return false
			}
			n++
			return true
		})
		if err != nil {
			return err
		}
		if p.MinItems > 0 && n < p.MinItems {
			return fail("want at least %d value(s), got %d", p.MinItems, n)
		}
		if p.MaxItems > 0 && n > p.MaxItems {
			return fail("want at most %d value(s), got %d", p.MaxItems, n)
		}
		return nil
	}
	return fail("unknown type %q", p.Type)
}

// number reads a JSON number, an integer if p says so. Numbers too large
// for a float64 are refused.
func (p *Param) number(val gjson.Result) (float64, error) {
	if val.Type != gjson.Number {
		return 0, fmt.Errorf("want a number, got %s", describe(val))
	}
	x, err := strconv.ParseFloat(val.Raw, 64)
	if err != nil || math.IsInf(x, 0) {
		return 0, fmt.Errorf("number %s is out of range", val.Raw)
	}
	if p.Type == Integer && (x != math.Trunc(x) || math.Abs(x) > 1<<53) {
		return 0, fmt.Errorf("want an integer, got %s", val.Raw)
	}
	return x, nil
}

func (p *Param) inRange(x float64, what string, fail func(string, ...any) error) error {
	if p.Min != nil && x < *p.Min {
		return fail("%s%g is below the minimum %g", what, x, *p.Min)
	}
	if p.Max != nil && x > *p.Max {
		return fail("%s%g is above the maximum %g", what, x, *p.Max)
	}
	return nil
}

func (v Values) get(name string, t ParamType) gjson.Result {
	if pt, ok := v.types[name]; !ok || pt != t {
		panic(fmt.Sprintf("stage: no %s parameter %q declared", t, name))
	}
	return v.raw[name]
}

// Number returns the number parameter name.
func (v Values) Number(name string) float64 { return v.get(name, Number).Float() }

// Int returns the integer parameter name.
func (v Values) Int(name string) int { return int(v.get(name, Integer).Int()) }

// String returns the string parameter name.
func (v Values) String(name string) string { return v.get(name, String).Str }

// Bool returns the boolean parameter name.
func (v Values) Bool(name string) bool { return v.get(name, Boolean).Bool() }

// Numbers returns the numbers parameter name, as a new slice.
func (v Values) Numbers(name string) []float64 {
	var xs []float64
	v.get(name, Numbers).ForEach(func(_, e gjson.Result) bool {
		xs = append(xs, e.Float())
		return true
	})
	if xs == nil {
		xs = []float64{}
	}
	return xs
}

var (
	stageNameRE = regexp.MustCompile(`^[a-z][a-z0-9]*(-[a-z0-9]+)*$`)
	paramNameRE = regexp.MustCompile(`^[a-z][a-z0-9]*(_[a-z0-9]+)*$`)
)

// CheckInfo reports whether info is a well-formed description: a kebab-case
// name, a version, a one-line summary, and parameters with unique snake_case
// names, known types, consistent bounds and defaults that pass their own
// check.
func CheckInfo(info Info) error {
	var errs []error
	bad := func(format string, args ...any) { errs = append(errs, fmt.Errorf(format, args...)) }
	if !stageNameRE.MatchString(info.Name) {
		bad("name %q is not kebab-case", info.Name)
	}
	if info.Version == "" {
		bad("no version")
	}
	if info.Summary == "" || strings.ContainsAny(info.Summary, "\n\r") {
		bad("summary %q must be one line", info.Summary)
	}
	if info.MaxNodes < 0 {
		bad("max_nodes %d is negative", info.MaxNodes)
	}
	if info.MaxConcurrency < 0 {
		bad("max_concurrency %d is negative", info.MaxConcurrency)
	}
	seen := map[string]bool{}
	for _, p := range info.Params {
		if !paramNameRE.MatchString(p.Name) {
			bad("parameter name %q is not snake_case", p.Name)
		}
		if seen[p.Name] {
			bad("parameter %q declared twice", p.Name)
		}
		seen[p.Name] = true
		switch p.Type {
		case Number, Integer, String, Boolean, Numbers:
		default:
			bad("parameter %q: unknown type %q", p.Name, p.Type)
			continue
		}
		if p.Min != nil && p.Max != nil && *p.Min > *p.Max {
			bad("parameter %q: min %g > max %g", p.Name, *p.Min, *p.Max)
		}
		if p.MaxItems > 0 && p.MinItems > p.MaxItems {
			bad("parameter %q: min_items %d > max_items %d", p.Name, p.MinItems, p.MaxItems)
		}
		if p.Default != nil {
			if !gjson.ValidBytes(p.Default) {
				bad("parameter %q: default %s is not JSON", p.Name, excerpt(p.Default))
			} else if err := p.check(gjson.ParseBytes(p.Default)); err != nil {
				bad("default: %v", err)
			}
		}
	}
	seen = map[string]bool{}
	for _, s := range info.Scalars {
		if !paramNameRE.MatchString(s.Name) || seen[s.Name] {
			bad("scalar name %q is not snake_case or is declared twice", s.Name)
		}
		seen[s.Name] = true
	}
	if err := errors.Join(errs...); err != nil {
		return fmt.Errorf("stage: description of %q: %w", info.Name, err)
	}
	return nil
}
