#!/usr/bin/env bash
# completion.sh - completion/vecgauge.bash, sourced in bash and called as
# bash calls it (COMP_WORDS, COMP_CWORD set, COMPREPLY read back): it
# offers the commands of `vecgauge help`, every option of each command's
# --help, suite ids from the manifest, files and directories where the
# help names them. No bash-completion helper is needed or used.
# Source of every check: the tool's own --help and `suites --csv`, the
# manifest read with Python's csv module (/usr/bin/python3), and bash's
# documented programmable completion interface (common practice).
source "$(dirname "$0")/lib.bash"
source "$(dirname "$0")/helpopts.bash"

# shellcheck source=/dev/null
source "$VG_ROOT/completion/vecgauge.bash"

# complete_words WORD...: the completion of the last word (the cursor at
# its end), one candidate a line, sorted.
complete_words() {
    COMP_WORDS=("$VG_BIN" "$@")
    COMP_CWORD=$#
    COMP_LINE="${COMP_WORDS[*]}"
    COMP_POINT=${#COMP_LINE}
    COMPREPLY=()
    _vecgauge
    printf '%s\n' "${COMPREPLY[@]}" | sed '/^$/d' | sort -u
}
# same NAME WANT_FILE GOT_FILE: ok when both hold the same lines.
same() {
    if cmp -s "$2" "$3"; then ok "$1"; else
        not_ok "$1"; diff "$2" "$3" | sed 's/^/# /' | head -n 20; fi
}

# completion-1: registered for the command name.
if complete -p vecgauge 2> /dev/null | grep -q -- '-F _vecgauge'; then ok "completion-1: complete -F _vecgauge vecgauge"; else
    not_ok "completion-1: not registered"; fi

# completion-2: the first word completes to the commands of `vecgauge help`.
help_commands | sort -u > "$TMP/want"
complete_words "" > "$TMP/got"
same "completion-2: commands ($(wc -l < "$TMP/want"))" "$TMP/want" "$TMP/got"
complete_words "co" > "$TMP/got"
printf 'compare\n' > "$TMP/want"
same "completion-2b: 'co' completes to compare" "$TMP/want" "$TMP/got"
complete_words "help" "me" > "$TMP/got"
printf 'merge\n' > "$TMP/want"
same "completion-2c: help takes a command" "$TMP/want" "$TMP/got"

# completion-3: after a command, '-' offers exactly the options its
# --help prints, short and long.
for c in $(help_commands); do
    [ "$c" = help ] && continue
    help_options "$c" > "$TMP/want"
    complete_words "$c" "-" > "$TMP/got"
    same "completion-3: $c offers its $(wc -l < "$TMP/want") options" "$TMP/want" "$TMP/got"
done
complete_words score --no- > "$TMP/got"
printf '%s\n' --no-common --no-hash --no-progress > "$TMP/want"
same "completion-3b: a prefix narrows the options" "$TMP/want" "$TMP/got"

# completion-4: --suite offers the suite ids of `vecgauge suites --csv`,
# which are the ids of benchmarks-manifest/suites.csv (read with csv).
/usr/bin/python3 -c '
import csv, sys
print("\n".join(sorted({r["id"] for r in csv.DictReader(open(sys.argv[1]))})))' \
    benchmarks-manifest/suites.csv | LC_ALL=C sort -u > "$TMP/ids"
complete_words score --suite "" | LC_ALL=C sort -u > "$TMP/got"
if [ "$(wc -l < "$TMP/ids")" -ge 10 ]; then same "completion-4: --suite offers the $(wc -l < "$TMP/ids") manifest ids" "$TMP/ids" "$TMP/got"
else not_ok "completion-4: too few ids read from the manifest"; fi
complete_words score -s "ws353" > "$TMP/got"
grep '^ws353' "$TMP/ids" > "$TMP/want"
same "completion-4b: -s takes the same ids, narrowed by a prefix" "$TMP/want" "$TMP/got"
complete_words score --suite "ws353,simlex" > "$TMP/got"
printf 'ws353,simlex999\n' > "$TMP/want"
same "completion-4c: a comma-separated list completes its last id" "$TMP/want" "$TMP/got"
complete_words score --suite = "simv" > "$TMP/got"
printf 'simverb3500\n' > "$TMP/want"
same "completion-4d: --suite=ID (bash splits at '=')" "$TMP/want" "$TMP/got"
# A manifest given on the command line is the one read.
printf 'id,variant,task,title,files\nzz-only,official,similarity,A test suite,zz.tsv\n' > "$TMP/manifest.csv"
complete_words score --manifest "$TMP/manifest.csv" --suite "" > "$TMP/got"
printf 'zz-only\n' > "$TMP/want"
same "completion-4e: --manifest FILE changes the ids offered" "$TMP/want" "$TMP/got"
complete_words fetch "" > "$TMP/got"
{ cat "$TMP/ids"; echo all; } | sort -u > "$TMP/want"
sort -u "$TMP/got" > "$TMP/got2"
same "completion-4f: fetch offers the ids and 'all'" "$TMP/want" "$TMP/got2"
complete_words suites "bat" > "$TMP/got"
printf 'bats3\n' > "$TMP/want"
same "completion-4g: suites takes ids" "$TMP/want" "$TMP/got"

# completion-5: files where --help says FILE or the operand is a file;
# directories where it says DIR or RUN_DIR.
mkdir -p "$TMP/f/run-a" "$TMP/f/run-b"
: > "$TMP/f/run-c.txt"
: > "$TMP/f/pairs.tsv"
complete_words score --pairs "$TMP/f/pa" > "$TMP/got"
printf '%s\n' "$TMP/f/pairs.tsv" > "$TMP/want"
same "completion-5: --pairs FILE completes file names" "$TMP/want" "$TMP/got"
complete_words compare "$TMP/f/run" > "$TMP/got"
printf '%s\n' "$TMP/f/run-a" "$TMP/f/run-b" > "$TMP/want"
same "completion-5b: compare's RUN_DIR operands are directories only" "$TMP/want" "$TMP/got"
complete_words score -o "$TMP/f/run" > "$TMP/got"
same "completion-5c: --out DIR completes directories" "$TMP/want" "$TMP/got"
complete_words score base = "$TMP/f/run-c" > "$TMP/got"
printf '%s\n' "$TMP/f/run-c.txt" > "$TMP/want"
same "completion-5d: LABEL=PATH completes the path" "$TMP/want" "$TMP/got"
complete_words track --history "$TMP/f/run-c" > "$TMP/got"
same "completion-5e: track --history FILE" "$TMP/want" "$TMP/got"
complete_words track --history h.csv "$TMP/f/run" > "$TMP/got"
printf '%s\n' "$TMP/f/run-a" "$TMP/f/run-b" > "$TMP/want"
same "completion-5f: track's operand after --history FILE is a run directory" "$TMP/want" "$TMP/got"

# completion-6: fixed value lists, each value named by the option's
# own --help row (so a value the tool drops fails here).
complete_words inspect --format "" > "$TMP/got"
printf '%s\n' binary npy text text-header > "$TMP/want"
same "completion-6: --format offers the four layouts" "$TMP/want" "$TMP/got"
row=$(help_option_row inspect --format)
bad=""; for v in $(cat "$TMP/got"); do [[ $row == *"$v"* ]] || bad+=" $v"; done
if [ -z "$bad" ]; then ok "completion-6b: every layout offered is named by --format's help"; else
    not_ok "completion-6b: not in the help row:$bad ($row)"; fi
complete_words compare --methods "3cosadd," > "$TMP/got"
printf '%s\n' 3cosadd,3cosmul 3cosadd,only_b 3cosadd,pairdir > "$TMP/want"
same "completion-6c: --methods completes a list, without repeating a method" "$TMP/want" "$TMP/got"
help_row=$("$VG_BIN" compare --help | sed -n '/--methods/,/default 3cosadd/p')
bad=""; for v in 3cosadd 3cosmul pairdir only_b; do [[ $help_row == *"$v"* ]] || bad+=" $v"; done
if [ -z "$bad" ]; then ok "completion-6d: every method offered is named by --methods' help"; else
    not_ok "completion-6d: not in compare --help:$bad"; fi
complete_words merge --label-from "" > "$TMP/got"
printf 'dir\n' > "$TMP/want"
same "completion-6e: --label-from offers its one value" "$TMP/want" "$TMP/got"
complete_words score --seed "" > "$TMP/got"
if [ ! -s "$TMP/got" ]; then ok "completion-6f: nothing is offered for a number"; else
    not_ok "completion-6f: offered for --seed: $(tr '\n' ' ' < "$TMP/got")"; fi

# completion-7: before a command, '-' offers the global options.
complete_words "-" > "$TMP/got"
printf '%s\n' --help --version -V -h | sort -u > "$TMP/want"
same "completion-7: global options" "$TMP/want" "$TMP/got"
done_testing
