"""The C ABI of strake through ctypes: the structs of strake.h, the numpy dtypes with the same
layout, the function signatures, and the loaded library (libstrake.so beside this file)."""

from __future__ import annotations

import ctypes
import os
import re
from ctypes import POINTER, c_char_p, c_double, c_int32, c_size_t, c_uint32, c_void_p

import numpy as np

_HERE = os.path.dirname(os.path.abspath(__file__))
LIBRARY_PATH = os.path.join(_HERE, "libstrake.so")

V3 = c_double * 3


class SurfaceJet(ctypes.Structure):
    _fields_ = [("p", V3), ("su", V3), ("sv", V3), ("suu", V3), ("suv", V3), ("svv", V3)]


class CurveJet(ctypes.Structure):
    _fields_ = [(n, c_double) for n in ("u", "v", "du", "dv", "ddu", "ddv")]


_FRAME_FIELDS = [
    ("curve_param", "f8", c_double),
    ("u", "f8", c_double),
    ("v", "f8", c_double),
    ("point", ("f8", 3), V3),
    ("tangent", ("f8", 3), V3),
    ("side", ("f8", 3), V3),
    ("normal", ("f8", 3), V3),
    ("normal_curvature", "f8", c_double),
    ("geodesic_curvature", "f8", c_double),
    ("geodesic_torsion", "f8", c_double),
    ("speed", "f8", c_double),
    ("k1", "f8", c_double),
    ("k2", "f8", c_double),
    ("dir1", ("f8", 3), V3),
    ("dir2", ("f8", 3), V3),
    ("mean_curvature", "f8", c_double),
    ("gaussian_curvature", "f8", c_double),
    ("surface_conditioning", "f8", c_double),
    ("curve_speed_figure", "f8", c_double),
]


class Frame(ctypes.Structure):
    _fields_ = [(n, c) for n, _, c in _FRAME_FIELDS]


class Sample(ctypes.Structure):
    _fields_ = [("frame", Frame), ("arc_length", c_double)]


class NurbsSurfaceData(ctypes.Structure):
    _fields_ = [
        ("degree_u", c_uint32),
        ("degree_v", c_uint32),
        ("count_u", c_size_t),
        ("count_v", c_size_t),
        ("knots_u", POINTER(c_double)),
        ("knot_count_u", c_size_t),
        ("knots_v", POINTER(c_double)),
        ("knot_count_v", c_size_t),
        ("points", POINTER(c_double)),
        ("weights", POINTER(c_double)),
    ]


class Extremes(ctypes.Structure):
    _fields_ = [
        ("min", c_double),
        ("min_index", c_size_t),
        ("min_arc_length", c_double),
        ("min_t", c_double),
        ("max", c_double),
        ("max_index", c_size_t),
        ("max_arc_length", c_double),
        ("max_t", c_double),
    ]


class Violation(ctypes.Structure):
    _fields_ = [
        ("start_arc_length", c_double),
        ("end_arc_length", c_double),
        ("start_t", c_double),
        ("end_t", c_double),
        ("first_index", c_size_t),
        ("last_index", c_size_t),
        ("worst", c_double),
    ]


#: numpy dtype of one frame, field for field the C struct StrakeFrame.
FRAME_DTYPE = np.dtype([(n, d) for n, d, _ in _FRAME_FIELDS])
#: numpy dtype of one sample (StrakeSample): the frame and its arc length.
SAMPLE_DTYPE = np.dtype([("frame", FRAME_DTYPE), ("arc_length", "f8")])
#: numpy dtype of a violation interval (StrakeViolation).
VIOLATION_DTYPE = np.dtype([(n, "f8" if c is c_double else np.uintp) for n, c in Violation._fields_])

assert FRAME_DTYPE.itemsize == ctypes.sizeof(Frame)
assert SAMPLE_DTYPE.itemsize == ctypes.sizeof(Sample)
assert VIOLATION_DTYPE.itemsize == ctypes.sizeof(Violation)



def parse_structs(header: str) -> dict:
    """numpy dtypes (aligned as C lays them out) of every `typedef struct Strake... { }` of
    strake.h: fields of double, int32_t, uint32_t, size_t, pointers, fixed arrays and nested
    structs."""
    scalar = {"double": np.float64, "int32_t": np.int32, "uint32_t": np.uint32, "size_t": np.uintp}
    out: dict = {}
    for m in re.finditer(r"typedef struct (Strake\w+) \{(.*?)\} \1;", header, re.S):
        name, body = m.groups()
        body = re.sub(r"/\*.*?\*/", "", body, flags=re.S)
        fields = []
        for decl in filter(None, (d.strip() for d in body.split(";"))):
            mm = re.fullmatch(r"(?:const )?(struct \w+|\w+)\s*(\*?)\s*(\w+)(?:\[(\d+)\])?", decl)
            if mm is None:
                raise RuntimeError(f"strake.h: cannot read the field `{decl}` of {name}")
            typ, ptr, field, count = mm.groups()
            if ptr:
                dt = np.dtype(np.uintp)
            elif typ.startswith("struct "):
                dt = out[typ[len("struct "):]]
            else:
                dt = np.dtype(scalar[typ])
            fields.append((field, (dt, int(count))) if count else (field, dt))
        out[name] = np.dtype(fields, align=True)
    return out


