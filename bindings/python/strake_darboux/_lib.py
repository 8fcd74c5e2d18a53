"""The C ABI of strake through ctypes, read from the header shipped with the package.

Everything here is derived from ``strake.h`` (copied into the wheel beside ``libstrake.so`` by
the build backend, so the two always come from one build):

- :data:`STRUCTS`: a numpy dtype for every ``typedef struct Strake... { }``, fields, offsets
  and size as C lays them out (``align=True``). A field added to a struct (at the end or
  anywhere) is in the dtype without a change here.
- :data:`ENUMS`: the named constants of every ``enum Strake...``.
- :data:`FUNCTIONS`: the prototype of every exported function; each one's ``restype`` and
  ``argtypes`` are set from it (pointers as ``c_void_p``, function pointers as the
  ``CFUNCTYPE`` of their typedef), so a new function is callable at once and a changed
  signature cannot be called with a stale one.

The ctypes structures the callbacks fill (:class:`SurfaceJet`, :class:`CurveJet`,
:class:`SurfaceHighJet`) are built from the same dtypes.
"""

from __future__ import annotations

import ctypes
import os
import re
from ctypes import c_char_p, c_double, c_int32, c_size_t, c_uint32, c_uint64, c_void_p

import numpy as np

_HERE = os.path.dirname(os.path.abspath(__file__))
LIBRARY_PATH = os.path.join(_HERE, "libstrake.so")
HEADER_PATH = os.path.join(_HERE, "strake.h")

_SCALARS = {
    "double": np.float64,
    "int32_t": np.int32,
    "uint32_t": np.uint32,
    "uint64_t": np.uint64,
    "size_t": np.uintp,
}
_CTYPES = {
    "double": c_double,
    "int32_t": c_int32,
    "uint32_t": c_uint32,
    "uint64_t": c_uint64,
    "size_t": c_size_t,
    "StrakeStatus": c_uint32,
}


def _strip_comments(text: str) -> str:
    text = re.sub(r"/\*.*?\*/", "", text, flags=re.S)
    return re.sub(r"//[^\n]*", "", text)


def parse_structs(header: str) -> dict:
    """numpy dtypes (aligned as C lays them out) of every `typedef struct Strake... { }` of
    strake.h: fields of double, int32_t, uint32_t, uint64_t, size_t, pointers, fixed arrays and nested
    structs."""
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
                dt = np.dtype(_SCALARS[typ])
            fields.append((field, (dt, int(count))) if count else (field, dt))
        out[name] = np.dtype(fields, align=True)
    return out


def parse_enums(header: str) -> dict:
    """The named constants of every `enum Strake... { NAME = value, ... }` of strake.h:
    {enum name: {constant name: value}} in the header's order."""
    text = _strip_comments(header)
    text = re.sub(r"^\s*#[^\n]*", "", text, flags=re.M)
    out: dict = {}
    for m in re.finditer(r"enum (Strake\w+)\s*(?::\s*\w+\s*)?\{(.*?)\};", text, re.S):
        name, body = m.groups()
        values = {}
        for entry in filter(None, (e.strip() for e in body.split(","))):
            mm = re.fullmatch(r"(STRAKE_\w+)\s*=\s*(\d+)", entry)
            if mm is None:
                raise RuntimeError(f"strake.h: cannot read the constant `{entry}` of {name}")
            values[mm.group(1)] = int(mm.group(2))
        out[name] = values
    return out


def _parse_params(params: str) -> list:
    params = " ".join(params.split())
    if params in ("", "void"):
        return []
    out = []
    for p in params.split(","):
        mm = re.fullmatch(r"(.*?)\s*(\w+)", p.strip())
        if mm is None:
            raise RuntimeError(f"strake.h: cannot read the parameter `{p}`")
        out.append((" ".join(mm.group(1).replace("*", " * ").split()), mm.group(2)))
    return out


def parse_callbacks(header: str) -> dict:
    """The function-pointer typedefs of strake.h: {name: (return type, [(type, name)])}."""
    text = _strip_comments(header)
    return {
        m.group(2): (m.group(1).strip(), _parse_params(m.group(3)))
        for m in re.finditer(r"typedef (\w+) \(\*(Strake\w+)\)\(([^)]*)\);", text)
    }


