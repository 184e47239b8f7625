package netcdf

import (
	"encoding/binary"
	"math"
)

// Header tags of the format specification.
const (
	tagAbsent    = 0x00
	tagDimension = 0x0A
	tagVariable  = 0x0B
	tagAttribute = 0x0C
	streaming    = 0xFFFFFFFF
)

var be = binary.BigEndian

// encodeHeader encodes a header validated by newLayout, with the begin
// offsets of l.
func encodeHeader(h *Header, l *layout, numrecs uint32) []byte {
	b := []byte{'C', 'D', 'F', byte(h.Format)}
	b = be.AppendUint32(b, numrecs)
	if len(h.Dims) == 0 {
		b = be.AppendUint64(b, 0)
	} else {
		b = be.AppendUint32(b, tagDimension)
		b = be.AppendUint32(b, uint32(len(h.Dims)))
		for _, d := range h.Dims {
			b = appendName(b, d.Name)
			b = be.AppendUint32(b, uint32(d.Len))
		}
	}
	b = appendAttrs(b, h.Attrs)
	if len(h.Vars) == 0 {
		return be.AppendUint64(b, 0)
	}
	dimID := make(map[string]uint32, len(h.Dims))
	for i, d := range h.Dims {
		dimID[d.Name] = uint32(i)
	}
	b = be.AppendUint32(b, tagVariable)
	b = be.AppendUint32(b, uint32(len(h.Vars)))
	for i, v := range h.Vars {
		b = appendName(b, v.Name)
		b = be.AppendUint32(b, uint32(len(v.Dims)))
		for _, d := range v.Dims {
			b = be.AppendUint32(b, dimID[d])
		}
		b = appendAttrs(b, v.Attrs)
		b = be.AppendUint32(b, uint32(v.Type))
		b = be.AppendUint32(b, uint32(l.vars[i].vsize))
		if h.Format == Classic {
			b = be.AppendUint32(b, uint32(l.vars[i].begin))
		} else {
			b = be.AppendUint64(b, uint64(l.vars[i].begin))
		}
	}
	return b
}

func appendName(b []byte, name string) []byte {
	b = be.AppendUint32(b, uint32(len(name)))
	b = append(b, name...)
	return appendPad(b, len(name), 0)
}

// appendPad appends the zero bytes that bring n bytes to a multiple of 4.
func appendPad(b []byte, n int, fill byte) []byte {
	for ; n%4 != 0; n++ {
		b = append(b, fill)
	}
	return b
}

func appendAttrs(b []byte, attrs []Attr) []byte {
	if len(attrs) == 0 {
		return be.AppendUint64(b, 0)
	}
	b = be.AppendUint32(b, tagAttribute)
	b = be.AppendUint32(b, uint32(len(attrs)))
	for _, a := range attrs {
		t, n, _ := attrValue(a.Value)
		b = appendName(b, a.Name)
		b = be.AppendUint32(b, uint32(t))
		b = be.AppendUint32(b, uint32(n))
		start := len(b)
		b = appendAttrValues(b, a.Value)
		b = appendPad(b, len(b)-start, 0)
	}
	return b
}

// appendAttrValues appends the big-endian encoding of an attribute value
// validated by attrValue, without padding.
func appendAttrValues(b []byte, v any) []byte {
	switch v := v.(type) {
	case string:
		return append(b, v...)
	case int8:
		return append(b, byte(v))
	case int16:
		return be.AppendUint16(b, uint16(v))
	case int32:
		return be.AppendUint32(b, uint32(v))
	case int:
		return be.AppendUint32(b, uint32(int32(v)))
	case float32:
		return be.AppendUint32(b, math.Float32bits(v))
	case float64:
		return be.AppendUint64(b, math.Float64bits(v))
	case []int8:
		for _, x := range v {
			b = append(b, byte(x))
		}
	case []int16:
		for _, x := range v {
			b = be.AppendUint16(b, uint16(x))
		}
	case []int32:
		for _, x := range v {
			b = be.AppendUint32(b, uint32(x))
		}
	case []int:
		for _, x := range v {
			b = be.AppendUint32(b, uint32(int32(x)))
		}
	case []float32:
		for _, x := range v {
			b = be.AppendUint32(b, math.Float32bits(x))
		}
	case []float64:
		for _, x := range v {
			b = be.AppendUint64(b, math.Float64bits(x))
		}
	}
	return b
}

