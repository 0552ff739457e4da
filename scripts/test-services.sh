#!/usr/bin/env bash
# Throw-away PostgreSQL and Redis for the tests, on loopback ports, in a temporary directory.
#
#   eval "$(scripts/test-services.sh start)"   # prints the exports: TEST_DATABASE_URL, TEST_REDIS_URL, TEST_SERVICES_DIR
#   scripts/test-services.sh stop              # stops both and deletes the directory (reads TEST_SERVICES_DIR)
#
# Installs Debian's postgresql and redis-server with apt when missing. PostgreSQL refuses to run as root, so under
# root the cluster belongs to an unprivileged system user (pfcci, created when missing). Only the exports go to
# stdout; progress goes to stderr.
set -euo pipefail

CI_USER=pfcci
log() { echo "test-services: $*" >&2; }

install_missing() {
  local want=()
  ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || want+=(postgresql)
  command -v redis-server >/dev/null 2>&1 || want+=(redis-server)
  [ ${#want[@]} -eq 0 ] && return 0
  command -v apt-get >/dev/null 2>&1 || { log "missing ${want[*]} and no apt-get to install them"; return 1; }
  log "installing ${want[*]} (Debian packages)"
  local sudo=""
  [ "$(id -u)" -ne 0 ] && sudo="sudo"
  $sudo apt-get update -qq >&2
  # policy-rc.d refusal keeps the packages' own cluster and redis service from starting.
  DEBIAN_FRONTEND=noninteractive RUNLEVEL=1 $sudo apt-get install -y -qq "${want[@]}" >&2
}

# A free loopback port, asked of the kernel.
free_port() {
  if command -v node >/dev/null 2>&1; then
    node -e "const s=require('net').createServer().listen(0,'127.0.0.1',()=>{console.log(s.address().port);s.close()})"
  else
    echo $((20000 + RANDOM % 20000))
  fi
}

# Run a command as the cluster's owner.
as_owner() {
  if [ "$(id -u)" -eq 0 ]; then runuser -u "$CI_USER" -- "$@"; else "$@"; fi
}

start() {
  install_missing
  local bin
  bin=$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -n 1)
  if [ "$(id -u)" -eq 0 ] && ! id "$CI_USER" >/dev/null 2>&1; then
    log "creating the unprivileged user $CI_USER"
    useradd --system --no-create-home --shell /usr/sbin/nologin "$CI_USER"
  fi
  local dir
  dir=$(mktemp -d "${TMPDIR:-/tmp}/pfc-test-services.XXXXXX")
  chmod 755 "$dir"
  [ "$(id -u)" -eq 0 ] && chown "$CI_USER" "$dir"

  local pg_port redis_port
  pg_port=$(free_port)
  log "PostgreSQL ($bin) on 127.0.0.1:$pg_port in $dir/pg"
  as_owner "$bin/initdb" -D "$dir/pg" -U postgres --auth=trust --encoding=UTF8 --locale=C --no-sync >"$dir/initdb.log" 2>&1 \
    || { cat "$dir/initdb.log" >&2; return 1; }
  # Throw-away: no fsync; enough connections for parallel test files, each with its pools and server processes.
  as_owner "$bin/pg_ctl" -D "$dir/pg" -l "$dir/pg.log" -w -t 60 start \
    -o "-c listen_addresses=127.0.0.1 -c port=$pg_port -c unix_socket_directories=$dir -c fsync=off -c full_page_writes=off -c max_connections=300" >&2 \
    || { cat "$dir/pg.log" >&2; return 1; }
  as_owner "$bin/createdb" -h 127.0.0.1 -p "$pg_port" -U postgres pfc_test

  redis_port=$(free_port)
  log "redis-server on 127.0.0.1:$redis_port"
  redis-server --bind 127.0.0.1 --port "$redis_port" --daemonize yes --save "" --appendonly no \
    --dir "$dir" --pidfile "$dir/redis.pid" --logfile "$dir/redis.log" >&2
  echo "$bin" >"$dir/pg.bin"

  echo "export TEST_SERVICES_DIR=$dir"
  echo "export TEST_DATABASE_URL=postgres://postgres@127.0.0.1:$pg_port/pfc_test"
  echo "export TEST_REDIS_URL=redis://127.0.0.1:$redis_port"
}

stop() {
  local dir=${1:-${TEST_SERVICES_DIR:-}}
  [ -n "$dir" ] && [ -d "$dir" ] || { log "no services directory (set TEST_SERVICES_DIR or pass it)"; return 1; }
  if [ -f "$dir/pg.bin" ] && [ -f "$dir/pg/postmaster.pid" ]; then
    as_owner "$(cat "$dir/pg.bin")/pg_ctl" -D "$dir/pg" -m immediate -w stop >&2 || log "PostgreSQL did not stop cleanly"
  fi
  if [ -f "$dir/redis.pid" ]; then
    kill "$(cat "$dir/redis.pid")" 2>/dev/null || true
  fi
  rm -rf "$dir"
  log "stopped and removed $dir"
}

case "${1:-}" in
  start) start ;;
  stop) stop "${2:-}" ;;
  *) echo "usage: $0 start|stop [dir]" >&2; exit 2 ;;
esac
