"""A small PEP 517 build backend for strake-darboux.

`pip install ./bindings/python` calls `build_wheel`: it runs `cargo build --release --lib` in
the repository (two directories up), then writes a wheel holding the package `strake_darboux`
and the freshly built shared library inside it (`strake_darboux/libstrake.so`), which the
package loads with ctypes from its own directory. The wheel is tagged for this platform and any
Python 3 (the library is loaded with ctypes: no Python C API, no compiled extension).

Written here rather than taken from a build tool so that installing needs nothing from the
network but numpy: the library is built by the cargo already needed for strake itself.
"""

import base64
import hashlib
import os
import subprocess
import sys
import sysconfig
import zipfile

NAME = "strake_darboux"
DIST = "strake_darboux"
VERSION = "0.1.0"
HERE = os.path.dirname(os.path.abspath(__file__))
REPO = os.path.dirname(os.path.dirname(HERE))


def _library():
    """Builds the release library and returns its path."""
    cargo = os.environ.get("CARGO", "cargo")
    cmd = [cargo, "build", "--release", "--lib", "--manifest-path", os.path.join(REPO, "Cargo.toml")]
    if os.environ.get("CI"):
        cmd.append("--quiet")
    subprocess.run(cmd, check=True, stdout=sys.stderr)
    target = os.environ.get("CARGO_TARGET_DIR", os.path.join(REPO, "target"))
    if not os.path.isabs(target):
        target = os.path.join(REPO, target)
    lib = os.path.join(target, "release", "libstrake.so")
    if not os.path.isfile(lib):
        raise RuntimeError(f"cargo did not produce {lib}")
    return lib


def _tag():
    plat = sysconfig.get_platform().replace("-", "_").replace(".", "_")
    return f"py3-none-{plat}"


def _metadata():
    return (
        "Metadata-Version: 2.1\n"
        f"Name: strake-darboux\nVersion: {VERSION}\n"
        "Summary: Darboux frame, normal/geodesic curvature and geodesic torsion of curves on "
        "freeform surfaces, from numpy\n"
        "Requires-Python: >=3.9\nRequires-Dist: numpy>=1.21\n"
    )


def _record_line(arcname, data):
    digest = base64.urlsafe_b64encode(hashlib.sha256(data).digest()).rstrip(b"=").decode()
    return f"{arcname},sha256={digest},{len(data)}"


def get_requires_for_build_wheel(config_settings=None):
    return []


def prepare_metadata_for_build_wheel(metadata_directory, config_settings=None):
    info = os.path.join(metadata_directory, f"{DIST}-{VERSION}.dist-info")
    os.makedirs(info, exist_ok=True)
    with open(os.path.join(info, "METADATA"), "w") as f:
        f.write(_metadata())
    return os.path.basename(info)


def build_wheel(wheel_directory, config_settings=None, metadata_directory=None):
    lib = _library()
    tag = _tag()
    wheel_name = f"{DIST}-{VERSION}-{tag}.whl"
    files = []
    pkg = os.path.join(HERE, NAME)
    for name in sorted(os.listdir(pkg)):
        path = os.path.join(pkg, name)
        if os.path.isfile(path) and (name.endswith(".py") or name == "py.typed"):
            with open(path, "rb") as f:
                files.append((f"{NAME}/{name}", f.read()))
    with open(lib, "rb") as f:
        files.append((f"{NAME}/libstrake.so", f.read()))
    # The header: the package reads the layouts of the result structs from it.
    with open(os.path.join(REPO, "include", "strake.h"), "rb") as f:
        files.append((f"{NAME}/strake.h", f.read()))
    info = f"{DIST}-{VERSION}.dist-info"
    files.append((f"{info}/METADATA", _metadata().encode()))
    wheel = f"Wheel-Version: 1.0\nGenerator: strake build_backend\nRoot-Is-Purelib: false\nTag: {tag}\n"
    files.append((f"{info}/WHEEL", wheel.encode()))
    record = [_record_line(a, d) for a, d in files] + [f"{info}/RECORD,,"]
    files.append((f"{info}/RECORD", ("\n".join(record) + "\n").encode()))
    os.makedirs(wheel_directory, exist_ok=True)
    out = os.path.join(wheel_directory, wheel_name)
    with zipfile.ZipFile(out, "w", compression=zipfile.ZIP_DEFLATED) as z:
        for arcname, data in files:
            zi = zipfile.ZipInfo(arcname, date_time=(2026, 1, 1, 0, 0, 0))
            zi.external_attr = (0o755 if arcname.endswith(".so") else 0o644) << 16
            zi.compress_type = zipfile.ZIP_DEFLATED
            z.writestr(zi, data)
    return wheel_name


def build_sdist(sdist_directory, config_settings=None):
    raise RuntimeError(
        "strake-darboux is built from a strake checkout (it needs the Rust sources two "
        "directories up): install it with `pip install ./bindings/python`"
    )