type number interface {
	~int8 | ~int16 | ~int32 | ~float32 | ~float64
}

// putValues encodes src as big-endian values of the numeric type t into
// dst, which holds len(src)*t.Size() bytes. Floating-point targets round
// to nearest; integer targets take only integral values in their range.
// It returns the index of the first value t cannot represent, or -1.
func putValues[T number](dst []byte, t Type, src []T) int {
	switch t {
	case Double:
		dst = dst[:8*len(src)]
		for i, v := range src {
			be.PutUint64(dst[8*i:8*i+8], math.Float64bits(float64(v)))
		}
	case Float:
		dst = dst[:4*len(src)]
		for i, v := range src {
			f := float32(v)
			if math.IsInf(float64(f), 0) && !math.IsInf(float64(v), 0) {
				return i
			}
			be.PutUint32(dst[4*i:4*i+4], math.Float32bits(f))
		}
	case Int:
		dst = dst[:4*len(src)]
		for i, v := range src {
			x := float64(v)
			if x != math.Trunc(x) || x < math.MinInt32 || x > math.MaxInt32 {
				return i
			}
			be.PutUint32(dst[4*i:4*i+4], uint32(int32(x)))
		}
	case Short:
		dst = dst[:2*len(src)]
		for i, v := range src {
			x := float64(v)
			if x != math.Trunc(x) || x < math.MinInt16 || x > math.MaxInt16 {
				return i
			}
			be.PutUint16(dst[2*i:2*i+2], uint16(int16(x)))
		}
	case Byte:
		dst = dst[:len(src)]
		for i, v := range src {
			x := float64(v)
			if x != math.Trunc(x) || x < math.MinInt8 || x > math.MaxInt8 {
				return i
			}
			dst[i] = byte(int8(x))
		}
	}
	return -1
}

// getFloat64s decodes the big-endian values of the numeric type t in src
// into dst.
func getFloat64s(dst []float64, t Type, src []byte) {
	switch t {
	case Double:
		src = src[:8*len(dst)]
		for i := range dst {
			dst[i] = math.Float64frombits(be.Uint64(src[8*i : 8*i+8]))
		}
	case Float:
		src = src[:4*len(dst)]
		for i := range dst {
			dst[i] = float64(math.Float32frombits(be.Uint32(src[4*i : 4*i+4])))
		}
	case Int:
		src = src[:4*len(dst)]
		for i := range dst {
			dst[i] = float64(int32(be.Uint32(src[4*i : 4*i+4])))
		}
	case Short:
		src = src[:2*len(dst)]
		for i := range dst {
			dst[i] = float64(int16(be.Uint16(src[2*i : 2*i+2])))
		}
	case Byte:
		src = src[:len(dst)]
		for i := range dst {
			dst[i] = float64(int8(src[i]))
		}
	}
}

// decodeValues decodes n values of type t from src into a new slice of
// the matching Go type: []int8, []byte (char), []int16, []int32,
// []float32 or []float64.
func decodeValues(t Type, src []byte, n int) any {
	switch t {
	case Byte:
		v := make([]int8, n)
		for i := range v {
			v[i] = int8(src[i])
		}
		return v
	case Char:
		v := make([]byte, n)
		copy(v, src)
		return v
	case Short:
		v := make([]int16, n)
		for i := range v {
			v[i] = int16(be.Uint16(src[2*i:]))
		}
		return v
	case Int:
		v := make([]int32, n)
		for i := range v {
			v[i] = int32(be.Uint32(src[4*i:]))
		}
		return v
	case Float:
		v := make([]float32, n)
		for i := range v {
			v[i] = math.Float32frombits(be.Uint32(src[4*i:]))
		}
		return v
	case Double:
		v := make([]float64, n)
		for i := range v {
			v[i] = math.Float64frombits(be.Uint64(src[8*i:]))
		}
		return v
	}
	return nil
}
