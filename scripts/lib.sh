# Shared shell functions for the start, test and database scripts. Sourced, never run.
# Everything listens on 127.0.0.1 only; every process is tracked by its PID.

ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
export NEXT_TELEMETRY_DISABLED=1

# A local .env (see .env.example) overrides the defaults below.
if [ -f "$ROOT/.env" ]; then
  set -a
  # shellcheck disable=SC1091
  . "$ROOT/.env"
  set +a
fi

say() { printf '\033[1;36m[zoneward]\033[0m %s\n' "$*"; }
fail() { printf '\033[1;31m[zoneward]\033[0m %s\n' "$*" >&2; exit 1; }

is_root() { [ "$(id -u)" = "0" ]; }

# Installs Debian packages non-interactively, or says exactly what to run when not root.
apt_install() {
  if is_root; then
    say "installing Debian packages: $*"
    DEBIAN_FRONTEND=noninteractive apt-get update -qq >/dev/null
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null || fail "apt-get install $* failed"
  else
    fail "missing Debian packages. Run: sudo apt-get update && sudo apt-get install -y $*"
  fi
}

ensure_node_modules() {
  cd "$ROOT"
  # npm writes node_modules/.package-lock.json on install; if the committed lock is newer, reinstall.
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    say "installing dependencies (npm ci)"
    npm ci --no-audit --no-fund --loglevel=error || fail "npm ci failed"
  fi
}

mariadb_bin() {
  for candidate in "$(command -v "$1" 2>/dev/null)" "/usr/sbin/$1" "/usr/bin/$1"; do
    if [ -n "$candidate" ] && [ -x "$candidate" ]; then echo "$candidate"; return 0; fi
  done
  return 1
}

ensure_mariadb() {
  if ! mariadb_bin mariadbd >/dev/null || ! mariadb_bin mariadb-install-db >/dev/null || ! mariadb_bin mariadb-admin >/dev/null; then
    apt_install mariadb-server mariadb-client
  fi
  MARIADBD="$(mariadb_bin mariadbd)"
  MARIADB_INSTALL_DB="$(mariadb_bin mariadb-install-db)"
  MARIADB_ADMIN="$(mariadb_bin mariadb-admin)"
  MARIADB_CLIENT="$(mariadb_bin mariadb)"
  MARIADB_DUMP="$(mariadb_bin mariadb-dump)"
  export MARIADBD MARIADB_INSTALL_DB MARIADB_ADMIN MARIADB_CLIENT MARIADB_DUMP
}

ensure_chromium() {
  [ -x /usr/bin/chromium ] || apt_install chromium
}

ensure_poppler() {
  command -v pdftotext >/dev/null && command -v pdftoppm >/dev/null || apt_install poppler-utils
}

# db_socket DIR -> the socket path of the server whose files live in DIR.
db_socket() { echo "$1/run/mariadb.sock"; }

db_is_up() {
  local dir="$1" pidfile="$1/run/mariadb.pid"
  [ -f "$pidfile" ] && kill -0 "$(cat "$pidfile")" 2>/dev/null &&
    "$MARIADB_ADMIN" --no-defaults --user=root --socket="$(db_socket "$dir")" ping >/dev/null 2>&1
}

