#!/usr/bin/env bash
# headers.sh - the public headers compile cleanly alone as C11 and as C++
# (each header alone, warnings as errors), every function they declare
# has C linkage in C++ (the extern "C" guards: a C++ program taking the
# address of each one links against the library), and vg_version()
# returns the header's version macro, seen from C and from C++.
# Sources: ISO C11 and C++11 (-std, -Wpedantic), the C++ rule that only
# extern "C" declarations link to C symbols (common practice).
source "$(dirname "$0")/lib.bash"
if [ "${VG_SANITIZED:-0}" = 1 ]; then
    # The programs below link against the library; with a sanitizer build
    # they would need its runtime. The headers are the same for both builds.
    skip "headers are checked on the plain build only"
    done_testing; exit 0
fi
CXX=${CXX:-c++}
if ! command -v "$CXX" > /dev/null; then
    skip "no C++ compiler ($CXX; g++ in scripts/deps.list)"; done_testing; exit 0
fi

# headers-1, headers-2: each header alone, as C11 and as C++11/C++17.
for h in include/vecgauge/*.h; do
    printf '#include <vecgauge/%s>\nint main(void) { return 0; }\n' "$(basename "$h")" > "$TMP/h.c"
    if cc -std=c11 -Iinclude -Wall -Wextra -Wpedantic -Werror -fsyntax-only "$TMP/h.c" 2> "$TMP/h.log"; then
        ok "headers-1: $(basename "$h") compiles alone as C11"; else
        not_ok "headers-1: $(basename "$h") alone as C11"; sed 's/^/# /' "$TMP/h.log" | head; fi
    cp "$TMP/h.c" "$TMP/h.cc"
    for std in c++11 c++17; do
        if "$CXX" -std=$std -Iinclude -Wall -Wextra -Wpedantic -Werror -fsyntax-only "$TMP/h.cc" 2> "$TMP/h.log"; then
            ok "headers-2: $(basename "$h") compiles alone as $std"; else
            not_ok "headers-2: $(basename "$h") alone as $std"; sed 's/^/# /' "$TMP/h.log" | head; fi
    done
done

# headers-3: every VG_API function, its address taken in C++, links to
# the library's C symbol. A declaration outside the extern "C" guards
# would be looked up under its mangled C++ name and fail to link.
grep -h '^VG_API' include/vecgauge/*.h | grep -oE '\bvg_[a-z0-9_]+ *\(' | tr -d ' (' | sort -u > "$TMP/fns"
n=$(wc -l < "$TMP/fns")
{
    echo '#include <vecgauge/vecgauge.h>'
    echo '#include <cstdio>'
    echo '#include <cstring>'
    echo 'typedef void (*any_fn)();'
    echo 'static const any_fn fns[] = {'
    sed 's/.*/    reinterpret_cast<any_fn>(\&&),/' "$TMP/fns"
    echo '};'
    echo 'int main() {'
    echo '    for (any_fn f : fns) if (!f) return 2;'
    echo '    std::printf("%s %s %d\n", vg_version(), VG_VERSION_STRING, VG_VERSION_NUMBER);'
    echo '    return std::strcmp(vg_version(), VG_VERSION_STRING) != 0;'
    echo '}'
} > "$TMP/all.cc"
if [ "$n" -ge 50 ] && "$CXX" -std=c++11 -Iinclude -Wall -Wextra -Werror -o "$TMP/all" "$TMP/all.cc" \
    -L"$VG_BUILD" -lvecgauge -Wl,-rpath,"$VG_ROOT/$VG_BUILD" 2> "$TMP/all.log"; then
    ok "headers-3: the $n VG_API functions link from C++ (C linkage)"
else
    not_ok "headers-3: C++ link of the $n VG_API functions"; grep -o 'undefined reference to .*' "$TMP/all.log" | sort -u | head | sed 's/^/# /'
fi

# headers-4: vg_version() equals VG_VERSION_STRING seen from C++, and the
# string is MAJOR.MINOR.PATCH of the header's numeric macros (the C side
# is tests/unit/test_api.c, api-1).
if [ -x "$TMP/all" ] && "$TMP/all" > "$TMP/v.out"; then
    ok "headers-4: vg_version() is VG_VERSION_STRING in C++ ($(cat "$TMP/v.out"))"; else
    not_ok "headers-4: vg_version() differs from the macro in C++"; cat "$TMP/v.out" 2>/dev/null | sed 's/^/# /'; fi
cfg=include/vecgauge/vg_config.h
maj=$(sed -n 's/^#define VG_VERSION_MAJOR \([0-9]*\)$/\1/p' $cfg)
min=$(sed -n 's/^#define VG_VERSION_MINOR \([0-9]*\)$/\1/p' $cfg)
pat=$(sed -n 's/^#define VG_VERSION_PATCH \([0-9]*\)$/\1/p' $cfg)
if [ -n "$maj" ] && grep -qx "$maj.$min.$pat $maj.$min.$pat $((maj * 10000 + min * 100 + pat))" "$TMP/v.out"; then
    ok "headers-4b: version string and number agree with MAJOR.MINOR.PATCH ($maj.$min.$pat)"; else
    not_ok "headers-4b: version macros disagree ($maj.$min.$pat vs $(cat "$TMP/v.out"))"; fi
done_testing
