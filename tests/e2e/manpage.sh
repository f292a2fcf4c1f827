#!/usr/bin/env bash
# manpage.sh - man/vecgauge.1 renders without warnings and cannot drift
# from the tool: every option each command's --help prints is a tag of
# that command's section, every tag there is an option of --help, every
# command has a section, and the exit statuses, environment variables and
# version are the ones the code uses.
# Source of every check: the tool's own output and code (common practice
# for man pages: groff_man(7), mandoc -Tlint).
source "$(dirname "$0")/lib.bash"
source "$(dirname "$0")/helpopts.bash"
page="$VG_ROOT/man/vecgauge.1"

# manpage-1: the page renders with every groff warning on (-ww) and none
# is printed; mandoc's linter too when it is installed.
if command -v groff > /dev/null; then
    groff -man -ww -z "$page" > "$TMP/groff.log" 2>&1
    if [ ! -s "$TMP/groff.log" ]; then ok "manpage-1: groff -man -ww renders without warnings"; else
        not_ok "manpage-1: groff warnings"; sed 's/^/# /' "$TMP/groff.log" | head -n 20; fi
    groff -man -Tutf8 -ww -P-cbou "$page" > "$TMP/page.txt" 2> "$TMP/groff2.log"
    if [ ! -s "$TMP/groff2.log" ] && grep -q 'EXIT STATUS' "$TMP/page.txt"; then
        ok "manpage-1b: groff -man -Tutf8 renders the text"; else
        not_ok "manpage-1b: groff -Tutf8"; sed 's/^/# /' "$TMP/groff2.log" | head; fi
else
    skip "manpage-1: groff is not installed (groff-base, scripts/deps.list)"
fi
if command -v mandoc > /dev/null; then
    if mandoc -Tlint -W warning "$page" > "$TMP/mandoc.log" 2>&1; then ok "manpage-1c: mandoc -Tlint is clean"; else
        not_ok "manpage-1c: mandoc -Tlint"; sed 's/^/# /' "$TMP/mandoc.log" | head -n 20; fi
else
    skip "manpage-1c: mandoc is not installed (groff checks the page)"
fi

# The page's source with roff escapes undone: \- is -, fonts dropped.
sed -e 's/\\-/-/g' -e 's/\\f[BIRP]//g' -e 's/\\&//g' "$page" > "$TMP/page.src"

# section_tags CMD: the .TP tag lines of the section .SS "vecgauge CMD".
section_tags() {
    awk -v want=".SS \"vecgauge $1\"" '
        /^\.S[HS]/ { on = ($0 == want); next }
        on && tag { print; tag = 0; next }
        on && /^\.TP/ { tag = 1 }' "$TMP/page.src"
}
# Options in some text: whole words starting with one or two dashes.
options_in() { grep -oE '(^|[ ,])--?[A-Za-z0-9][A-Za-z0-9-]*' | sed 's/^[ ,]*//' | sort -u; }

# manpage-2: the version in .TH is the library's version macro.
want=$(sed -n 's/^#define VG_VERSION_STRING "\(.*\)"/\1/p' include/vecgauge/vg_config.h)
if grep -q "^\.TH VECGAUGE 1 [0-9-]* \"vecgauge $want\"" "$page"; then ok "manpage-2: .TH names version $want"; else
    not_ok "manpage-2: .TH does not name vecgauge $want"; grep '^\.TH' "$page" | sed 's/^/# /'; fi

# manpage-3..: every command listed by `vecgauge help` has a section.
commands=$(help_commands)
if [ "$(echo "$commands" | wc -l)" -ge 9 ]; then ok "manpage-3: vecgauge help lists $(echo $commands | wc -w) commands"; else
    not_ok "manpage-3: vecgauge help lists too few commands: $commands"; fi
for c in $commands; do
    if grep -qx ".SS \"vecgauge $c\"" "$page"; then ok "manpage-4: section for $c"; else
        not_ok "manpage-4: no .SS \"vecgauge $c\" section"; fi
done

