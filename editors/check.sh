#!/usr/bin/env bash
# Checks of the editor integrations that need no language server and no network
# beyond the npm registry. Prints one PASS/FAIL line per check (after that check's
# own output, indented) and exits non-zero when any check fails.
#
# Needs: node >= 20 + npm, python3 >= 3.11, and the Debian packages
#   neovim emacs-nox elpa-eglot
set -uo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
repo="$(cd "$here/.." && pwd)"
cd "$repo"

passed=0
failed=0
failed_names=()

run_check() {
  local name="$1"; shift
  local log start rc
  log="$(mktemp)"
  start=$SECONDS
  "$@" >"$log" 2>&1
  rc=$?
  awk '{ print "    " $0 }' "$log"
  rm -f "$log"
  if [ "$rc" -eq 0 ]; then
    passed=$((passed + 1))
    echo "PASS $name ($((SECONDS - start))s)"
  else
    failed=$((failed + 1))
    failed_names+=("$name")
    echo "FAIL $name (exit $rc, $((SECONDS - start))s)"
  fi
}

need() {
  command -v "$1" >/dev/null 2>&1 || { echo "missing command: $1 ($2)"; return 127; }
}

helix_check() {
  need python3 "python3 >= 3.11 for tomllib" || return
  python3 "$here/helix/check.py"
}

emacs_check() {
  need emacs "apt-get install emacs-nox elpa-eglot" || return
  timeout 120 emacs --batch -l "$here/emacs/test/check.el"
}

nvim_check() {
  need nvim "apt-get install neovim" || return
  need node "node >= 20 (runs the stand-in language server)" || return
  timeout 60 nvim --headless --clean -n \
    --cmd "set rtp^=$here/neovim" \
    -c "luafile $here/neovim/test/check.lua" -c "cquit 2" </dev/null
}

vscode_check() {
  need node "node >= 20" || return
  need npm "npm" || return
  timeout 600 "$here/vscode/build.sh"
}

run_check "helix: languages.toml parses and has the heat/caloris entries" helix_check
run_check "emacs: caloris-mode byte-compiles, loads, fontifies, registers with eglot" emacs_check
run_check "neovim: ftdetect, ftplugin, syntax groups, LSP client (start_client/attach)" nvim_check
run_check "vscode: build.sh (npm ci, tsc, esbuild, grammar test, vsce package)" vscode_check

echo "editors: $passed passed, $failed failed"
if [ "$failed" -ne 0 ]; then
  printf 'failed: %s\n' "${failed_names[@]}"
  exit 1
fi
