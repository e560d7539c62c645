#!/usr/bin/env bash
# Starts a throwaway PostgreSQL server for curbfit's tests and benchmarks:
#   test/sql/pg-start.sh DIR PORT
# initdb into DIR/data (trust authentication, superuser "curbfit", no fsync), then a server that
# listens on 127.0.0.1:PORT only, with its socket in DIR. As root, the server runs as the
# "postgres" user (PostgreSQL refuses to run as root), and DIR's parent folder is opened to
# it for traversal (o+x). Stop it with test/sql/pg-stop.sh DIR.
set -euo pipefail
dir=$1
port=$2
bindir=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
if [ -z "$bindir" ] || [ ! -x "$bindir/initdb" ]; then
  bindir=$(dirname "$(command -v initdb 2>/dev/null || echo /nonexistent/initdb)")
fi
if [ ! -x "$bindir/initdb" ]; then
  echo "pg-start: PostgreSQL's initdb was not found (Debian package postgresql)" >&2
  exit 3
fi
as_owner() {
  if [ "$(id -u)" = 0 ]; then runuser -u postgres -- "$@"; else "$@"; fi
}
mkdir -p "$dir"
if [ "$(id -u)" = 0 ]; then
  # The server's user must reach DIR: let it through the (temporary) parent folder.
  chmod o+x "$(dirname "$dir")"
  chown postgres "$dir"
fi
as_owner "$bindir/initdb" -D "$dir/data" -A trust -U curbfit -E UTF8 --no-sync >"$dir/initdb.log" 2>&1 ||
  { cat "$dir/initdb.log" >&2; exit 1; }
as_owner "$bindir/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -t 60 \
  -o "-p $port -k $dir -c listen_addresses=127.0.0.1 -c fsync=off -c synchronous_commit=off -c full_page_writes=off" \
  start >/dev/null || { cat "$dir/server.log" >&2; exit 1; }
echo "$bindir"
