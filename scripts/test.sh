#!/usr/bin/env bash
# npm test: every suite. Installs the system packages the tests need when they are missing
# (Debian's chromium for browser tests, ngspice as the independent reference for the solver).
set -euo pipefail
cd "$(dirname "$0")/.."

need=()
[ -x /usr/bin/chromium ] || need+=(chromium)
command -v ngspice >/dev/null 2>&1 || need+=(ngspice)
if [ ${#need[@]} -gt 0 ]; then
  echo "npm test: installing missing system packages: ${need[*]}"
  SUDO=""
  [ "$(id -u)" = 0 ] || SUDO="sudo"
  $SUDO apt-get update -qq
  DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq "${need[@]}" >/dev/null
fi

# Types and lint first: a type error in any layer (shared/ without DOM or Node types, server and
# scripts with Node, the client with DOM, tests with both) or a lint error (layer imports,
# hooks) fails the run. See docs/decisions/016-lint-and-layers.md.
if [ $# -eq 0 ]; then
  echo "npm test: typecheck"
  npm run --silent typecheck
  echo "npm test: lint"
  npm run --silent lint
fi

# Unit (core + server units), client components, API integration, then the browser suite.
npx vitest run "$@"
