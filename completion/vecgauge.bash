# vecgauge.bash - bash completion for the vecgauge command.
# Part of vecgauge; MIT licence, see LICENSE.
#
# Nothing here lists the commands or their options: the commands come
# from `vecgauge help`, each command's options, their arguments and the
# command's operands from `vecgauge COMMAND --help` (read once per shell
# and program, then cached), and suite ids from `vecgauge suites --csv`.
# So the completion follows the tool it completes, whatever its version.
# Only bash itself is needed (no bash-completion helper functions).
# Install as PREFIX/share/bash-completion/completions/vecgauge, or source it.

declare -gA _vecgauge_cache 2>/dev/null || declare -A _vecgauge_cache

# The program being completed: the command word when it names an
# executable (./build/vecgauge), else vecgauge on PATH.
_vecgauge_prog() {
    local w=${COMP_WORDS[0]}
    [[ $w == "~/"* ]] && w=$HOME/${w#"~/"}
    if [[ $w == */* && -x $w ]]; then printf '%s' "$w"; else printf 'vecgauge'; fi
}

# Read `PROG COMMAND --help` into the cache (once): the options, each
# option's argument name ("" when it takes none) and the operand kinds
# of the usage line.
_vecgauge_learn() {
    local prog=$1 cmd=$2 key="$1"$'\x1f'"$2"
    [[ -n ${_vecgauge_cache[$key]+x} ]] && return 0
    local opts="" operands="" line rest usage=1
    local -a row_opts row_args
    while IFS= read -r line; do
        if ((usage)); then
            usage=0
            # "Usage: vecgauge fetch [OPTION]... ID... | all": the upper-case
            # words after the options name the operands.
            rest=${line#*"$cmd"}
            local w after_opt=0
            for w in $rest; do
                # "--history FILE" in the usage line is an option's argument.
                if [[ $w == -* ]]; then after_opt=1; continue; fi
                ((after_opt)) && { after_opt=0; continue; }
                w=${w//[\[\].]/}
                case $w in
                OPTION | "") ;;
                [A-Z]*) operands+=" $w" ;;
                all) operands+=" all" ;;
                esac
            done
            continue
        fi
        # Option rows are indented a little and start with a dash;
        # descriptions are indented further and never do.
        [[ $line =~ ^\ {1,8}- ]] || continue
        rest=${line#"${line%%[![:space:]]*}"}
        row_opts=() row_args=()
        while [[ $rest =~ ^(--?[A-Za-z0-9][A-Za-z0-9-]*)(\ ([A-Za-z][A-Za-z_]*))? ]]; do
            row_opts+=("${BASH_REMATCH[1]}")
            row_args+=("${BASH_REMATCH[3]}")
            rest=${rest:${#BASH_REMATCH[0]}}
            [[ $rest == ", "* ]] || break
            rest=${rest:2}
        done
        local i
        for ((i = ${#row_opts[@]} - 1; i >= 0; i--)); do
            # "-s, --suite IDS": the short option takes the long one's argument.
            if [[ -z ${row_args[i]} && ${row_opts[i]} != --* ]] && ((i + 1 < ${#row_opts[@]})); then
                row_args[i]=${row_args[i + 1]}
            fi
        done
        for ((i = 0; i < ${#row_opts[@]}; i++)); do
            opts+=" ${row_opts[i]}"
            _vecgauge_cache[$key$'\x1f'${row_opts[i]}]=${row_args[i]}
        done
    done < <("$prog" "$cmd" --help 2>/dev/null)
    _vecgauge_cache[$key]=${opts# }
    _vecgauge_cache[$key$'\x1f:operands']=${operands# }
}

# The commands listed by `PROG help`.
_vecgauge_commands() {
    local prog=$1 key="$1"$'\x1f:commands'
    if [[ -z ${_vecgauge_cache[$key]+x} ]]; then
        _vecgauge_cache[$key]=$("$prog" help 2>/dev/null |
            sed -n '/^Commands:/,/^$/s/^  \([a-z][a-z-]*\) .*/\1/p' | tr '\n' ' ')
    fi
    printf '%s' "${_vecgauge_cache[$key]}"
}

# Suite ids: the first column of `PROG suites --csv` (with the command
# line's --manifest, when given). Not cached: a manifest can change.
_vecgauge_suite_ids() {
    local prog=$1 manifest=$2
    local -a args=(suites --csv)
    [[ -n $manifest ]] && args+=(--manifest "$manifest")
    "$prog" "${args[@]}" 2>/dev/null | sed -n '2,$s/^\([^,"]*\),.*/\1/p' | sort -u | tr '\n' ' '
}

# Complete WORDS (a space-separated list) against cur; a comma-separated
# cur completes its last element.
_vecgauge_list() {
    local words=$1 cur=$2 comma=$3 head=""
    if [[ $comma == 1 && $cur == *,* ]]; then
        head=${cur%,*},
        cur=${cur##*,}
    fi
    local w
    COMPREPLY=()
    for w in $words; do
        # An element already in the list is not offered again.
        [[ ,$head == *",$w,"* ]] && continue
        [[ $w == "$cur"* ]] && COMPREPLY+=("$head$w")
    done
}

_vecgauge_files() { # kind(f|d) cur
    compopt -o filenames 2>/dev/null
    local IFS=$'\n'
    COMPREPLY=($(compgen -"$1" -- "$2"))
}

# The completions of an option's argument named ARG (as --help names it).
_vecgauge_arg() { # prog manifest arg cur
    case $3 in
    FILE) _vecgauge_files f "$4" ;;
    DIR) _vecgauge_files d "$4" ;;
    IDS) _vecgauge_list "$(_vecgauge_suite_ids "$1" "$2")" "$4" 1 ;;
    LAYOUT) _vecgauge_list "text-header text binary npy" "$4" 0 ;;
    LIST) _vecgauge_list "3cosadd 3cosmul pairdir only_b" "$4" 1 ;;
    dir) _vecgauge_list "dir" "$4" 0 ;;
    *) COMPREPLY=() ;; # a number, a level, a label: nothing to offer
    esac
}

