#!/usr/bin/env bash
# npm start: installs what is missing, then runs the plant supervisor (scripts/run-plant.ts;
# its settings are listed at the top of that file).
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
# --cluster (npm run start:cluster) also needs redis-server.
case " $* " in *" --cluster "*) bash scripts/ensure-deps.sh cluster ;; *) bash scripts/ensure-deps.sh ;; esac
exec node --import tsx scripts/run-plant.ts "$@"