# start_db DIR PORT: a private MariaDB server for this project, initialised on first use.
start_db() {
  local dir="$1" port="$2"
  mkdir -p "$dir/run"
  if db_is_up "$dir"; then
    say "MariaDB already running (data in $dir)"
    return 0
  fi
  if [ ! -d "$dir/data/mysql" ]; then
    say "initialising a MariaDB data directory in $dir/data"
    mkdir -p "$dir/data"
    "$MARIADB_INSTALL_DB" --no-defaults --user="$(id -un)" --datadir="$dir/data" \
      --auth-root-authentication-method=normal --skip-test-db >"$dir/run/install.log" 2>&1 ||
      { cat "$dir/run/install.log"; fail "mariadb-install-db failed"; }
  fi
  say "starting MariaDB on 127.0.0.1:$port"
  "$MARIADBD" --no-defaults --user="$(id -un)" --datadir="$dir/data" \
    --socket="$(db_socket "$dir")" --pid-file="$dir/run/mariadb.pid" \
    --port="$port" --bind-address=127.0.0.1 \
    --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
    --skip-log-bin --log-error="$dir/run/error.log" \
    --innodb-buffer-pool-size="${DB_BUFFER_POOL:-512M}" --max-connections=300 \
    --innodb-flush-log-at-trx-commit="${DB_FLUSH_AT_COMMIT:-1}" \
    >/dev/null 2>&1 &
  local pid=$!
  for _ in $(seq 1 150); do
    if ! kill -0 "$pid" 2>/dev/null; then
      tail -20 "$dir/run/error.log" >&2
      fail "MariaDB exited at start (is port $port taken? set DB_PORT)"
    fi
    if "$MARIADB_ADMIN" --no-defaults --user=root --socket="$(db_socket "$dir")" ping >/dev/null 2>&1; then
      echo "$pid" >"$dir/run/mariadb.pid"
      return 0
    fi
    sleep 0.2
  done
  fail "MariaDB did not answer within 30 s (see $dir/run/error.log)"
}

# db_sql DIR "SQL": run SQL as root over the socket.
db_sql() {
  "$MARIADB_CLIENT" --no-defaults --user=root --socket="$(db_socket "$1")" -e "$2"
}

# The application connects over TCP as its own user; root stays socket-only.
ensure_db_user() {
  db_sql "$1" "CREATE USER IF NOT EXISTS 'zoneward'@'127.0.0.1' IDENTIFIED BY 'zoneward';
    CREATE USER IF NOT EXISTS 'zoneward'@'localhost' IDENTIFIED BY 'zoneward';
    GRANT ALL PRIVILEGES ON *.* TO 'zoneward'@'127.0.0.1';
    GRANT ALL PRIVILEGES ON *.* TO 'zoneward'@'localhost';" || fail "could not create the database user"
}

stop_db() {
  local dir="$1" pidfile="$1/run/mariadb.pid"
  [ -f "$pidfile" ] || return 0
  local pid
  pid="$(cat "$pidfile")"
  if kill -0 "$pid" 2>/dev/null; then
    say "stopping MariaDB"
    "$MARIADB_ADMIN" --no-defaults --user=root --socket="$(db_socket "$dir")" shutdown >/dev/null 2>&1 || kill -TERM "$pid" 2>/dev/null
    for _ in $(seq 1 100); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
  fi
  rm -f "$pidfile"
}

# start_mail DIR PORT: the local stand-in of the mail API, keeping messages in DIR.
start_mail() {
  local dir="$1" port="$2"
  mkdir -p "$dir"
  assert_port_free "$port"
  setsid node --import tsx "$ROOT/scripts/mail-standin.ts" --port "$port" --dir "$dir" >"$dir/standin.log" 2>&1 &
  MAIL_PID=$!
  for _ in $(seq 1 100); do
    kill -0 "$MAIL_PID" 2>/dev/null || { cat "$dir/standin.log" >&2; fail "the mail stand-in exited (is port $port taken? set MAIL_PORT)"; }
    if node -e "fetch('http://127.0.0.1:$port/health').then(r=>process.exit(r.ok?0:1),()=>process.exit(1))" 2>/dev/null; then return 0; fi
    sleep 0.1
  done
  fail "the mail stand-in did not answer"
}

# start_payments DIR PORT WEBHOOK_URL: the local stand-in of the payments API, keeping its state
# in DIR and sending signed webhooks to WEBHOOK_URL.
start_payments() {
  local dir="$1" port="$2" webhook_url="$3"
  mkdir -p "$dir"
  assert_port_free "$port"
  setsid node --import tsx "$ROOT/scripts/payments-standin.ts" --port "$port" --dir "$dir" \
    --webhook-url "$webhook_url" --webhook-secret "$STRIPE_WEBHOOK_SECRET" --api-key "$STRIPE_SECRET_KEY" >"$dir/standin.log" 2>&1 &
  PAYMENTS_PID=$!
  for _ in $(seq 1 100); do
    kill -0 "$PAYMENTS_PID" 2>/dev/null || { cat "$dir/standin.log" >&2; fail "the payments stand-in exited (is port $port taken? set PAYMENTS_PORT, or TEST_PAYMENTS_PORT for tests)"; }
    if node -e "fetch('http://127.0.0.1:$port/health').then(r=>process.exit(r.ok?0:1),()=>process.exit(1))" 2>/dev/null; then return 0; fi
    sleep 0.1
  done
  fail "the payments stand-in did not answer"
}

