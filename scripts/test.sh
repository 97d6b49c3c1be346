#!/usr/bin/env bash
# npm test: the same bootstrap as npm start, against the test database, then
# svelte-check, lint, Vitest (unit + integration on real PostgreSQL) and
# Playwright in Debian's Chromium. Exits non-zero on the first failure.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_env
started_at=$(date +%s)

# Everything below talks to the test database, never the demo one.
DATABASE_URL="${DATABASE_URL%/*}/$PG_TEST_DATABASE"
export DATABASE_URL
# A fixed day keeps the seeded scenario, and so the tests, the same every run.
export SEED_TODAY="${TEST_SEED_TODAY:-2026-12-01}"

ensure_node_modules
ensure_chromium
ensure_poppler

STARTED_DB=0
cleanup() {
	trap - INT TERM EXIT
	[ "$STARTED_DB" = "1" ] && bash scripts/db.sh stop || true
}
trap cleanup EXIT
trap 'exit 130' INT TERM
if ! bash scripts/db.sh status; then STARTED_DB=1; fi
bash scripts/db.sh start

# Each step says how far into the run it starts, so a slow step shows in the log.
step() { say "── $* ── (at $(( $(date +%s) - started_at )) s)"; }

step "fresh test database: migrate and seed"
if [ "$PG_MANAGED" = "1" ]; then
	PGPASSWORD="$PG_PASSWORD" psql -X -q -v ON_ERROR_STOP=1 -h 127.0.0.1 -p "$PG_PORT" -U "$PG_USER" -d postgres \
		-c "drop database if exists \"$PG_TEST_DATABASE\" with (force)" -c "create database \"$PG_TEST_DATABASE\""
fi
# The scripts import app modules that use the $lib alias; tsx resolves it through the
# tsconfig paths that svelte-kit sync writes (a fresh clone has none yet).
npx svelte-kit sync
npx tsx scripts/migrate.ts latest
npx tsx seed/run.ts

step "svelte-check then the production build, beside lint (prettier + eslint)"
# Lint is one process on one core for about as long as the other two take together, so
# they run side by side. Each lane's output is printed whole once it ends, so nothing
# interleaves, and the first failure is named.
types_log=$(mktemp) lint_log=$(mktemp)
{ npm run --silent check && npx vite build --logLevel warn; } >"$types_log" 2>&1 &
types_pid=$!
npm run --silent lint >"$lint_log" 2>&1 &
lint_pid=$!
types_rc=0 lint_rc=0
wait "$types_pid" || types_rc=$?
wait "$lint_pid" || lint_rc=$?
cat "$types_log" "$lint_log"
rm -f "$types_log" "$lint_log"
[ "$types_rc" = 0 ] || die "svelte-check or the production build failed (see above)"
[ "$lint_rc" = 0 ] || die "lint failed (see above)"

step "vitest (unit and integration)"
npx vitest run

step "playwright (Chromium at 390 px and 1280 px)"
mkdir -p tests/artifacts .data
rm -f .data/e2e-caught.jsonl
npx playwright test -c tests/e2e/playwright.config.ts

say "all tests passed in $(( $(date +%s) - started_at )) s"
