#!/usr/bin/env bash
# npm run dev: like npm start, but serves the web app from the vite dev server
# (http://127.0.0.1:${WEB_DEV_PORT:-5173}, proxying /api and /socket.io to the API) instead of building it.
set -euo pipefail
cd "$(dirname "${BASH_SOURCE[0]}")/.."
bash scripts/ensure-deps.sh
exec node --import tsx scripts/run-plant.ts --dev "$@"