# Background services run in a process group of their own (setsid), so stopping one stops
# every process it started: `next start` renames itself and npx leaves children behind.
stop_pid() {
  local pid="$1"
  [ -n "$pid" ] || return 0
  if kill -0 "$pid" 2>/dev/null; then
    kill -TERM -- "-$pid" 2>/dev/null || kill -TERM "$pid" 2>/dev/null
    for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || return 0; sleep 0.1; done
    kill -KILL -- "-$pid" 2>/dev/null || kill -KILL "$pid" 2>/dev/null
  fi
}

# Fails when something already listens on the port (a stale server would answer for us).
assert_port_free() {
  if node -e "const s=require('net').connect($1,'127.0.0.1');s.on('connect',()=>process.exit(0));s.on('error',()=>process.exit(1))" 2>/dev/null; then
    fail "port $1 is already in use by another process; stop it or choose another port"
  fi
}

wait_http() {
  local url="$1" pid="$2"
  for _ in $(seq 1 300); do
    [ -z "$pid" ] || kill -0 "$pid" 2>/dev/null || return 1
    if node -e "fetch('$url').then(r=>process.exit(r.status<500?0:1),()=>process.exit(1))" 2>/dev/null; then return 0; fi
    sleep 0.2
  done
  return 1
}

# Build only when a source file is newer than the last build.
build_app() {
  cd "$ROOT"
  local build_id="${NEXT_DIST_DIR:-.next}/BUILD_ID"
  if [ -f "$build_id" ] && [ -z "${FORCE_BUILD:-}" ] &&
    [ -z "$(find app components lib emails public db/schema proxy.ts next.config.ts tailwind.config.ts package-lock.json -newer "$build_id" -print -quit 2>/dev/null)" ]; then
    say "the build is up to date"
    return 0
  fi
  say "building the app (next build)"
  npx next build >"${BUILD_LOG:-/dev/stdout}" 2>&1 || { [ -n "${BUILD_LOG:-}" ] && tail -60 "$BUILD_LOG"; fail "next build failed"; }
}

# Runs a TypeScript file with the project's path aliases and the server-only guard relaxed
# (for import and require alike). --conditions=import lets tsx's require() reach packages that
# ship ES modules only, such as the PDF renderer.
run_ts() {
  node --conditions=import --require "$ROOT/scripts/server-only-require.cjs" --import tsx --import "$ROOT/scripts/server-env.mjs" "$@"
}

# Mail: the local stand-in unless a real API key is configured (then the hosted service,
# and nothing else to change). Sets RESEND_BASE_URL and MAIL_STANDIN_URL accordingly.
configure_mail() {
  local port="$1"
  if [ -z "${RESEND_API_KEY:-}" ] || [ "${RESEND_API_KEY}" = "re_local_standin" ]; then
    export RESEND_API_KEY="re_local_standin"
    export RESEND_BASE_URL="http://127.0.0.1:$port"
    export MAIL_STANDIN_URL="$RESEND_BASE_URL"
  else
    unset RESEND_BASE_URL MAIL_STANDIN_URL
  fi
}

# Payments: the local stand-in unless a real secret key is configured (then the hosted service,
# keys only). Sets STRIPE_API_URL and PAYMENTS_STANDIN_URL accordingly.
configure_payments() {
  local port="$1"
  if [ -z "${STRIPE_SECRET_KEY:-}" ] || [ "${STRIPE_SECRET_KEY}" = "sk_test_local_standin" ]; then
    export STRIPE_SECRET_KEY="sk_test_local_standin"
    export STRIPE_WEBHOOK_SECRET="whsec_local_standin"
    export STRIPE_API_URL="http://127.0.0.1:$port"
    export PAYMENTS_STANDIN_URL="$STRIPE_API_URL"
  else
    unset STRIPE_API_URL PAYMENTS_STANDIN_URL
  fi
}
