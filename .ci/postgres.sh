# A throw-away PostgreSQL for one CI run: a fresh cluster in a temporary
# folder, listening on loopback only, owned by the system's postgres user
# (the server refuses to run as root). Sourced by .ci/run.
#
#   start_postgres   sets LINECAST_CI_DATABASE_URL
#   stop_postgres    stops the server and removes the folder

LINECAST_CI_PG_PORT="${LINECAST_CI_PG_PORT:-55432}"

start_postgres() {
    local bin
    bin="$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -n 1)"
    LINECAST_CI_PG_BIN="$bin"
    LINECAST_CI_PG_DIR="$(mktemp -d /tmp/linecast-ci-pg.XXXXXX)"
    chown postgres: "$LINECAST_CI_PG_DIR"
    # trust on loopback: the cluster lives for this run only and listens on 127.0.0.1 alone.
    runuser -u postgres -- "$bin/initdb" --pgdata="$LINECAST_CI_PG_DIR/data" --username=linecast \
        --auth=trust --encoding=UTF8 --locale=C.UTF-8 >/dev/null
    runuser -u postgres -- "$bin/pg_ctl" --pgdata="$LINECAST_CI_PG_DIR/data" --wait \
        --log="$LINECAST_CI_PG_DIR/server.log" \
        -o "-c listen_addresses=127.0.0.1 -p $LINECAST_CI_PG_PORT -k $LINECAST_CI_PG_DIR -c fsync=off" start
    runuser -u postgres -- "$bin/createdb" --host=127.0.0.1 --port="$LINECAST_CI_PG_PORT" \
        --username=linecast linecast
    LINECAST_CI_DATABASE_URL="postgres://linecast@127.0.0.1:$LINECAST_CI_PG_PORT/linecast"
    export LINECAST_CI_DATABASE_URL
    echo "PostgreSQL $("$bin/postgres" --version | awk '{print $3}') on 127.0.0.1:$LINECAST_CI_PG_PORT"
}

stop_postgres() {
    if [ -n "${LINECAST_CI_PG_DIR:-}" ] && [ -d "$LINECAST_CI_PG_DIR" ]; then
        runuser -u postgres -- "$LINECAST_CI_PG_BIN/pg_ctl" --pgdata="$LINECAST_CI_PG_DIR/data" \
            --mode=fast --wait stop >/dev/null || true
        rm -rf "$LINECAST_CI_PG_DIR"
    fi
}
