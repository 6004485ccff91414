#!/usr/bin/env bash
# Install test: installs the build into a temporary prefix, then builds and runs a tiny
# C program against it (pkg-config and CMake find_package), and runs a stock lua5.4
# script that requires the installed Lua C module.
# usage: test_install.sh SOURCE_DIR BUILD_DIR
set -euo pipefail
src=$1
build=$2
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
prefix=$tmp/prefix

cmake --install "$build" --prefix "$prefix" >/dev/null

libdir=$(ls -d "$prefix"/lib* | head -1)
test -f "$prefix/include/coldprep/coldprep.h"
test -x "$prefix/bin/coldprep"
ls "$prefix"/share/man/man1/coldprep.1 >/dev/null
ls "$libdir"/libcoldprep.so.* >/dev/null
ls "$libdir"/libcoldprep.a >/dev/null

cat > "$tmp/consumer.c" <<'C'
#include <coldprep/coldprep.h>
#include <stdio.h>
int main(void)
{
    const cp_atom *a;
    cp_error err;
    if (cp_species_atom("40K", &a, &err) != CP_OK) {
        fprintf(stderr, "%s\n", err.message);
        return 1;
    }
    printf("%s %s %.6f\n", cp_version(), a->name, a->mass_u);
    return cp_atom_statistics(a) == CP_FERMION ? 0 : 1;
}
C

# 1. pkg-config
PKG_CONFIG_PATH=$libdir/pkgconfig
export PKG_CONFIG_PATH
cc -o "$tmp/consumer_pc" "$tmp/consumer.c" $(pkg-config --cflags --libs coldprep) \
  -Wl,-rpath,"$libdir"
out=$("$tmp/consumer_pc")
case "$out" in *"40K 39.963998"*) ;; *) echo "pkg-config consumer printed: $out"; exit 1;; esac

# 2. CMake find_package
mkdir -p "$tmp/cm"
cp "$tmp/consumer.c" "$tmp/cm/"
cat > "$tmp/cm/CMakeLists.txt" <<'CM'
cmake_minimum_required(VERSION 3.25)
project(consumer C)
find_package(coldprep REQUIRED)
add_executable(consumer consumer.c)
target_link_libraries(consumer PRIVATE coldprep::coldprep)
CM
cmake -S "$tmp/cm" -B "$tmp/cm/build" -DCMAKE_PREFIX_PATH="$prefix" >/dev/null
cmake --build "$tmp/cm/build" >/dev/null
"$tmp/cm/build/consumer" >/dev/null

# 3. the installed executable and the Lua C module from a stock lua5.4; the modules they
# open on first use (the plot module, the interactive session) are found where installed
"$prefix/bin/coldprep" -e 'assert(cp.species.atom("87Rb").statistics == "boson")'
ls "$libdir"/lua/5.4/coldprep_plot.so "$libdir"/coldprep/coldprep_repl.so >/dev/null
"$prefix/bin/coldprep" -e "cp.plot.bands{quasimomenta = {-1, 0, 1},
  energies_er = {{1, 1}, {0, 4}, {1, 1}}, out = '$tmp/exe.svg'}"
grep -q '<svg' "$tmp/exe.svg"
out=$(echo 'print(6 * 7)' | "$prefix/bin/coldprep")
[ "$out" = 42 ] || { echo "the installed session printed: $out"; exit 1; }
# The search templates of a stock interpreter's default paths (lua5.4 -e 'print(package.path)'),
# rooted at the prefix: '?/init.lua' included, where a Lua file named coldprep/init.lua once
# shadowed the C module and recursed until the C stack overflowed.
PLOT_OUT=$tmp/mod.svg LUA_CPATH="$libdir/lua/5.4/?.so" \
  LUA_PATH="$prefix/share/lua/5.4/?.lua;$prefix/share/lua/5.4/?/init.lua;./?.lua;./?/init.lua" \
  lua5.4 -e 'local cp = require "coldprep"
             assert(cp.species.molecule("KRb").statistics == "fermion")
             assert(type(cp.version) == "string")
             cp.plot.bands{quasimomenta = {-1, 0, 1}, energies_er = {{1, 1}, {0, 4}, {1, 1}},
                           out = os.getenv("PLOT_OUT")}
             print("lua5.4 module ok", cp.version)' >/dev/null
grep -q '<svg' "$tmp/mod.svg"
echo "install test passed"
