#!/usr/bin/env bash
# Makes sure everything `npm start` / `npm test` need is on this machine (Debian 12, Node 20).
#   scripts/ensure-deps.sh          MariaDB server + client (Debian packages), npm packages
#   scripts/ensure-deps.sh test     the same, plus Debian's chromium for the browser tests
#                                   (skipped when FERRISIGHT_BROWSER_TESTS=0); plus redis-server
#                                   when the scale tests run (CI=true or FERRISIGHT_SCALE=1), and
#                                   Debian's mosquitto for the external-broker tests and bench:scale
#                                   (CI=true, FERRISIGHT_SCALE=1 or FERRISIGHT_MOSQUITTO=1)
#   scripts/ensure-deps.sh cluster  the same as start, plus Debian's redis-server (npm run start:cluster)
# Installs only what is missing; prints one line per step it takes.
set -euo pipefail

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$ROOT"
MODE="${1:-start}"

have() {
  command -v "$1" >/dev/null 2>&1 || [ -x "/usr/sbin/$1" ] || [ -x "/usr/bin/$1" ]
}

# ---- Debian packages -------------------------------------------------------------------
pkgs=()
if ! have mariadbd || ! have mariadb-install-db || ! have mariadb; then
  pkgs+=(mariadb-server-core mariadb-client-core)
fi
if [ "$MODE" = "test" ] && [ "${FERRISIGHT_BROWSER_TESTS:-1}" != "0" ] && [ ! -x /usr/bin/chromium ]; then
  pkgs+=(chromium)
fi
# Redis carries socket.io between API nodes (README "Scaling out"): only the cluster paths need it.
if { [ "$MODE" = "cluster" ] || { [ "$MODE" = "test" ] && { [ "${CI:-}" = "true" ] || [ "${FERRISIGHT_SCALE:-0}" = "1" ]; }; }; } && ! have redis-server; then
  pkgs+=(redis-server)
fi
# mosquitto 2 stands in for a site's own broker (README "Scaling out"): only those tests use it.
if [ "$MODE" = "test" ] && { [ "${CI:-}" = "true" ] || [ "${FERRISIGHT_SCALE:-0}" = "1" ] || [ "${FERRISIGHT_MOSQUITTO:-0}" = "1" ]; } \
    && { ! have mosquitto || ! have mosquitto_passwd; }; then
  pkgs+=(mosquitto)
fi
if [ "${#pkgs[@]}" -gt 0 ]; then
  if [ "$(id -u)" != "0" ]; then
    echo "Missing system packages: run as root: apt-get update && apt-get install -y --no-install-recommends ${pkgs[*]}" >&2
    exit 1
  fi
  echo "Installing ${pkgs[*]} (apt-get)…"
  log="$(mktemp)"
  if ! { apt-get -o DPkg::Lock::Timeout=300 update -qq \
      && DEBIAN_FRONTEND=noninteractive apt-get -o DPkg::Lock::Timeout=300 install -y -qq --no-install-recommends "${pkgs[@]}"; } >"$log" 2>&1; then
    tail -n 20 "$log" >&2
    rm -f "$log"
    echo "apt-get failed installing ${pkgs[*]}" >&2
    exit 1
  fi
  rm -f "$log"
fi

# ---- npm packages ----------------------------------------------------------------------
HASH_FILE="node_modules/.ferrisight-lock-hash"
want="$(sha256sum package-lock.json | cut -d' ' -f1)"
have_hash="$(cat "$HASH_FILE" 2>/dev/null || true)"
if [ "$want" != "$have_hash" ]; then
  # node_modules installed by someone else (no hash yet): adopt it when npm's own record of
  # what is installed matches the lock file, instead of reinstalling everything.
  if [ -z "$have_hash" ] && [ -f node_modules/.package-lock.json ] && node -e '
      const fs = require("fs");
      const lock = JSON.parse(fs.readFileSync("package-lock.json", "utf8")).packages || {};
      const inst = JSON.parse(fs.readFileSync("node_modules/.package-lock.json", "utf8")).packages || {};
      for (const [k, v] of Object.entries(lock)) {
        if (k === "") continue;
        const i = inst[k];
        if (!i) { if (v.optional || v.peer) continue; process.exit(1); }
        if (i.version !== v.version) process.exit(1);
        if (!fs.existsSync(k)) process.exit(1);
      }
      for (const k of Object.keys(inst)) if (!(k in lock)) process.exit(1);
    ' 2>/dev/null; then
    echo "$want" >"$HASH_FILE"
  else
    echo "Installing npm packages (npm ci)…"
    log="$(mktemp)"
    # --ignore-scripts: every dependency ships what it needs prebuilt (esbuild's platform
    # package, classic-level's prebuilds); their install scripts only re-check that and can
    # fail half-way through npm ci, after node_modules has been removed.
    if ! npm ci --ignore-scripts --no-audit --no-fund --loglevel=error >"$log" 2>&1; then
      tail -n 30 "$log" >&2
      rm -f "$log"
      echo "npm ci failed" >&2
      exit 1
    fi
    rm -f "$log"
    echo "$want" >"$HASH_FILE"
  fi
fi
