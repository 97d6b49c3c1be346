#!/usr/bin/env bash
# npm run restore -- ARCHIVE|latest --into NAME [--replace] [--replace-live]
# Restores a backup (a path, or `latest` for the newest in .data/backups) into database
# NAME. The archive goes into a new database first, in one transaction, and takes NAME
# only once all of it is in: a failed restore leaves everything as it was.
#   --replace       NAME may already exist; it is dropped and replaced.
#   --replace-live  NAME may be the app's own database (DATABASE_URL): stop the app first.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_env
source "$ROOT/scripts/pg-tools.sh"
use_database_url

archive=""
target=""
replace=0
replace_live=0
while [ $# -gt 0 ]; do
	case "$1" in
		--into) target="${2:?--into needs a database name}"; shift 2 ;;
		--replace) replace=1; shift ;;
		--replace-live) replace=1; replace_live=1; shift ;;
		-h | --help) sed -n '2,7p' "$0" | sed 's/^# \{0,1\}//'; exit 0 ;;
		-*) die "unknown option '$1' (npm run restore -- --help)" ;;
		*)
			[ -z "$archive" ] || die "one archive at a time ('$archive' and '$1' given)"
			archive="$1"
			shift
			;;
	esac
done

if [ -z "$archive" ] || [ -z "$target" ]; then
	warn "usage: npm run restore -- ARCHIVE|latest --into NAME [--replace] [--replace-live]"
	if compgen -G "$BACKUP_DIR/*.dump" >/dev/null; then
		warn "backups in $BACKUP_DIR, newest last:"
		ls -1tr "$BACKUP_DIR"/*.dump | tail -n 10 >&2
	fi
	exit 2
fi
if [ "$archive" = "latest" ]; then
	archive="$(ls -1t "$BACKUP_DIR"/*.dump 2>/dev/null | head -n 1 || true)"
	[ -n "$archive" ] || die "there is no backup in $BACKUP_DIR yet (npm run backup makes one)."
fi
[ -f "$archive" ] || die "no archive at $archive"
check_database_name "$target"

if [ "$target" = "$LIVE_DATABASE" ] && [ "$replace_live" -ne 1 ]; then
	die "refusing to overwrite $target: it is the app's own database (DATABASE_URL). Restore into another name and check it, or stop the app and pass --replace-live."
fi
if database_exists "$target" && [ "$replace" -ne 1 ]; then
	die "database $target already exists; pass --replace to drop it and put the backup in its place."
fi
"$(pg_tool pg_restore)" --list "$archive" >/dev/null 2>&1 ||
	die "$archive is not a pg_dump archive that this pg_restore can read."

# A name of our own beside the target; dropped again whatever happens below.
staging="${target:0:40}_restoring_$$"
cleanup() { psql_on postgres -c "drop database if exists \"$staging\" with (force)" >/dev/null 2>&1 || true; }
trap cleanup EXIT

say "restoring $(basename "$archive") into a new database…" >&2
psql_on postgres -c "create database \"$staging\" template template0"
# Objects belong to whoever restores (the dump's roles may not exist here); all or nothing.
if ! "$(pg_tool pg_restore)" --no-owner --no-acl --exit-on-error --single-transaction \
	--dbname="$staging" "$archive"; then
	die "pg_restore failed (its message is above); $target was not touched."
fi

if database_exists "$target"; then
	say "replacing $target…" >&2
	# WITH (FORCE) ends the sessions still connected (PostgreSQL 13 and later).
	psql_on postgres -c "drop database \"$target\" with (force)"
fi
psql_on postgres -c "alter database \"$staging\" rename to \"$target\""
trap - EXIT

# The figure an owner checks first; an archive of another database has no such table.
if orders="$(psql_on "$target" -tA -c "select count(*) from customer_order" 2>/dev/null)"; then
	say "restored $target from $(basename "$archive"): $orders orders" >&2
else
	say "restored $target from $(basename "$archive")" >&2
fi
echo "$target"