_vecgauge() {
    local cword=$COMP_CWORD cur=${COMP_WORDS[COMP_CWORD]} prev="" eq=0
    # COMP_WORDBREAKS splits "--suite=ws" into "--suite" "=" "ws".
    if [[ $cur == "=" ]]; then
        cur="" eq=1 prev=${COMP_WORDS[cword - 1]}
    elif ((cword >= 2)) && [[ ${COMP_WORDS[cword - 1]} == "=" ]]; then
        eq=1 prev=${COMP_WORDS[cword - 2]}
    elif ((cword >= 1)); then
        prev=${COMP_WORDS[cword - 1]}
    fi
    local prog cmd="" i manifest=""
    prog=$(_vecgauge_prog)
    for ((i = 1; i < cword; i++)); do
        if [[ -z $cmd && ${COMP_WORDS[i]} != -* ]]; then cmd=${COMP_WORDS[i]}; fi
        if [[ ${COMP_WORDS[i]} == --manifest || ${COMP_WORDS[i]} == -m ]] && ((i + 1 < cword)); then
            manifest=${COMP_WORDS[i + 1]}
            [[ $manifest == "=" ]] && ((i + 2 < cword)) && manifest=${COMP_WORDS[i + 2]}
        fi
    done
    if [[ -z $cmd ]]; then
        if [[ $cur == -* ]]; then
            _vecgauge_list "--help --version -h -V" "$cur" 0
        else
            _vecgauge_list "$(_vecgauge_commands "$prog")" "$cur" 0
        fi
        return 0
    fi
    if [[ $cmd == help ]]; then
        _vecgauge_list "$(_vecgauge_commands "$prog")" "$cur" 0
        return 0
    fi
    _vecgauge_learn "$prog" "$cmd"
    local key="$prog"$'\x1f'"$cmd"
    # The argument of the option before the cursor.
    if [[ $prev == -* && -n ${_vecgauge_cache[$key$'\x1f'$prev]+x} ]]; then
        local arg=${_vecgauge_cache[$key$'\x1f'$prev]}
        if [[ -n $arg ]]; then
            _vecgauge_arg "$prog" "$manifest" "$arg" "$cur"
            return 0
        fi
    fi
    if [[ $cur == -* ]]; then
        _vecgauge_list "${_vecgauge_cache[$key]}" "$cur" 0
        return 0
    fi
    # An operand, by the name the usage line gives it.
    local kinds=${_vecgauge_cache[$key$'\x1f:operands']} words=""
    case " $kinds " in
    *" ID "*) words=$(_vecgauge_suite_ids "$prog" "$manifest") ;;
    esac
    case " $kinds " in
    *" all "*) words+=" all" ;;
    esac
    if [[ -n $words ]]; then
        _vecgauge_list "$words" "$cur" 0
    elif [[ " $kinds " == *" RUN_DIR "* ]]; then
        _vecgauge_files d "$cur"
    else
        # FILE, VECTORS (PATH or LABEL=PATH; after "=" cur is the path).
        _vecgauge_files f "$cur"
    fi
    return 0
}

complete -F _vecgauge vecgauge
