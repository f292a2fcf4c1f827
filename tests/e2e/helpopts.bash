# helpopts.bash - what the tool's own help says, for the tests that keep
# the man page and the shell completion in step with it (sourced, not
# run; tests/run runs only *.sh).
# Part of vecgauge; MIT licence, see LICENSE.
#
# Deliberately simpler than completion/vecgauge.bash's parser, so that
# the completion test does not check that code against itself.

# help_commands: the commands listed under "Commands:" by `vecgauge help`.
help_commands() {
    "$VG_BIN" help | sed -n '/^Commands:/,/^$/p' | awk 'NF > 1 && $1 ~ /^[a-z]/ { print $1 }'
}

# help_options CMD: every short and long option on the option rows
# (indented lines starting with a dash) of `vecgauge CMD --help`, one a
# line, sorted.
help_options() {
    "$VG_BIN" "$1" --help | grep -E '^ {1,8}-' |
        grep -oE '(^|[ ,])--?[A-Za-z0-9][A-Za-z0-9-]*' | sed 's/^[ ,]*//' | sort -u
}

# help_option_row CMD OPTION: the option row of --help naming OPTION.
help_option_row() {
    "$VG_BIN" "$1" --help | grep -E '^ {1,8}-' | grep -E -- "(^|[ ,])$2( |,|\$)"
}
