#!/usr/bin/env bash
# install.sh - `make install` into a temporary DESTDIR installs the tool,
# both libraries, the headers, vecgauge.pc, the man page, the manifest
# and the bash completion; a program built through pkg-config against the
# installed library runs; `make uninstall` removes exactly what was
# installed. Also: the shared library exports only vg_ symbols. (The
# headers as C11 and C++ are checked by headers.sh.)
# Sources: the GNU Coding Standards' DESTDIR convention, pkg-config(1),
# bash-completion's completions directory (common practice).
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
# install-1: each file where it belongs; the data files are the sources'
# own bytes.
version=$(sed -n 's/^#define VG_VERSION_STRING "\(.*\)"/\1/p' include/vecgauge/vg_config.h)
for f in bin/vecgauge lib/libvecgauge.a lib/libvecgauge.so lib/libvecgauge.so.$version \
    lib/libvecgauge.so.${version%%.*} lib/pkgconfig/vecgauge.pc; do
    if [ -e "$stage$prefix/$f" ]; then ok "install-1: installed $f"; else not_ok "install-1: not installed: $f"; fi
done
for h in include/vecgauge/*.h; do
    if cmp -s "$h" "$stage$prefix/$h"; then ok "install-1: installed $h"; else not_ok "install-1: $h not installed as it is"; fi
done
for pair in man/vecgauge.1:share/man/man1/vecgauge.1 \
    benchmarks-manifest/suites.csv:share/vecgauge/suites.csv \
    completion/vecgauge.bash:share/bash-completion/completions/vecgauge; do
    src=${pair%%:*} dst=${pair#*:}
    if cmp -s "$src" "$stage$prefix/$dst"; then ok "install-1: $src installed as $dst"; else
        not_ok "install-1: $src not installed as $dst"; fi
done
check "install-2: the installed binary runs" "$stage$prefix/bin/vecgauge" --version
# install-3: the installed manifest is one the installed tool reads
# (suites --manifest), with the same suites as the built-in one.
"$stage$prefix/bin/vecgauge" suites --csv --data "$TMP/nodata" > "$TMP/builtin.csv" 2>&1
"$stage$prefix/bin/vecgauge" suites --csv --data "$TMP/nodata" \
    --manifest "$stage$prefix/share/vecgauge/suites.csv" > "$TMP/installed.csv" 2>&1
if [ -s "$TMP/builtin.csv" ] && cmp -s "$TMP/builtin.csv" "$TMP/installed.csv"; then
    ok "install-3: the installed manifest reads as the built-in one"; else
    not_ok "install-3: the installed manifest reads differently"; diff "$TMP/builtin.csv" "$TMP/installed.csv" | head | sed 's/^/# /'; fi
# install-4: man finds the installed page by name under the prefix.
if command -v man > /dev/null && command -v groff > /dev/null; then
    if MANPATH="$stage$prefix/share/man" MANWIDTH=80 man vecgauge 2> "$TMP/man.err" | grep -q 'EXIT STATUS'; then
        ok "install-4: man vecgauge shows the installed page"; else
        not_ok "install-4: man vecgauge"; sed 's/^/# /' "$TMP/man.err" | head; fi
else
    skip "install-4: man or groff is not installed"
fi

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
# install-5: uninstall removes every file and link it installed, and
# leaves nothing else behind but (empty) directories.
left=$(find "$stage" -type f -o -type l | sed "s|$stage||")
if [ -z "$left" ]; then ok "install-5: make uninstall removes every installed file"; else
    not_ok "install-5: make uninstall left: $left"; fi

bad=$(nm -D --defined-only "$VG_BUILD/libvecgauge.so" | awk '{print $3}' | grep -v '^vg_' | grep -v '^_' || true)
if [ -z "$bad" ]; then ok "the shared library exports only vg_ symbols"; else not_ok "exported non-vg_ symbols: $bad"; fi
done_testing