# manpage-5: each command's --help options are tags of its section, and
# (manpage-6) each tag option there is an option of its --help: the page
# documents neither less nor more than the tool accepts. `help` has no
# --help of its own; its section is checked by manpage-8.
for c in $commands; do
    [ "$c" = help ] && continue
    help_options "$c" > "$TMP/help.$c"
    section_tags "$c" | options_in > "$TMP/man.$c"
    if [ ! -s "$TMP/help.$c" ]; then not_ok "manpage-5: no option read from vecgauge $c --help"; continue; fi
    missing=$(comm -23 "$TMP/help.$c" "$TMP/man.$c" | tr '\n' ' ')
    extra=$(comm -13 "$TMP/help.$c" "$TMP/man.$c" | tr '\n' ' ')
    if [ -z "$missing" ]; then ok "manpage-5: every option of $c --help ($(wc -l < "$TMP/help.$c")) is in its section"; else
        not_ok "manpage-5: $c options missing from the man page: $missing"; fi
    if [ -z "$extra" ]; then ok "manpage-6: every option of the $c section is in --help"; else
        not_ok "manpage-6: $c section documents options --help does not print: $extra"; fi
done

# manpage-7: the global options printed by `vecgauge --help`, and the
# short forms main.c accepts (-h, -V), are tags of DESCRIPTION.
awk '/^\.SH DESCRIPTION/ { on = 1; next } /^\.S[HS]/ { on = 0 } on && tag { print; tag = 0; next }
     on && /^\.TP/ { tag = 1 }' "$TMP/page.src" | sed 's/"//g' | options_in > "$TMP/man.global"
"$VG_BIN" --help | grep -E '^ +vecgauge --' | options_in > "$TMP/help.global"
printf '%s\n' -h -V --help >> "$TMP/help.global"
missing=$(sort -u "$TMP/help.global" | comm -23 - "$TMP/man.global" | tr '\n' ' ')
if [ -z "$missing" ]; then ok "manpage-7: global options documented"; else not_ok "manpage-7: global options missing: $missing"; fi

# manpage-8: the help section's claim: `vecgauge help CMD` prints what
# `vecgauge CMD --help` prints.
bad=""
for c in $commands; do
    [ "$c" = help ] && continue
    cmp -s <("$VG_BIN" help "$c") <("$VG_BIN" "$c" --help) || bad+=" $c"
done
if [ -z "$bad" ]; then ok "manpage-8: vecgauge help CMD is CMD --help"; else not_ok "manpage-8: differs for$bad"; fi

# manpage-9: EXIT STATUS has a tag for each status of src/cli/cli.h and
# no other.
sed -n 's/^ *VG_EXIT_[A-Z]* = \([0-9]*\).*/\1/p' src/cli/cli.h | sort -u > "$TMP/exit.code"
awk '/^\.SH "EXIT STATUS"/ { on = 1; next } /^\.SH/ { on = 0 } on && tag { print; tag = 0; next }
     on && /^\.TP/ { tag = 1 }' "$TMP/page.src" | sed -n 's/^\.B \([0-9]*\)$/\1/p' | sort -u > "$TMP/exit.man"
if [ -s "$TMP/exit.code" ] && cmp -s "$TMP/exit.code" "$TMP/exit.man"; then
    ok "manpage-9: exit statuses $(tr '\n' ' ' < "$TMP/exit.code")match cli.h"; else
    not_ok "manpage-9: exit statuses: code $(tr '\n' ' ' < "$TMP/exit.code"), page $(tr '\n' ' ' < "$TMP/exit.man")"; fi

# manpage-10: every environment variable the code reads (getenv in src/,
# but the VECGAUGE_TEST_ hooks of the test suite) is in ENVIRONMENT.
awk '/^\.SH ENVIRONMENT/ { on = 1; next } /^\.SH/ { on = 0 } on' "$TMP/page.src" > "$TMP/env.man"
vars=$(grep -rhoE 'getenv\("[A-Z_]+"\)' src | sed 's/getenv("\(.*\)")/\1/' | grep -v '^VECGAUGE_TEST_' | sort -u)
bad=""
for v in $vars; do grep -qw "$v" "$TMP/env.man" || bad+=" $v"; done
if [ -n "$vars" ] && [ -z "$bad" ]; then ok "manpage-10: ENVIRONMENT names$(printf ' %s' $vars)"; else
    not_ok "manpage-10: ENVIRONMENT lacks$bad"; fi
done_testing
