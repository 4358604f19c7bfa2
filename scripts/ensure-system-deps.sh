#!/usr/bin/env bash
# Makes sure the Debian packages that the notebook and browser suites drive are installed:
# the real Jupyter clients (nbconvert/nbclient, nbformat, jupyter-client, ipykernel, the
# classic notebook server, the kernel conformance tests), Chromium, NumPy for the bench
# row that compares the engine with the same algebra written in NumPy, Slurm with munge
# for the sweep suite, which starts a single-node Slurm of its own (it starts no daemon here),
# and TeX Live with siunitx (texlive-science) and BibTeX to compile the LaTeX methods exports.
# The suites test against these outside programs on purpose, so they come from the
# distribution, not npm.
#
# Idempotent and silent when everything is present. Installs only what is missing, as root
# or through passwordless sudo; otherwise stops and names the packages to install. Then makes
# the virtual environment with JupyterLab 4 and Notebook 7 (scripts/ensure-python-env.sh).
set -euo pipefail

here="$(cd "$(dirname "$0")" && pwd)"

PACKAGES=(
  jupyter-nbconvert
  python3-nbclient
  python3-nbformat
  python3-jupyter-kernel-test
  jupyter-client
  python3-ipykernel
  jupyter-notebook
  chromium
  python3-numpy
  slurm-wlm
  munge
  texlive-latex-base
  texlive-latex-recommended
  texlive-science
)

if ! command -v dpkg-query >/dev/null 2>&1; then
  echo "ensure-system-deps: this is not a Debian-like system (no dpkg-query)." >&2
  echo "The notebook and browser suites need these Debian 12 packages (or equivalents): ${PACKAGES[*]}" >&2
  exit 1
fi

missing=()
for p in "${PACKAGES[@]}"; do
  # "installed" only: a removed package can leave its config behind and still be listed.
  status="$(dpkg-query -W -f='${db:Status-Status}' "$p" 2>/dev/null || true)"
  [ "$status" = "installed" ] || missing+=("$p")
done
if [ "${#missing[@]}" -eq 0 ]; then
  exec bash "$here/ensure-python-env.sh"
fi

if [ "$(id -u)" -eq 0 ]; then
  as_root=()
elif command -v sudo >/dev/null 2>&1 && sudo -n true >/dev/null 2>&1; then
  as_root=(sudo -n)
else
  echo "ensure-system-deps: missing Debian packages: ${missing[*]}" >&2
  echo "Install them as root, then run the tests again:" >&2
  echo "  apt-get update && apt-get install -y --no-install-recommends ${missing[*]}" >&2
  exit 1
fi

echo "ensure-system-deps: installing ${missing[*]}" >&2
log="$(mktemp)"
trap 'rm -f "$log"' EXIT
start=$SECONDS
# Wait for a concurrent apt run rather than failing on its lock.
apt=(env DEBIAN_FRONTEND=noninteractive apt-get -q -o DPkg::Lock::Timeout=300)
if ! { "${as_root[@]}" "${apt[@]}" update && "${as_root[@]}" "${apt[@]}" install -y --no-install-recommends "${missing[@]}"; } >"$log" 2>&1; then
  tail -n 40 "$log" >&2
  echo "ensure-system-deps: apt-get failed while installing: ${missing[*]}" >&2
  exit 1
fi
echo "ensure-system-deps: done in $((SECONDS - start)) s" >&2
exec bash "$here/ensure-python-env.sh"
