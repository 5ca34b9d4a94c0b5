#!/usr/bin/env bash
# Build the Caloris VS Code extension: install pinned dependencies from
# package-lock.json, type-check and compile (tsc), bundle (esbuild), run the
# grammar test and package a .vsix with @vscode/vsce.
# Needs only node >= 20 and the npm registry.
set -euo pipefail
cd "$(dirname "$0")"

echo "== npm ci"
npm ci --no-audit --no-fund --loglevel=error

echo "== tsc"
npx --no-install tsc -p .

echo "== esbuild bundle"
rm -rf dist
npx --no-install esbuild ./out/extension.js --bundle --platform=node --target=node18 \
  --format=cjs --external:vscode --minify --outfile=dist/extension.js --log-level=warning

echo "== grammar test"
node --test test/

echo "== vsce package"
version=$(node -p "require('./package.json').version")
rm -f ./*.vsix
npx --no-install vsce package --no-dependencies --out "caloris-${version}.vsix"
ls -l "caloris-${version}.vsix"