with open(os.path.join(_HERE, "strake.h"), encoding="utf-8") as _f:
    STRUCTS = parse_structs(_f.read())

SURFACE_FN = ctypes.CFUNCTYPE(c_int32, c_void_p, c_double, c_double, c_int32, POINTER(SurfaceJet))

Status = c_uint32
PD = POINTER(c_double)
lib = ctypes.CDLL(LIBRARY_PATH)


def _sig(name, restype, *argtypes):
    f = getattr(lib, name)
    f.restype = restype
    f.argtypes = list(argtypes)


_sig("strake_version", c_char_p)
_sig("strake_status_name", c_char_p, c_uint32)
_sig("strake_last_error_message", c_size_t, ctypes.c_char_p, c_size_t)
_sig("strake_last_callback_code", c_int32)
_sig("strake_callback_report", None, c_char_p)
_sig("strake_surface_from_callback", Status, SURFACE_FN, c_void_p, c_double, c_double, c_double,
     c_double, c_int32, POINTER(c_void_p))
_sig("strake_surface_new_nurbs", Status, POINTER(NurbsSurfaceData), c_int32, POINTER(c_void_p))
_sig("strake_surface_free", None, c_void_p)
_sig("strake_surface_evaluate", Status, c_void_p, PD, c_size_t, c_uint32, c_void_p)
_sig("strake_curve_new_nurbs", Status, c_uint32, PD, c_size_t, PD, c_size_t, PD, POINTER(c_void_p))
_sig("strake_curve_through_uv_points", Status, PD, c_size_t, c_uint32, c_uint32, PD, PD,
     POINTER(c_void_p))
_sig("strake_curve_free", None, c_void_p)
_sig("strake_frame_at", Status, c_void_p, c_void_p, c_double, c_void_p)
_sig("strake_frames_at", Status, c_void_p, c_void_p, PD, c_size_t, c_void_p)
_sig("strake_frames_at_parallel", Status, c_void_p, c_void_p, PD, c_size_t, c_uint32, c_void_p)
_sig("strake_frames_even", Status, c_void_p, c_void_p, c_size_t, c_void_p)
_sig("strake_samples_at", Status, c_void_p, c_void_p, PD, c_size_t, c_double, c_void_p)
_sig("strake_sample_even_t", Status, c_void_p, c_void_p, c_size_t, c_double, c_void_p, c_size_t,
     POINTER(c_size_t))
_sig("strake_sample_even_arc", Status, c_void_p, c_void_p, c_size_t, c_double, c_void_p, c_size_t,
     POINTER(c_size_t))
_sig("strake_sample_chordal", Status, c_void_p, c_void_p, c_double, c_double, c_double, c_void_p,
     c_size_t, POINTER(c_size_t))
_sig("strake_arc_length", Status, c_void_p, c_void_p, c_double, c_double, c_double, PD)
_sig("strake_path_extremes", Status, c_void_p, PD, c_size_t, POINTER(Extremes))
_sig("strake_path_violations", Status, c_void_p, PD, c_size_t, c_double, c_void_p, c_size_t,
     POINTER(c_size_t))

for _name in ("gouge", "rear_gouge"):
    _sig(f"strake_check_{_name}_path", Status, c_void_p, c_size_t, c_uint32, c_void_p, c_void_p,
         c_void_p)
_sig("strake_check_scallop_path", Status, c_void_p, c_size_t, c_uint32, c_double, c_double, c_void_p)
_sig("strake_check_step_over_cutter_path", Status, c_void_p, c_size_t, c_uint32, c_void_p, c_void_p,
     c_double, c_void_p)
_sig("strake_check_feed_path", Status, c_void_p, c_size_t, c_void_p, c_void_p)
_sig("strake_check_fibre_path", Status, c_void_p, c_size_t, c_void_p, c_void_p)
_sig("strake_check_tow_edges_path", Status, c_void_p, c_size_t, c_double, c_void_p)
_sig("strake_tool_axis_path", Status, c_void_p, c_size_t, c_uint32, c_void_p, c_void_p)
