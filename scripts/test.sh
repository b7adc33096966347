#!/usr/bin/env bash
# Every test: type check, lint (ESLint errors fail), formatting (Prettier), migrations in step with the schema, unit + integration (vitest), the DB suite again on
# PostgreSQL when TEST_DATABASE_URL is set, then the browser tests (Playwright on Debian's chromium) against a production build.
set -euo pipefail
cd "$(dirname "$0")/.."

apt_install() {
  if [ "$(id -u)" = "0" ]; then
    apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
  else
    sudo apt-get update -qq && sudo DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
  fi
}

if [ ! -x /usr/bin/chromium ]; then
  echo "test: installing Debian's chromium for the browser tests…"
  apt_install chromium
fi
# One Python for every numpy/scipy oracle: resolved here by scripts/python.ts and exported, so the tests use it too.
if ! SLIPFIELD_PYTHON=$(npx tsx scripts/python.ts numpy scipy 2>/dev/null); then
  echo "test: installing Debian's python3-scipy (the numpy/scipy oracles)…"
  apt_install python3-scipy
  SLIPFIELD_PYTHON=$(npx tsx scripts/python.ts numpy scipy)
fi
export SLIPFIELD_PYTHON
echo "test: Python oracles run with $SLIPFIELD_PYTHON"

echo "== type check"
npx tsc --noEmit

echo "== lint (ESLint: errors fail, warnings are printed)"
npm run --silent lint

echo "== formatting (Prettier; 'npm run format' rewrites)"
npm run --silent format:check

echo "== migrations match the schema"
before=$(cat drizzle/*.sql drizzle/meta/*.json | sha256sum)
npx drizzle-kit generate --name check >/dev/null
after=$(cat drizzle/*.sql drizzle/meta/*.json | sha256sum)
if [ "$before" != "$after" ]; then
  echo "db/schema.ts changed without a migration: run 'npm run db:generate' and commit drizzle/." >&2
  exit 1
fi

echo "== unit and integration tests (vitest, PGlite in memory)"
npx vitest run

if [ -n "${TEST_DATABASE_URL:-}" ]; then
  echo "== database tests against PostgreSQL ($TEST_DATABASE_URL)"
  npx vitest run tests/app tests/collab tests/lib/stress tests/lib/views tests/hardening --no-file-parallelism
fi

echo "== browser tests (Playwright, Debian chromium)"
NEXT_TELEMETRY_DISABLED=1 npm run build >/tmp/slipfield-build.log 2>&1 || { tail -50 /tmp/slipfield-build.log; exit 1; }
echo "== real-process hardening tests (kill, restart, backup, start-up failures, security over HTTP; with TEST_DATABASE_URL also two web processes and two job workers on PostgreSQL)"
npm run test:process
npx playwright test
