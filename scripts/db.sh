#!/usr/bin/env bash
# The project's own PostgreSQL cluster on 127.0.0.1:$PG_PORT, kept in a
# git-ignored data folder. Never touches a system-wide cluster.
#   bash scripts/db.sh start    create on first run, start, create the databases
#   bash scripts/db.sh stop     stop it cleanly
#   bash scripts/db.sh status   exit 0 when it is running
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_env

IS_ROOT=0
[ "$(id -u)" -eq 0 ] && IS_ROOT=1

# Newest PostgreSQL server binaries Debian installed, if any.
find_pg_bin() {
	local dir
	dir="$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)"
	if [ -n "$dir" ] && [ -x "$dir/initdb" ] && [ -x "$dir/pg_ctl" ]; then echo "$dir"; fi
}

PG_BIN="$(find_pg_bin)"
if [ -z "$PG_BIN" ] && [ "${1:-}" = "start" ]; then
	if [ "$IS_ROOT" -ne 1 ]; then
		die "PostgreSQL's server is not installed: run 'sudo apt-get install postgresql' (Debian) and start again."
	fi
	say "installing Debian's postgresql package (apt-get)…"
	apt-get update -qq
	# The package would create and start a system cluster; we only want its binaries.
	DEBIAN_FRONTEND=noninteractive apt-get install -y -qq postgresql >/dev/null
	PG_BIN="$(find_pg_bin)"
	[ -n "$PG_BIN" ] || die "apt-get installed postgresql but no server binaries were found under /usr/lib/postgresql."
fi
PG_MAJOR="$(basename "$(dirname "${PG_BIN:-/x/unknown/bin}")")"

