#!/usr/bin/env bash
# Install KaTeX (npm registry) into .cache/katex for the LaTeX export tests.
# Idempotent: does nothing when the pinned version is already there.
set -euo pipefail
root="$(cd "$(dirname "$0")/.." && pwd)"
target="$root/.cache/katex"
version="0.16.22"
if ! command -v npm >/dev/null 2>&1; then
    echo "install_katex.sh: npm is not installed (apt-get install npm)" >&2
    exit 1
fi
installed="$(node -e "try { console.log(require('$target/node_modules/katex/package.json').version) } catch (e) {}" 2>/dev/null || true)"
if [ "$installed" = "$version" ]; then
    exit 0
fi
mkdir -p "$target"
npm install --prefix "$target" --no-audit --no-fund --loglevel=error "katex@$version" >/dev/null
echo "installed katex $version into $target"
