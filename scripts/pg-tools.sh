# shellcheck shell=bash
# Shared by backup.sh and restore.sh: which PostgreSQL server to reach, as whom, and
# with which client programs. Sourced after lib.sh's load_env, so DATABASE_URL is set:
# built from PG_* in .env for the local cluster, or a hosted server's own URL.

# Where backups go unless BACKUP_DIR says otherwise (git-ignored with the rest of .data/).
BACKUP_DIR="${BACKUP_DIR:-$ROOT/.data/backups}"

# The newest PostgreSQL client programs Debian installed (db.sh runs the server of that
# version); pg_dump must be at least as new as the server it reads.
pg_tool() {
	local dir
	dir="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)"
	if [ -n "$dir" ] && [ -x "$dir/$1" ]; then
		echo "$dir/$1"
	elif command -v "$1" >/dev/null 2>&1; then
		command -v "$1"
	else
		die "$1 is missing: install Debian's postgresql-client package (or run 'npm run db:up', which installs PostgreSQL)."
	fi
}

# libpq's own variables, from DATABASE_URL: the password never appears on a command line,
# where other users could read it in the process list. Sets LIVE_DATABASE, the app's one.
use_database_url() {
	[ -n "${DATABASE_URL:-}" ] || die "DATABASE_URL is not set (see .env.example)."
	local parts=()
	mapfile -d '' parts < <(node -e '
		const url = new URL(process.env.DATABASE_URL);
		const d = decodeURIComponent;
		const fields = [url.hostname.replace(/^\[|\]$/g, "") || "127.0.0.1", url.port || "5432",
			d(url.username), d(url.password), d(url.pathname.slice(1)), url.searchParams.get("sslmode") ?? ""];
		process.stdout.write(fields.join("\0") + "\0");
	') || die "DATABASE_URL is not a URL PostgreSQL understands."
	[ "${#parts[@]}" -eq 6 ] || die "DATABASE_URL could not be read."
	export PGHOST="${parts[0]}" PGPORT="${parts[1]}" PGUSER="${parts[2]}" PGPASSWORD="${parts[3]}"
	if [ -n "${parts[5]}" ]; then export PGSSLMODE="${parts[5]}"; fi
	LIVE_DATABASE="${parts[4]}"
	[ -n "$LIVE_DATABASE" ] || die "DATABASE_URL names no database."
}

# A database name these scripts will put in SQL: letters, digits and underscores only.
check_database_name() {
	[[ "$1" =~ ^[A-Za-z_][A-Za-z0-9_]{0,62}$ ]] ||
		die "'$1' is not a database name these scripts accept (letters, digits and _, at most 63)."
}

psql_on() {
	local database="$1"
	shift
	"$(pg_tool psql)" -X -q -v ON_ERROR_STOP=1 -d "$database" "$@"
}

database_exists() {
	[ "$(psql_on postgres -tA -c "select 1 from pg_database where datname = '$1'")" = "1" ]
}
