package netcdf

import (
	"fmt"
	"math"
)

// Format is a NetCDF file format variant: the version byte after "CDF".
type Format int

const (
	// Classic is the classic format (CDF-1): 32-bit file offsets.
	Classic Format = 1
	// Offset64 is the 64-bit offset format (CDF-2): 64-bit file offsets.
	Offset64 Format = 2
)

// String returns the name ncdump -k prints for the format.
func (f Format) String() string {
	switch f {
	case Classic:
		return "classic"
	case Offset64:
		return "64-bit offset"
	}
	return fmt.Sprintf("Format(%d)", int(f))
}

// Type is a NetCDF external data type; its value is the nc_type code
// stored in the file.
type Type int32

// The six types of the classic data model.
const (
	Byte   Type = 1 // 8-bit signed integer
	Char   Type = 2 // 8-bit character
	Short  Type = 3 // 16-bit signed integer
	Int    Type = 4 // 32-bit signed integer
	Float  Type = 5 // IEEE 754 single precision
	Double Type = 6 // IEEE 754 double precision
)

// String returns the CDL name of the type.
func (t Type) String() string {
	switch t {
	case Byte:
		return "byte"
	case Char:
		return "char"
	case Short:
		return "short"
	case Int:
		return "int"
	case Float:
		return "float"
	case Double:
		return "double"
	}
	return fmt.Sprintf("Type(%d)", int32(t))
}

// Size returns the size in bytes of one value of type t in a file, or 0
// if t is not a valid type.
func (t Type) Size() int {
	switch t {
	case Byte, Char:
		return 1
	case Short:
		return 2
	case Int, Float:
		return 4
	case Double:
		return 8
	}
	return 0
}

func (t Type) valid() bool { return t >= Byte && t <= Double }

// The default fill values of the format, used for data that was never
// written unless a variable has a _FillValue attribute.
const (
	FillByte   int8    = -127
	FillChar   byte    = 0
	FillShort  int16   = -32767
	FillInt    int32   = -2147483647
	FillFloat  float32 = 9.9692099683868690e+36
	FillDouble float64 = 9.9692099683868690e+36
)

// Dim is a named dimension. A Len of 0 marks the record (unlimited)
// dimension, along which record variables grow; a file has at most one.
type Dim struct {
	Name string
	Len  int
}

// Attr is a named attribute. Its Value is one of
//
//	string              (stored as char)
//	int8, []int8        (byte)
//	int16, []int16      (short)
//	int32, []int32      (int)
//	int, []int          (int; the values must fit in 32 bits)
//	float32, []float32  (float)
//	float64, []float64  (double)
//
// Attributes read from a file always hold a string or a slice.
type Attr struct {
	Name  string
	Value any
}

// Type returns the NetCDF type a's Value is stored as, or 0 if the Go
// type of the Value is not supported.
func (a Attr) Type() Type {
	switch a.Value.(type) {
	case string:
		return Char
	case int8, []int8:
		return Byte
	case int16, []int16:
		return Short
	case int32, []int32, int, []int:
		return Int
	case float32, []float32:
		return Float
	case float64, []float64:
		return Double
	}
	return 0
}

// Text returns a's value if it is text.
func (a Attr) Text() (string, bool) {
	s, ok := a.Value.(string)
	return s, ok
}

// Float64s returns a's values converted to float64 if they are numbers.
func (a Attr) Float64s() ([]float64, bool) {
	switch v := a.Value.(type) {
	case int8:
		return []float64{float64(v)}, true
	case int16:
		return []float64{float64(v)}, true
	case int32:
		return []float64{float64(v)}, true
	case int:
		return []float64{float64(v)}, true
	case float32:
		return []float64{float64(v)}, true
	case float64:
		return []float64{v}, true
	case []int8:
		return toFloat64s(v), true
	case []int16:
		return toFloat64s(v), true
	case []int32:
		return toFloat64s(v), true
	case []int:
		return toFloat64s(v), true
	case []float32:
		return toFloat64s(v), true
	case []float64:
		return append([]float64(nil), v...), true
	}
	return nil, false
}

func toFloat64s[T int8 | int16 | int32 | int | float32](v []T) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = float64(x)
	}
	return out
}

// Var is a variable: a typed array over named dimensions. A variable
// whose first dimension is the record dimension is a record variable;
// the record dimension may not appear anywhere else. A variable with no
// dimensions is a scalar.
type Var struct {
	Name  string
	Type  Type
	Dims  []string
	Attrs []Attr
}

// Attr returns the attribute of v named name.
func (v *Var) Attr(name string) (Attr, bool) { return findAttr(v.Attrs, name) }

// FillValue returns the value that marks unwritten data of v: its
// _FillValue attribute when it has a numeric one, else the default fill
// value of its type.
func (v *Var) FillValue() float64 {
	if a, ok := v.Attr("_FillValue"); ok {
		if f, ok := a.Float64s(); ok && len(f) == 1 {
			return f[0]
		}
		if s, ok := a.Text(); ok && len(s) == 1 {
			return float64(s[0])
		}
	}
	return defaultFill(v.Type)
}

func defaultFill(t Type) float64 {
	switch t {
	case Byte:
		return float64(FillByte)
	case Char:
		return float64(FillChar)
	case Short:
		return float64(FillShort)
	case Int:
		return float64(FillInt)
	case Float:
		return float64(FillFloat)
	case Double:
		return FillDouble
	}
	return math.NaN()
}

// Header is the schema of a file: its format, dimensions, global
// attributes and variables, in the order they are stored. Create needs
// Format to be Classic or Offset64.
type Header struct {
	Format Format
	Dims   []Dim
	Attrs  []Attr
	Vars   []Var
}

// Dim returns the dimension named name.
func (h *Header) Dim(name string) (Dim, bool) {
	for _, d := range h.Dims {
		if d.Name == name {
			return d, true
		}
	}
	return Dim{}, false
}

// Var returns the variable named name.
func (h *Header) Var(name string) (*Var, bool) {
	for i := range h.Vars {
		if h.Vars[i].Name == name {
			return &h.Vars[i], true
		}
	}
	return nil, false
}

// Attr returns the global attribute named name.
func (h *Header) Attr(name string) (Attr, bool) { return findAttr(h.Attrs, name) }

func findAttr(attrs []Attr, name string) (Attr, bool) {
	for _, a := range attrs {
		if a.Name == name {
			return a, true
		}
	}
	return Attr{}, false
}
