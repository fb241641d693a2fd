#!/usr/bin/env bash
# A throwaway PostgreSQL for tests and local work, from the distribution's binaries
# (/usr/lib/postgresql/*/bin, as Debian's `postgresql` package installs them).
#
#   deploy/local-postgres.sh start [--durable]
#                                       initdb into a new temp folder, listen on 127.0.0.1 only on a free
#                                       port, print two lines: the connection string, then the folder
#   deploy/local-postgres.sh stop DIR   stop the server started in DIR and delete DIR
#   deploy/local-postgres.sh run [--durable]
#                                       start, print the same two lines, wait until stdin closes or a
#                                       signal arrives, then stop and delete (what the test fixture uses)
#   deploy/local-postgres.sh halt DIR   stop the server in DIR in immediate mode (a crash: no checkpoint,
#                                       clients cut off), keeping its data
#   deploy/local-postgres.sh resume DIR start it again on the same port with the same settings (crash
#                                       recovery replays the WAL)
#
# Trust authentication, reachable only on the loopback address and a socket in the temp folder;
# the data is thrown away. As root, the server runs as the `postgres` user (it refuses to run as root).
# By default the server trades durability for speed (fsync and synchronous_commit off): fine for tests
# that never crash it. --durable keeps PostgreSQL's defaults, so a commit the client saw survives `halt`.
set -euo pipefail

find_bin() {
  if [ -n "${PG_BIN:-}" ] && [ -x "$PG_BIN/initdb" ]; then echo "$PG_BIN"; return; fi
  local dir
  for dir in $(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V -r); do
    if [ -x "$dir/initdb" ] && [ -x "$dir/pg_ctl" ]; then echo "$dir"; return; fi
  done
  if command -v initdb >/dev/null 2>&1 && command -v pg_ctl >/dev/null 2>&1; then
    dirname "$(readlink -f "$(command -v initdb)")"; return
  fi
  echo "local-postgres: no PostgreSQL binaries (initdb, pg_ctl) found; install them: apt-get install -y postgresql" >&2
  exit 2
}

# Runs a command as the server's user: ourselves, or `postgres` (else `nobody`) when we are root.
as_server_user() {
  if [ "$(id -u)" -ne 0 ]; then "$@"; return; fi
  runuser -u "$SERVER_USER" -- "$@"
}

