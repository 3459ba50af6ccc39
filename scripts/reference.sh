#!/usr/bin/env bash
# Independent SciPy reference for the duty-cycle integrator.
# Creates .venv/ (git-ignored) with scipy and numpy only when they are
# missing, runs tests/reference/pressing.py and writes
# target/reference/pressing.json, which crates/engine/tests/cycle_reference.rs reads.
set -euo pipefail
cd "$(dirname "$0")/.."

VENV=.venv
PY="$VENV/bin/python"
if [ ! -x "$PY" ]; then
    echo "reference: creating $VENV"
    python3 -m venv "$VENV"
fi
if ! "$PY" -c "import scipy, numpy" 2>/dev/null; then
    echo "reference: installing scipy and numpy into $VENV"
    "$PY" -m pip install --quiet --disable-pip-version-check scipy numpy
fi
mkdir -p target/reference
"$PY" tests/reference/pressing.py target/reference/pressing.json