def parse_functions(header: str) -> dict:
    """The exported functions of strake.h, in the header's order: {name: (return type,
    [(parameter type, parameter name)])}, types with single spaces ("const struct
    StrakeFrame *")."""
    text = _strip_comments(header)
    body = text.split('extern "C" {', 1)[1]
    out = {}
    for m in re.finditer(r"(?:^|\n)([A-Za-z][\w \*]*?)\s*\b(strake_\w+)\(([^)]*)\);", body):
        ret = " ".join(m.group(1).replace("*", " * ").split())
        out[m.group(2)] = (ret, _parse_params(m.group(3)))
    return out


with open(HEADER_PATH, encoding="utf-8") as _f:
    HEADER = _f.read()

STRUCTS = parse_structs(HEADER)
ENUMS = parse_enums(HEADER)
CALLBACKS = parse_callbacks(HEADER)
FUNCTIONS = parse_functions(HEADER)


def _ctype(typ: str):
    if typ in ("const char *", "char *"):
        return c_char_p
    if "*" in typ:
        return c_void_p
    if typ == "void":
        return None
    if typ in _CTYPES:
        return _CTYPES[typ]
    if typ in CALLBACK_TYPES:
        return CALLBACK_TYPES[typ]
    raise RuntimeError(f"strake.h: no ctypes type for `{typ}`")


CALLBACK_TYPES: dict = {}
for _name, (_ret, _params) in CALLBACKS.items():
    CALLBACK_TYPES[_name] = ctypes.CFUNCTYPE(_ctype(_ret), *[_ctype(t) for t, _ in _params])


def _structure(name: str, dtype_name: str) -> type:
    """A ctypes structure of the layout of a header struct of doubles and double arrays."""
    fields = []
    for field in STRUCTS[dtype_name].names:
        sub = STRUCTS[dtype_name].fields[field][0]
        fields.append((field, c_double * sub.shape[0] if sub.shape else c_double))
    cls = type(name, (ctypes.Structure,), {"_fields_": fields})
    assert ctypes.sizeof(cls) == STRUCTS[dtype_name].itemsize, dtype_name
    return cls


SurfaceJet = _structure("SurfaceJet", "StrakeSurfaceJet")
SurfaceHighJet = _structure("SurfaceHighJet", "StrakeSurfaceHighJet")
CurveJet = _structure("CurveJet", "StrakeCurveJet")

SURFACE_FN = CALLBACK_TYPES["StrakeSurfaceFn"]
SURFACE_BATCH_FN = CALLBACK_TYPES["StrakeSurfaceBatchFn"]
SURFACE_HIGH_FN = CALLBACK_TYPES["StrakeSurfaceHighFn"]
CURVE_FN = CALLBACK_TYPES["StrakeCurveFn"]
CURVE_HIGH_FN = CALLBACK_TYPES["StrakeCurveHighFn"]

#: numpy dtype of one frame, field for field the C struct StrakeFrame.
FRAME_DTYPE = STRUCTS["StrakeFrame"]
#: numpy dtype of one sample (StrakeSample): the frame and its arc length.
SAMPLE_DTYPE = STRUCTS["StrakeSample"]
#: numpy dtype of a violation interval (StrakeViolation).
VIOLATION_DTYPE = STRUCTS["StrakeViolation"]

PD = ctypes.POINTER(c_double)
lib = ctypes.CDLL(LIBRARY_PATH)

for _name, (_ret, _params) in FUNCTIONS.items():
    _f = getattr(lib, _name)
    _f.restype = _ctype(_ret)
    _f.argtypes = [_ctype(t) for t, _ in _params]

#: The version of the shipped header (STRAKE_VERSION_STRING); the library must be the same.
HEADER_VERSION = re.search(r'#define STRAKE_VERSION_STRING "([^"]*)"', HEADER).group(1)
if lib.strake_version().decode() != HEADER_VERSION:
    raise ImportError(
        f"strake_darboux: libstrake.so is version {lib.strake_version().decode()} but the "
        f"strake.h beside it is {HEADER_VERSION}: reinstall the package")