port_in_use() {
  (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null
}

start() {
  local bin dir port attempt settings
  settings="-c fsync=off -c synchronous_commit=off -c full_page_writes=off"
  if [ "${1:-}" = "--durable" ]; then settings="-c fsync=on -c synchronous_commit=on -c full_page_writes=on"; fi
  # On a fresh machine (as root) the binaries are installed first; nothing else reaches the network.
  bash "$(dirname "${BASH_SOURCE[0]}")/ensure-packages.sh" postgresql || true
  bin=$(find_bin)
  SERVER_USER=$(id -un)
  if [ "$(id -u)" -eq 0 ]; then
    if id postgres >/dev/null 2>&1; then SERVER_USER=postgres; else SERVER_USER=nobody; fi
  fi
  dir=$(mktemp -d "${TMPDIR:-/tmp}/orchard-pg.XXXXXX")
  chmod 700 "$dir"
  if [ "$(id -u)" -eq 0 ]; then chown "$SERVER_USER" "$dir"; fi
  if ! as_server_user "$bin/initdb" -D "$dir/data" -U orchard -A trust -E UTF8 --no-locale --no-sync >"$dir/initdb.log" 2>&1; then
    echo "local-postgres: initdb failed:" >&2; cat "$dir/initdb.log" >&2
    rm -rf "$dir"; exit 1
  fi
  # The port comes from below the kernel's ephemeral range: a client retrying connects to a port in that
  # range while the server is down can be handed that very port as its own source port (a TCP
  # self-connection), and the server then cannot bind it again on `resume`.
  local ephemeral_low
  ephemeral_low=$(cut -f1 /proc/sys/net/ipv4/ip_local_port_range 2>/dev/null || echo 32768)
  [ "$ephemeral_low" -gt 12000 ] 2>/dev/null || ephemeral_low=32768
  for attempt in 1 2 3 4 5 6 7 8; do
    port=$(( 10000 + (RANDOM * 32768 + RANDOM) % (ephemeral_low - 10000) ))
    if port_in_use "$port"; then continue; fi
    # The options are kept beside the data, so `resume` starts the server exactly as before.
    echo "-c listen_addresses=127.0.0.1 -p $port -c unix_socket_directories=$dir $settings -c max_connections=300" >"$dir/options"
    if as_server_user "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -t 60 -o "$(cat "$dir/options")" \
         start >"$dir/pg_ctl.log" 2>&1; then
      echo "Host=127.0.0.1;Port=$port;Username=orchard;Database=postgres"
      echo "$dir"
      return 0
    fi
  done
  echo "local-postgres: the server did not start:" >&2
  cat "$dir/pg_ctl.log" "$dir/server.log" >&2 2>/dev/null || true
  rm -rf "$dir"
  exit 1
}

stop() {
  local dir=$1 bin
  case "$dir" in
    */orchard-pg.*) ;;
    *) echo "local-postgres: refusing to delete '$dir' (not a folder this script made)" >&2; exit 2 ;;
  esac
  [ -d "$dir" ] || return 0
  bin=$(find_bin)
  SERVER_USER=$(stat -c %U "$dir")
  if [ -f "$dir/data/postmaster.pid" ]; then
    as_server_user "$bin/pg_ctl" -D "$dir/data" -m immediate -w -t 30 stop >/dev/null 2>&1 || true
  fi
  rm -rf "$dir"
}

check_dir() {
  case "$1" in
    */orchard-pg.*) [ -d "$1/data" ] || { echo "local-postgres: no server folder at '$1'" >&2; exit 2; } ;;
    *) echo "local-postgres: '$1' is not a folder this script made" >&2; exit 2 ;;
  esac
}

halt() {
  local dir=$1 bin
  check_dir "$dir"
  bin=$(find_bin)
  SERVER_USER=$(stat -c %U "$dir")
  as_server_user "$bin/pg_ctl" -D "$dir/data" -m immediate -w -t 30 stop >>"$dir/pg_ctl.log" 2>&1
}

resume() {
  local dir=$1 bin
  check_dir "$dir"
  bin=$(find_bin)
  SERVER_USER=$(stat -c %U "$dir")
  if ! as_server_user "$bin/pg_ctl" -D "$dir/data" -l "$dir/server.log" -w -t 120 -o "$(cat "$dir/options")" start >>"$dir/pg_ctl.log" 2>&1; then
    echo "local-postgres: the server did not start again:" >&2
    tail -n 20 "$dir/server.log" >&2 || true
    exit 1
  fi
}

case "${1:-}" in
  start) start "${2:-}" ;;
  halt)
    [ $# -eq 2 ] || { echo "usage: $0 halt DIR" >&2; exit 2; }
    halt "$2" ;;
  resume)
    [ $# -eq 2 ] || { echo "usage: $0 resume DIR" >&2; exit 2; }
    resume "$2" ;;
  stop)
    [ $# -eq 2 ] || { echo "usage: $0 stop DIR" >&2; exit 2; }
    stop "$2" ;;
  run)
    out=$(start "${2:-}")
    dir=$(printf '%s\n' "$out" | sed -n 2p)
    trap 'stop "$dir"' EXIT
    trap 'exit 0' INT TERM HUP
    printf '%s\n' "$out"
    # Wait for stdin to close (the parent went away) or a signal.
    while read -r _; do :; done || true
    ;;
  *) echo "usage: $0 start [--durable] | stop DIR | run [--durable] | halt DIR | resume DIR" >&2; exit 2 ;;
esac
