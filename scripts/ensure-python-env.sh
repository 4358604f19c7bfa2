#!/usr/bin/env bash
# Makes the Python virtual environment with the Jupyter front-ends users run (JupyterLab 4,
# Notebook 7, ipywidgets 8, pinned in scripts/python-env/) for the browser suites and for
# building the JupyterLab extension. It lives outside the repository, in the OS temp dir,
# under a name keyed by the pins and the interpreter, so runs with the same pins reuse it and
# `npm ci` does not throw it away.
#
#   bash scripts/ensure-python-env.sh              create it when missing (silent when present)
#   bash scripts/ensure-python-env.sh --print-dir  the same, then print its directory
#
# QUIETFRAME_PYTHON_ENV_ROOT overrides the parent directory; QUIETFRAME_BASE_PYTHON the
# interpreter that makes the environment (default: the python3 first on PATH, which needs
# the venv module and pip).
set -euo pipefail

here="$(cd "$(dirname "$0")" && pwd)"
requirements="$here/python-env/requirements.txt"
constraints="$here/python-env/constraints.txt"
base_python="${QUIETFRAME_BASE_PYTHON:-python3}"

if ! command -v "$base_python" >/dev/null 2>&1; then
  echo "ensure-python-env: no $base_python on PATH; the browser suites need Python 3 with venv and pip" >&2
  exit 1
fi
python_id="$("$base_python" -c 'import sys; print(sys.version.split()[0], sys.executable)')"
key="$(cat "$requirements" "$constraints" <(echo "$python_id") | sha256sum | cut -c1-16)"
root="${QUIETFRAME_PYTHON_ENV_ROOT:-${TMPDIR:-/tmp}}"
dir="$root/quietframe-jupyter-$key"
done_marker="$dir/.quietframe-complete"

if [ ! -f "$done_marker" ]; then
  mkdir -p "$root"
  # One creator at a time (parallel suites or worktrees); the others wait and then reuse it.
  exec 9>"$dir.lock"
  flock 9
  if [ ! -f "$done_marker" ]; then
    start=$SECONDS
    echo "ensure-python-env: creating $dir (JupyterLab, Notebook, ipywidgets from PyPI)" >&2
    rm -rf "$dir"
    log="$(mktemp)"
    # A venv is not relocatable (its scripts name their interpreter), so it is made in place;
    # the marker written last says it is complete.
    if ! { "$base_python" -m venv "$dir" &&
      "$dir/bin/python" -m pip install --disable-pip-version-check --no-input -q -r "$requirements" -c "$constraints"; } >"$log" 2>&1; then
      tail -n 40 "$log" >&2
      rm -f "$log"
      rm -rf "$dir"
      echo "ensure-python-env: could not install the pinned Jupyter front-ends (see above)" >&2
      exit 1
    fi
    rm -f "$log"
    echo "$python_id" >"$done_marker"
    echo "ensure-python-env: done in $((SECONDS - start)) s" >&2
  fi
  flock -u 9
fi

if [ "${1:-}" = "--print-dir" ]; then
  echo "$dir"
fi