# PostgreSQL refuses to run as root: as root, the cluster belongs to the
# 'postgres' system user, which must be able to reach the data folder.
DATA_HOME="$ROOT/.data"
as_pg() {
	if [ "$IS_ROOT" -eq 1 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}
if [ "$IS_ROOT" -eq 1 ]; then
	id postgres >/dev/null 2>&1 || die "The 'postgres' system user is missing; reinstall Debian's postgresql package."
	mkdir -p "$DATA_HOME"
	if ! runuser -u postgres -- test -x "$DATA_HOME" 2>/dev/null; then
		# The checkout sits where 'postgres' cannot enter (say, under /root): keep the cluster in a
		# per-checkout folder that it can, and point .data/pg-location at it.
		DATA_HOME="/var/lib/hatchlot/$(echo "$ROOT" | sha256sum | cut -c1-12)"
		mkdir -p "$DATA_HOME"
		echo "$DATA_HOME" > "$ROOT/.data/pg-location"
	fi
fi
PGDATA_DIR="$DATA_HOME/pg"
SOCKET_DIR="$DATA_HOME/run"
LOG_FILE="$DATA_HOME/pg.log"
MARKER="$PGDATA_DIR/hatchlot-cluster"

pg_running() {
	[ -n "$PG_BIN" ] && [ -f "$PGDATA_DIR/PG_VERSION" ] && as_pg "$PG_BIN/pg_ctl" status -D "$PGDATA_DIR" >/dev/null 2>&1
}

psql_admin() {
	PGPASSWORD="$PG_PASSWORD" psql -X -q -v ON_ERROR_STOP=1 -h 127.0.0.1 -p "$PG_PORT" -U "$PG_USER" -d postgres "$@"
}

init_cluster() {
	say "creating a PostgreSQL $PG_MAJOR cluster in $PGDATA_DIR…"
	mkdir -p "$PGDATA_DIR" "$SOCKET_DIR"
	local pwfile="$DATA_HOME/.pwfile"
	printf '%s\n' "$PG_PASSWORD" > "$pwfile"
	if [ "$IS_ROOT" -eq 1 ]; then chown postgres: "$DATA_HOME" "$PGDATA_DIR" "$SOCKET_DIR" "$pwfile"; fi
	chmod 700 "$PGDATA_DIR"
	if ! as_pg "$PG_BIN/initdb" -D "$PGDATA_DIR" -U "$PG_USER" --pwfile="$pwfile" \
		--auth-local=trust --auth-host=scram-sha-256 --encoding=UTF8 --locale=C.UTF-8 >"$DATA_HOME/initdb.log" 2>&1; then
		rm -rf "$PGDATA_DIR" "$pwfile"
		die "initdb failed (see $DATA_HOME/initdb.log); nothing was kept, fix the cause and run again."
	fi
	rm -f "$pwfile"
	echo "created by hatchlot scripts/db.sh for $ROOT" | as_pg tee "$MARKER" >/dev/null
}

check_data_folder() {
	[ -d "$PGDATA_DIR" ] || return 0
	if [ -z "$(ls -A "$PGDATA_DIR" 2>/dev/null)" ]; then rmdir "$PGDATA_DIR"; return 0; fi
	[ -f "$PGDATA_DIR/PG_VERSION" ] ||
		die "$PGDATA_DIR is not a PostgreSQL data folder (no PG_VERSION); move it away or delete it, then run again."
	[ -f "$MARKER" ] ||
		die "$PGDATA_DIR holds a cluster these scripts did not create; move it away or delete it, then run again."
	local version
	version="$(cat "$PGDATA_DIR/PG_VERSION")"
	[ "$version" = "$PG_MAJOR" ] ||
		die "$PGDATA_DIR was made by PostgreSQL $version but this machine has $PG_MAJOR; delete the folder (its data is lost) or install PostgreSQL $version."
}

ensure_database() {
	local name="$1"
	if [ "$(psql_admin -tA -c "select 1 from pg_database where datname = '$name'")" != "1" ]; then
		psql_admin -c "create database \"$name\"" && say "created database $name"
	fi
}

start() {
	if [ "$PG_MANAGED" != "1" ]; then
		say "PG_MANAGED=0: using the PostgreSQL at DATABASE_URL as it is"
		return 0
	fi
	check_data_folder
	[ -d "$PGDATA_DIR" ] || init_cluster
	if pg_running; then
		say "PostgreSQL is already running on 127.0.0.1:$PG_PORT"
	else
		if port_in_use "$PG_PORT"; then
			die "Port $PG_PORT on 127.0.0.1 is taken by another program; stop it or set PG_PORT in .env to a free port."
		fi
		mkdir -p "$SOCKET_DIR"
		if [ "$IS_ROOT" -eq 1 ]; then
			chown postgres: "$SOCKET_DIR"
			touch "$LOG_FILE" && chown postgres: "$LOG_FILE"
		fi
		say "starting PostgreSQL $PG_MAJOR on 127.0.0.1:$PG_PORT…"
		if ! as_pg "$PG_BIN/pg_ctl" start -D "$PGDATA_DIR" -l "$LOG_FILE" -w -t 60 \
			-o "-c listen_addresses=127.0.0.1 -p $PG_PORT -c unix_socket_directories=$SOCKET_DIR" >/dev/null; then
			tail -n 5 "$LOG_FILE" >&2 || true
			die "PostgreSQL did not start (the lines above are from $LOG_FILE); if the data folder is damaged, delete $PGDATA_DIR and run again."
		fi
	fi
	ensure_database "$PG_DATABASE"
	ensure_database "$PG_TEST_DATABASE"
}

stop() {
	[ "$PG_MANAGED" = "1" ] || return 0
	if pg_running; then
		say "stopping PostgreSQL…"
		as_pg "$PG_BIN/pg_ctl" stop -D "$PGDATA_DIR" -m fast -w >/dev/null
	else
		say "PostgreSQL is not running"
	fi
}

case "${1:-}" in
	start) start ;;
	stop) stop ;;
	status) pg_running ;;
	*) die "usage: bash scripts/db.sh start|stop|status" ;;
esac
