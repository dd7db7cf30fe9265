//go:build proj

package crs

// #cgo pkg-config: proj
// #include <stdlib.h>
// #include <proj.h>
import "C"

import (
	"fmt"
	"unsafe"
)

// checkHorizontal returns an error unless EPSG:epsg is, in PROJ's database, a geographic or
// projected coordinate reference system, or a compound one whose first part is: a system
// whose first two axes are longitude/latitude or easting/northing. A vertical, geocentric,
// engineering or temporal system, or a code of something that is not a system at all, is
// not a place on the map.
func checkHorizontal(epsg int) error {
	ctx := C.proj_context_create()
	defer C.proj_context_destroy(ctx)
	C.proj_log_level(ctx, C.PJ_LOG_NONE)
	cname := C.CString(fmt.Sprintf("EPSG:%d", epsg))
	defer C.free(unsafe.Pointer(cname))
	pj := C.proj_create(ctx, cname)
	if pj == nil {
		return fmt.Errorf("EPSG:%d: want the code of a coordinate reference system; PROJ's database has none of that code", epsg)
	}
	defer C.proj_destroy(pj)
	t := C.proj_get_type(pj)
	name := C.GoString(C.proj_get_name(pj))
	if t == C.PJ_TYPE_COMPOUND_CRS {
		if h := C.proj_crs_get_sub_crs(ctx, pj, 0); h != nil {
			defer C.proj_destroy(h)
			t = C.proj_get_type(h)
		}
	}
	switch t {
	case C.PJ_TYPE_GEOGRAPHIC_2D_CRS, C.PJ_TYPE_GEOGRAPHIC_3D_CRS, C.PJ_TYPE_PROJECTED_CRS:
		return nil
	}
	return fmt.Errorf("EPSG:%d (%s): want a geographic or projected coordinate reference system, got %s", epsg, name, kindName(t))
}

// kindName names a PROJ object type for a message.
func kindName(t C.PJ_TYPE) string {
	switch t {
	case C.PJ_TYPE_GEOCENTRIC_CRS:
		return "a geocentric one (x, y, z from the Earth's centre)"
	case C.PJ_TYPE_VERTICAL_CRS:
		return "a vertical one (heights only)"
	case C.PJ_TYPE_ENGINEERING_CRS:
		return "an engineering one (a local grid not tied to the Earth)"
	case C.PJ_TYPE_TEMPORAL_CRS:
		return "a temporal one"
	case C.PJ_TYPE_BOUND_CRS, C.PJ_TYPE_OTHER_CRS, C.PJ_TYPE_COMPOUND_CRS, C.PJ_TYPE_GEODETIC_CRS:
		return "a system of a kind spanwright does not read"
	}
	return "something that is not a coordinate reference system (a unit, datum, ellipsoid or operation)"
}
