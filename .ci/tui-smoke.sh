#!/usr/bin/env bash
# Smoke test of the terminal interface on a real terminal (tmux): open the
# built-in example, turn every nozzle further back at once, split the arms
# and join them again, see the speed change, quit, and check the terminal was
# put back (main screen, no mouse capture, cursor shown, cooked mode).
#
# Runs on a private tmux server (its own socket) that it always removes.
# Every wait has a timeout. Needs: tmux, cargo.
set -euo pipefail

cd "$(dirname "${BASH_SOURCE[0]}")/.."

command -v tmux >/dev/null || { echo "tui-smoke: tmux not found, skipped"; exit 0; }

# The test profile: after `cargo test` (as in .ci/run) this binary is already
# built, so the smoke test adds no compile time.
cargo build --quiet --profile test --bin spinwright
bin="${CARGO_TARGET_DIR:-$PWD/target}/debug/spinwright"

sock="spinwright-smoke-$$"
session="smoke"
work="$(mktemp -d)"
t() { tmux -L "$sock" "$@"; }
cleanup() {
    t kill-server >/dev/null 2>&1 || true
    rm -rf "$work"
}
trap cleanup EXIT

fail() {
    echo "tui-smoke: FAIL: $*" >&2
    echo "---- screen ----" >&2
    t capture-pane -p -t "$session" >&2 || true
    exit 1
}

screen() { t capture-pane -p -t "$session"; }

# Wait up to $2 seconds (default 20) for the screen to match the regex $1.
wait_for() {
    local pattern="$1" limit="${2:-20}" i=0
    while (( i < limit * 10 )); do
        if screen | grep -Eq "$pattern"; then return 0; fi
        sleep 0.1
        i=$((i + 1))
    done
    return 1
}

# The operating speed on the top line, e.g. 28.7.
top_rpm() { screen | head -n 1 | grep -Eo '[0-9]+\.[0-9] rpm' | head -n 1 | cut -d' ' -f1; }

flags() { t display -p -t "$session" '#{alternate_on} #{mouse_any_flag} #{cursor_flag}'; }

# A plain shell in a 100×30 terminal, then the interface inside it.
t -f /dev/null new-session -d -s "$session" -x 100 -y 30 -c "$work" \
    "env -i PATH=/usr/bin:/bin HOME=$work TERM=xterm-256color PS1='smoke\$ ' bash --norc --noprofile"
t set-option -t "$session" remain-on-exit on >/dev/null
wait_for 'smoke\$' 10 || fail "shell did not start"
t send-keys -t "$session" "$bin" Enter
wait_for 'Balance.*Throw' 30 || fail "interface did not open"
wait_for 'CU [0-9]' 60 || fail "throw and CU never arrived"

[[ "$(flags)" == "1 1 0" ]] || fail "expected alternate screen, mouse capture, hidden cursor; got $(flags)"

before="$(top_rpm)"
[[ -n "$before" ]] || fail "no rpm on the top line"

# Down to the rotor's deflection (the 12th field; alike arms are edited as
# one block), 5° less on every arm at once.
for _ in $(seq 11); do t send-keys -t "$session" Down; done
wait_for 'all [0-9]+ arms alike' 5 || fail "the arms are not shown together"
wait_for 'jet angle from straight back' 5 || fail "did not reach the deflection field"
for _ in $(seq 5); do t send-keys -t "$session" Left; done
# Split the arms into blocks of their own, and join them again (still alike).
t send-keys -t "$session" a
wait_for 'arms apart' 10 || fail "arms did not split"
t send-keys -t "$session" a
wait_for 'arms together' 10 || fail "arms did not join again"
after="$(top_rpm)"
[[ -n "$after" && "$after" != "$before" ]] || fail "rpm did not change ($before → $after)"
wait_for 'unsaved' 5 || fail "no unsaved marker after an edit"

# Quit: it asks about the unsaved change; y quits without saving.
t send-keys -t "$session" q
wait_for 'unsaved changes' 5 || fail "quit did not ask about unsaved changes"
t send-keys -t "$session" y
wait_for 'smoke\$ *$' 10 || fail "did not return to the shell"

[[ "$(flags)" == "0 0 1" ]] || fail "terminal not restored (alternate mouse cursor = $(flags))"
t send-keys -t "$session" 'stty -a | tr " " "\n" | grep -Ex -- "-?(icanon|echo)" | tr "\n" " "; echo' Enter
wait_for '^icanon echo *$|^echo icanon *$' 10 || fail "terminal left in raw mode"
[[ -z "$(ls -A "$work")" ]] || fail "quitting without saving wrote files: $(ls -A "$work")"

echo "tui-smoke: ok (rpm $before → $after, terminal restored)"
