#!/usr/bin/env bash
# npm run backup [-- --database NAME] [--dir FOLDER]
# One pg_dump archive (custom format, compressed) of the shop's database, by default the
# one DATABASE_URL names, in .data/backups as NAME-YYYYMMDDTHHMMSSZ.dump (UTC). The last
# line printed is the archive's path. Photos are files, not rows: copy PHOTO_STORAGE_DIR
# alongside (they are written once and never change, so a plain copy is enough).
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
load_env
source "$ROOT/scripts/pg-tools.sh"
use_database_url

database="$LIVE_DATABASE"
dir="$BACKUP_DIR"
while [ $# -gt 0 ]; do
	case "$1" in
		--database) database="${2:?--database needs a name}"; shift 2 ;;
		--dir) dir="${2:?--dir needs a folder}"; shift 2 ;;
		-h | --help) sed -n '2,6p' "$0" | sed 's/^# \{0,1\}//'; exit 0 ;;
		*) die "unknown argument '$1' (npm run backup -- --help)" ;;
	esac
done
check_database_name "$database"
database_exists "$database" || die "there is no database '$database' on $PGHOST:$PGPORT."

# Dumps hold customers' addresses and password hashes: only this user may read them.
umask 077
mkdir -p "$dir"
stamp="$(date -u +%Y%m%dT%H%M%SZ)"
file="$dir/$database-$stamp.dump"
# Two backups in the same second get a counter rather than one replacing the other.
n=2
while [ -e "$file" ]; do
	file="$dir/$database-$stamp-$n.dump"
	n=$((n + 1))
done
partial="$file.partial"
trap 'rm -f "$partial"' EXIT

say "dumping $database from $PGHOST:$PGPORT…" >&2
# One consistent snapshot of every schema (the shop's tables and pg-boss's jobs alike).
"$(pg_tool pg_dump)" --format=custom --compress=6 --file="$partial" --dbname="$database"
# An archive that pg_restore cannot list is no backup: check before it takes the real name.
"$(pg_tool pg_restore)" --list "$partial" >/dev/null || die "the new archive does not read back; nothing was kept."
mv "$partial" "$file"
say "backup written: $file ($(du -h "$file" | cut -f1))" >&2
echo "$file"
