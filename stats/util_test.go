package stats

import (
	"os"
	"reflect"
	"sort"
)

var osReadFile = os.ReadFile

func reflectValue(v any) reflect.Value { return reflect.ValueOf(v) }

func sortStd(x []float64) { sort.Float64s(x) }
