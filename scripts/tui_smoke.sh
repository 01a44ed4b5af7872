#!/usr/bin/env bash
# Smoke test of the review app in a real terminal (tmux): open a temporary copy of demo_docs, ask one question,
# and check that the expected answer and its page are on screen. Exit 0 on success (or skip), 1 on failure.
#
#   scripts/tui_smoke.sh          the real app with the committed reader (skips when engine.defaults.READER_MODEL_DIR
#                                 is missing)
#   scripts/tui_smoke.sh --fake   the same screens with the test fake reader (checks this script itself)
set -u

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
PY="$ROOT/.venv/bin/python"
[ -x "$PY" ] || PY="$(command -v python3)"
QUESTION="What is the governing law of the land lease?"
MODE="${1:-real}"

if [ "$MODE" = "--fake" ]; then
    EXPECT_ANSWER="governed"  # the fake reader returns a 3-word span after the question words
else
    MODEL_DIR="$(cd "$ROOT" && "$PY" -c 'from engine import defaults; print(defaults.READER_MODEL_DIR)')"
    if [ ! -f "$ROOT/$MODEL_DIR/config.json" ]; then
        echo "tui_smoke: SKIP: no reader model at $MODEL_DIR; nothing was run."
        exit 0
    fi
    EXPECT_ANSWER="Minnesota"  # tests/data/demo_questions.jsonl dq10: "State of Minnesota", land_lease.pdf p. 5
fi
EXPECT_WHERE="land_lease.pdf · p. 5"
if ! command -v tmux >/dev/null 2>&1; then
    echo "tui_smoke: SKIP: tmux is not installed."
    exit 0
fi

WORK="$(mktemp -d "${TMPDIR:-/tmp}/excerptor-smoke-XXXXXX")"
SESSION="excerptor-smoke-$$"
cleanup() {
    tmux kill-session -t "$SESSION" 2>/dev/null
    rm -rf "$WORK"
}
trap cleanup EXIT
cp -r "$ROOT/demo_docs" "$WORK/demo_docs"
rm -rf "$WORK/demo_docs/.excerptor"

if [ "$MODE" = "--fake" ]; then
    LAUNCH="from tests.tui.tui_harness import build_app; build_app('$WORK/demo_docs').run()"
    CMD="cd '$ROOT' && PYTHONPATH='$ROOT' '$PY' -c \"$LAUNCH\""
else
    CMD="cd '$ROOT' && PYTHONPATH='$ROOT' '$PY' -m engine.cli '$WORK/demo_docs'"
fi
tmux new-session -d -s "$SESSION" -x 120 -y 40 "$CMD; echo EXCERPTOR-EXITED; sleep 60"

screen() { tmux capture-pane -p -t "$SESSION" 2>/dev/null; }

# wait_for SECONDS EXTENDED-REGEX: poll the screen until the pattern shows (0) or time runs out (1).
wait_for() {
    local limit=$1 pattern=$2 waited=0
    while [ "$waited" -lt "$limit" ]; do
        if screen | grep -Eq -- "$pattern"; then
            return 0
        fi
        if screen | grep -q "EXCERPTOR-EXITED"; then
            return 1
        fi
        sleep 1
        waited=$((waited + 1))
    done
    return 1
}

fail() {
    echo "tui_smoke: FAIL: $1"
    echo "----- screen -----"
    screen
    exit 1
}

wait_for 60 "Caution" || fail "the app did not start"
wait_for 120 "Indexed: " || fail "indexing did not finish within 120 s"
tmux send-keys -t "$SESSION" -l "$QUESTION"
tmux send-keys -t "$SESSION" Enter
wait_for 120 "Answers to: " || fail "no answers within 120 s"
# The first answer's line: rank 1, then its text (which must hold the expected answer).
wait_for 10 "│ +1 .*$EXPECT_ANSWER" || fail "the first answer does not contain '$EXPECT_ANSWER'"
wait_for 5 "$EXPECT_WHERE" || fail "the answer's page '$EXPECT_WHERE' is not on screen"
tmux send-keys -t "$SESSION" C-q
echo "tui_smoke: OK: '$EXPECT_ANSWER' at $EXPECT_WHERE is on screen."
exit 0
