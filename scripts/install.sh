#!/bin/sh
# Installs strake into a prefix the way a C library is installed:
#
#   PREFIX/include/strake.h, strake.hpp            the C header and the C++17 wrapper
#   PREFIX/lib/libstrake.so.X.Y.Z                  the shared library (SONAME libstrake.so.X)
#   PREFIX/lib/libstrake.so.X -> libstrake.so.X.Y.Z, libstrake.so -> libstrake.so.X
#   PREFIX/lib/libstrake.a                         the static library
#   PREFIX/lib/pkgconfig/strake.pc                 pkg-config (Libs.private: what the static
#                                                   library needs from the system)
#   PREFIX/lib/cmake/strake/strakeConfig.cmake     find_package(strake): strake::strake
#   PREFIX/lib/cmake/strake/strakeConfigVersion.cmake                    and strake::static
#
# Usage: sh scripts/install.sh PREFIX      (e.g. /usr/local, or $HOME/.local)
# Builds the release library first (cargo build --release --lib; quiet when CI is set).
# Set DESTDIR to stage the files under another root (packaging); the .pc and CMake files
# still name PREFIX. ELF systems (Linux, the BSDs) only.
set -eu

if [ "$#" -ne 1 ] || [ -z "$1" ]; then
    echo "usage: sh scripts/install.sh PREFIX" >&2
    exit 2
fi
case "$1" in
    /*) prefix=$1 ;;
    *) echo "install.sh: PREFIX must be an absolute path, got '$1'" >&2; exit 2 ;;
esac
case "$(uname -s)" in
    Linux|*BSD|DragonFly|SunOS) ;;
    *) echo "install.sh: $(uname -s) is not an ELF system; only ELF shared libraries are handled" >&2; exit 2 ;;
esac

root=$(cd "$(dirname "$0")/.." && pwd)
cargo=${CARGO:-cargo}
quiet=
if [ -n "${CI:-}" ]; then quiet=--quiet; fi
"$cargo" build --release --lib $quiet --manifest-path "$root/Cargo.toml"

target=${CARGO_TARGET_DIR:-$root/target}
case "$target" in /*) ;; *) target=$root/$target ;; esac
built=$target/release

version=$(sed -n 's/^version = "\([^"]*\)"/\1/p' "$root/Cargo.toml" | head -n 1)
major=${version%%.*}
minor=${version#*.}; minor=${minor%%.*}
if [ -z "$version" ] || [ -z "$major" ]; then
    echo "install.sh: cannot read the version from $root/Cargo.toml" >&2
    exit 1
fi
# What the static library needs from the system: the list rustc prints for this target with
# `cargo rustc --lib --crate-type staticlib -- --print native-static-libs` (glibc Linux; the
# tests link a program statically with it).
libs_private="-lgcc_s -lutil -lrt -lpthread -lm -ldl -lc"
cmake_private="gcc_s;util;rt;pthread;m;dl"

stage=${DESTDIR:-}$prefix
inc=$stage/include
lib=$stage/lib
mkdir -p "$inc" "$lib/pkgconfig" "$lib/cmake/strake"

cp "$root/include/strake.h" "$inc/strake.h"
if [ -f "$root/include/strake.hpp" ]; then cp "$root/include/strake.hpp" "$inc/strake.hpp"; fi
chmod 644 "$inc"/strake.h*

real=libstrake.so.$version
rm -f "$lib/$real" "$lib/libstrake.so.$major" "$lib/libstrake.so" "$lib/libstrake.a"
cp "$built/libstrake.so" "$lib/$real"
chmod 755 "$lib/$real"
ln -s "$real" "$lib/libstrake.so.$major"
ln -s "libstrake.so.$major" "$lib/libstrake.so"
cp "$built/libstrake.a" "$lib/libstrake.a"
chmod 644 "$lib/libstrake.a"

cat > "$lib/pkgconfig/strake.pc" <<PC
prefix=$prefix
exec_prefix=\${prefix}
libdir=\${exec_prefix}/lib
includedir=\${prefix}/include

Name: strake
Description: Darboux frame, normal/geodesic curvature and geodesic torsion of curves on freeform surfaces
Version: $version
Libs: -L\${libdir} -lstrake
Libs.private: $libs_private
Cflags: -I\${includedir}
PC

cat > "$lib/cmake/strake/strakeConfig.cmake" <<CMAKE
# strake $version: find_package(strake) gives the imported targets
#   strake::strake   the shared library (libstrake.so.$major), with include/ on its include path
#   strake::static   the static library, with the system libraries it needs
# Written by scripts/install.sh. The install is relocatable: paths are taken from this file's
# place (PREFIX/lib/cmake/strake).
get_filename_component(_strake_prefix "\${CMAKE_CURRENT_LIST_DIR}/../../.." ABSOLUTE)
if(NOT TARGET strake::strake)
  add_library(strake::strake SHARED IMPORTED)
  set_target_properties(strake::strake PROPERTIES
    IMPORTED_LOCATION "\${_strake_prefix}/lib/$real"
    IMPORTED_SONAME "libstrake.so.$major"
    INTERFACE_INCLUDE_DIRECTORIES "\${_strake_prefix}/include")
endif()
if(NOT TARGET strake::static)
  add_library(strake::static STATIC IMPORTED)
  set_target_properties(strake::static PROPERTIES
    IMPORTED_LOCATION "\${_strake_prefix}/lib/libstrake.a"
    IMPORTED_LINK_INTERFACE_LANGUAGES "C"
    INTERFACE_INCLUDE_DIRECTORIES "\${_strake_prefix}/include"
    INTERFACE_LINK_LIBRARIES "$cmake_private")
endif()
set(strake_VERSION "$version")
unset(_strake_prefix)
CMAKE

cat > "$lib/cmake/strake/strakeConfigVersion.cmake" <<CMAKE
# Version $version of strake. A request is met by the same major version (for major 0, the
# same minor: 0.x releases may break the ABI) no older than asked.
set(PACKAGE_VERSION "$version")
set(PACKAGE_VERSION_COMPATIBLE FALSE)
if(PACKAGE_FIND_VERSION_MAJOR EQUAL $major AND NOT PACKAGE_VERSION VERSION_LESS PACKAGE_FIND_VERSION)
  if(NOT $major EQUAL 0 OR PACKAGE_FIND_VERSION_MINOR EQUAL $minor)
    set(PACKAGE_VERSION_COMPATIBLE TRUE)
  endif()
endif()
if(PACKAGE_VERSION VERSION_EQUAL PACKAGE_FIND_VERSION)
  set(PACKAGE_VERSION_EXACT TRUE)
endif()
if(NOT CMAKE_SIZEOF_VOID_P EQUAL 8)
  set(PACKAGE_VERSION "\${PACKAGE_VERSION} (64-bit)")
  set(PACKAGE_VERSION_UNSUITABLE TRUE)
endif()
CMAKE

if [ -z "${CI:-}" ]; then
    echo "installed strake $version into ${DESTDIR:-}$prefix"
fi
