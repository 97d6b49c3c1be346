#!/usr/bin/env bash
# npm start: from a fresh clone to the seeded shop on http://$HOST:$PORT.
# Installs what is missing, starts PostgreSQL, migrates, seeds an empty
# database, builds, serves. Ctrl-C stops everything this script started.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_env
started_at=$(date +%s)

# The Stripe stand-in runs only while STRIPE_API_HOST points the app at one (empty = real Stripe).
STRIPE_FAKE_WANTED=0
[ -n "${STRIPE_API_HOST:-}" ] && STRIPE_FAKE_WANTED=1
stripe_fake_port=()
[ "$STRIPE_FAKE_WANTED" = "1" ] && stripe_fake_port=("$STRIPE_FAKE_PORT")

for taken in "$PORT" "$MAIL_CATCHER_SMTP_PORT" "$MAIL_CATCHER_HTTP_PORT" "$WEATHER_FAKE_PORT" "$CARRIER_FAKE_PORT" "${stripe_fake_port[@]}"; do
	if port_in_use "$taken"; then
		die "Port $taken on 127.0.0.1 is already taken (is Hatchlot running in another terminal?); stop that program or change the port in .env."
	fi
done

ensure_node_modules

STARTED_DB=0
APP_PID=""
FAKE_PIDS=()
cleanup() {
	trap - INT TERM EXIT
	if [ -n "$APP_PID" ] && kill -0 "$APP_PID" 2>/dev/null; then
		say "stopping the app…"
		kill "$APP_PID" 2>/dev/null || true
		wait "$APP_PID" 2>/dev/null || true
	fi
	for pid in "${FAKE_PIDS[@]}"; do
		kill "$pid" 2>/dev/null || true
		wait "$pid" 2>/dev/null || true
	done
	# Stop services only if this run started them; leave what was already running.
	[ "$STARTED_DB" = "1" ] && bash scripts/db.sh stop || true
}
trap cleanup EXIT
trap 'exit 130' INT TERM

if ! bash scripts/db.sh status; then STARTED_DB=1; fi
bash scripts/db.sh start

say "migrating $PG_DATABASE…"
# The scripts import app modules that use the $lib alias; tsx resolves it through the
# tsconfig paths that svelte-kit sync writes (a fresh clone has none yet).
npx svelte-kit sync
npx tsx scripts/migrate.ts latest

say "seeding the demo if the database is empty…"
npx tsx seed/run.ts --if-empty

say "building the production app…"
npx vite build --logLevel warn

# Local stand-ins for hosted services; they live in tests/fakes and never ship in the build.
say "starting the local mail catcher on 127.0.0.1:$MAIL_CATCHER_SMTP_PORT (outbox at /outbox)…"
node_modules/.bin/tsx tests/fakes/mail-catcher.ts &
FAKE_PIDS+=($!)
wait_for_port "$MAIL_CATCHER_HTTP_PORT" "${FAKE_PIDS[-1]}" "the mail catcher"

say "starting the local forecast service on http://127.0.0.1:$WEATHER_FAKE_PORT (the shop asks $WEATHER_API_URL)…"
node_modules/.bin/tsx tests/fakes/weather-fake.ts &
FAKE_PIDS+=($!)
wait_for_port "$WEATHER_FAKE_PORT" "${FAKE_PIDS[-1]}" "the forecast fake"

if [ "$STRIPE_FAKE_WANTED" = "1" ]; then
	say "starting the local Stripe stand-in on http://127.0.0.1:$STRIPE_FAKE_PORT (events to $STRIPE_WEBHOOK_URL)…"
	STRIPE_FAKE_DEMO_DATABASE_URL="$DATABASE_URL" node_modules/.bin/tsx tests/fakes/stripe-fake.ts &
	FAKE_PIDS+=($!)
	wait_for_port "$STRIPE_FAKE_PORT" "${FAKE_PIDS[-1]}" "the Stripe stand-in"
fi

say "starting the local carrier stand-in on http://127.0.0.1:$CARRIER_FAKE_PORT (tracking updates to $TRACKING_WEBHOOK_URL)…"
node_modules/.bin/tsx tests/fakes/carrier-fake.ts &
FAKE_PIDS+=($!)
wait_for_port "$CARRIER_FAKE_PORT" "${FAKE_PIDS[-1]}" "the carrier stand-in"

say "starting the app on http://$HOST:$PORT …"
node build &
APP_PID=$!

wait_for_port "$PORT" "$APP_PID" "the app"

say "ready in $(( $(date +%s) - started_at )) s: http://$HOST:$PORT"
npx tsx scripts/print-demo-accounts.ts
say "press Ctrl-C to stop"
wait "$APP_PID"
