#!/usr/bin/env bash
# install.sh - `make install` into a temporary DESTDIR installs the tool,
# both libraries, the headers and vecgauge.pc; a program built through
# pkg-config against the installed library runs; `make uninstall` removes
# exactly what was installed. Also: the public headers compile alone as
# C11 and as C++ (extern "C" guards), and export only vg_ symbols.
source "$(dirname "$0")/lib.bash"
if [ "${VG_SANITIZED:-0}" = 1 ]; then
    # Programs linked against a sanitizer-built library need the sanitizer
    # runtime; packaging is a property of the plain build.
    skip "packaging is checked on the plain build only"
    done_testing; exit 0
fi

stage="$TMP/stage"
prefix=/usr/local
if make --no-print-directory -s BUILD="$VG_BUILD" PREFIX="$prefix" DESTDIR="$stage" install > "$TMP/install.log" 2>&1; then
    ok "make install into a DESTDIR"
else
    not_ok "make install failed"; sed 's/^/# /' "$TMP/install.log" | tail -n 20
fi
for f in bin/vecgauge lib/libvecgauge.a lib/libvecgauge.so lib/pkgconfig/vecgauge.pc include/vecgauge/vecgauge.h; do
    if [ -e "$stage$prefix/$f" ]; then ok "installed $f"; else not_ok "not installed: $f"; fi
done
check "the installed binary runs" "$stage$prefix/bin/vecgauge" --version

export PKG_CONFIG_PATH="$stage$prefix/lib/pkgconfig" PKG_CONFIG_SYSROOT_DIR="$stage"
# Shared: pkg-config --cflags --libs; static: --static adds the private
# dependencies. Both must build and run the in-process example.
if cc -o "$TMP/ex-shared" scripts/inprocess_example.c $(pkg-config --cflags --libs vecgauge) 2> "$TMP/cc.log"; then
    ok "in-process example builds against the installed shared library via pkg-config"
    LD_LIBRARY_PATH="$stage$prefix/lib" "$TMP/ex-shared" "$VG_FIXTURES/pairs/basic.tsv" > "$TMP/ex.out" 2>&1
    expect_in "and runs (scores printed)" "spearman" "$TMP/ex.out"
else
    not_ok "building against the installed library failed"; sed 's/^/# /' "$TMP/cc.log" | head
fi
# Static: libvecgauge.a, then the shared libraries it needs as
# vecgauge.pc names them (Requires.private and libs_private_own); a full
# `pkg-config --static` would ask for every dependency's own static
# libraries too, which Debian does not ship for all of them.
if cc -o "$TMP/ex-static" scripts/inprocess_example.c $(pkg-config --cflags vecgauge) \
    "$stage$prefix/lib/libvecgauge.a" $(pkg-config --libs $(pkg-config --print-requires-private vecgauge)) \
    $(pkg-config --variable=libs_private_own vecgauge) 2> "$TMP/cc2.log"; then
    ok "in-process example links statically with the libraries vecgauge.pc names"
    "$TMP/ex-static" "$VG_FIXTURES/pairs/basic.tsv" > "$TMP/ex2.out" 2>&1
    check "the static and shared builds print the same scores" cmp "$TMP/ex.out" "$TMP/ex2.out"
else
    not_ok "static link failed"; sed 's/^/# /' "$TMP/cc2.log" | head
fi
unset PKG_CONFIG_PATH PKG_CONFIG_SYSROOT_DIR

make --no-print-directory -s BUILD="$VG_BUILD" PREFIX="$prefix" DESTDIR="$stage" uninstall > /dev/null 2>&1
left=$(find "$stage" -type f -o -type l | sed "s|$stage||")
if [ -z "$left" ]; then ok "make uninstall removes every installed file"; else
    not_ok "make uninstall left: $left"; fi

# Headers: each alone as C11 with -pedantic, and all as C++.
for h in include/vecgauge/*.h; do
    printf '#include "%s"\nint main(void) { return 0; }\n' "$VG_ROOT/$h" > "$TMP/h.c"
    if cc -std=c11 -Wall -Wextra -Wpedantic -Werror -fsyntax-only "$TMP/h.c" 2> "$TMP/h.log"; then
        ok "$(basename "$h") compiles alone as C11"; else not_ok "$(basename "$h") alone as C11"; sed 's/^/# /' "$TMP/h.log" | head; fi
done
printf '#include "%s"\nint main() { return vg_version() == nullptr; }\n' "$VG_ROOT/include/vecgauge/vecgauge.h" > "$TMP/h.cc"
if c++ -std=c++11 -Wall -Wextra -Werror -o "$TMP/hpp" "$TMP/h.cc" "$VG_BUILD/libvecgauge.a" $(pkg-config --libs openblas zlib libcrypto jansson libcurl libarchive cairo) -lgsl -lcsv -lunistring -lm -pthread 2> "$TMP/hpp.log"; then
    ok "vecgauge.h compiles and links as C++ (extern \"C\" guards)"
else
    not_ok "vecgauge.h as C++"; sed 's/^/# /' "$TMP/hpp.log" | head
fi
bad=$(nm -D --defined-only "$VG_BUILD/libvecgauge.so" | awk '{print $3}' | grep -v '^vg_' | grep -v '^_' || true)
if [ -z "$bad" ]; then ok "the shared library exports only vg_ symbols"; else not_ok "exported non-vg_ symbols: $bad"; fi
done_testing
