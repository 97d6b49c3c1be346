#!/usr/bin/env bash
# npm run bench: the shop's figures (scripts/bench.ts: catalogue, cart, tail latency, page
# weight, lab web vitals, report timings) against the production build,
# on its own database hatchlot_bench in the project's cluster. Prints ratios; asserts nothing.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_env
ensure_node_modules

STARTED_DB=0
cleanup() {
	trap - INT TERM EXIT
	# Stop PostgreSQL only if this run started it.
	[ "$STARTED_DB" = "1" ] && bash scripts/db.sh stop || true
}
trap cleanup EXIT
trap 'exit 130' INT TERM
if ! bash scripts/db.sh status; then STARTED_DB=1; fi
bash scripts/db.sh start

# The script imports app modules that use the $lib alias; tsx resolves it through the
# tsconfig paths that svelte-kit sync writes (a fresh clone has none yet).
npx svelte-kit sync
npx tsx scripts/bench.ts
