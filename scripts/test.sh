#!/usr/bin/env bash
# npm test [-- vitest args]: installs what is missing, starts a throw-away MariaDB, then runs
# tsc, eslint and vitest (scripts/run-tests.ts).
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
bash scripts/ensure-deps.sh test
exec node --import tsx scripts/run-tests.ts "$@"
