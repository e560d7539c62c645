#!/usr/bin/env bash
# Stops a server started by test/sql/pg-start.sh and removes its folder: test/sql/pg-stop.sh DIR
set -uo pipefail
dir=$1
bindir=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -n 1 || true)
[ -x "$bindir/pg_ctl" ] || bindir=$(dirname "$(command -v pg_ctl)")
if [ -d "$dir/data" ]; then
  if [ "$(id -u)" = 0 ]; then
    runuser -u postgres -- "$bindir/pg_ctl" -D "$dir/data" -m immediate -w stop >/dev/null 2>&1
  else
    "$bindir/pg_ctl" -D "$dir/data" -m immediate -w stop >/dev/null 2>&1
  fi
fi
rm -rf "$dir"
