#!/usr/bin/env bash
# bad_inputs.sh - every entry of tests/bad-inputs/catalogue.tsv: the
# expected exit status, a clear message naming the file (and the line
# where the catalogue says so), no crash, no run directory or temporary
# left behind, and no existing file overwritten.
source "$(dirname "$0")/lib.bash"
B="$VG_ROOT/tests/bad-inputs"
F="$VG_FIXTURES"

# A good vector set and good suites to pair with each bad input.
good_vec="$F/vectors/header.txt"
good_pairs="$F/pairs/basic.tsv"

while IFS=$'\t' read -r file reader status fragment need_line; do
    case "$file" in ''|'#'*) continue ;; esac
    out="$TMP/out-$file"
    mkdir -p "$TMP/keep"
    echo "precious" > "$TMP/keep/existing.txt"
    case "$reader" in
    vectors) cmd=("$VG_BIN" score --pairs "$good_pairs" --out "$out" "$B/$file") ;;
    pairs) cmd=("$VG_BIN" score --pairs "$B/$file" --out "$out" "$good_vec") ;;
    analogies) cmd=("$VG_BIN" score --analogies "$B/$file" --out "$out" "$good_vec") ;;
    manifest) cmd=("$VG_BIN" suites --manifest "$B/$file") ;;
    runjson)
        mkdir -p "$TMP/rd-$file"
        cp "$B/$file" "$TMP/rd-$file/run.json"
        cmd=("$VG_BIN" rerun --out "$out" "$TMP/rd-$file")
        file_in_msg="run.json" ;;
    *) not_ok "$file: unknown reader $reader"; continue ;;
    esac
    "${cmd[@]}" > "$TMP/stdout" 2> "$TMP/stderr"
    got=$?
    name_in_msg=${file_in_msg:-$file}
    unset file_in_msg
    problems=()
    [ "$got" -eq "$status" ] || problems+=("exit $got, expected $status")
    [ "$got" -lt 128 ] || problems+=("killed by a signal (crash)")
    grep -qF -- "$fragment" "$TMP/stderr" || problems+=("message lacks '$fragment'")
    grep -qF -- "$name_in_msg" "$TMP/stderr" || problems+=("message does not name $name_in_msg")
    if [ "$need_line" = line ] && ! grep -qE -- "$(printf '%s' "$name_in_msg" | sed 's/[.[\*^$]/\\&/g'):[0-9]+:" "$TMP/stderr"; then
        problems+=("message has no line number")
    fi
    grep -q '^vecgauge' "$TMP/stderr" || problems+=("message not prefixed with the program name")
    [ "$reader" = manifest ] || [ ! -e "$out" ] || problems+=("a run directory was left")
    ls -A "$TMP" | grep -q "^\.out-$file" && problems+=("a temporary directory was left")
    [ "$(cat "$TMP/keep/existing.txt")" = precious ] || problems+=("an existing file was changed")
    if [ ${#problems[@]} -eq 0 ]; then
        ok "$file ($reader): exit $got, '$fragment'"
    else
        not_ok "$file ($reader): ${problems[*]}"
        sed 's/^/# stderr: /' "$TMP/stderr" | head -n 5
    fi
done < "$B/catalogue.tsv"
done_testing
