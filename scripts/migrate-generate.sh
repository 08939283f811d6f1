#!/usr/bin/env bash
# Generate a migration under a lock, so two people (or helpers) working in one tree never
# write drizzle/ at the same time. Usage: scripts/migrate-generate.sh NAME
set -euo pipefail
cd "$(dirname "$0")/.."
exec flock /tmp/rollbead-drizzle.lock npx drizzle-kit generate --name "${1:?migration name}"
