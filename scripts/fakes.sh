# Local stand-ins for hosted services, started by scripts/start.sh and scripts/dev.sh on
# loopback. Each start_* appends its PID to the caller's `pids` array.

# maildev: SMTP on 127.0.0.1:1025 (the app's default in demo and development) and its
# web inbox on http://127.0.0.1:1080, which the app links to (GET /api/config).
MAILDEV_SMTP_PORT=${MAILDEV_SMTP_PORT:-1025}
MAILDEV_WEB_PORT=${MAILDEV_WEB_PORT:-1080}

start_maildev() {
  if [ -n "${SMTP_HOST:-}" ]; then
    log "SMTP_HOST is set ($SMTP_HOST): not starting the local mail fake"
    return 0
  fi
  mkdir -p .data
  node_modules/.bin/maildev -s "$MAILDEV_SMTP_PORT" -w "$MAILDEV_WEB_PORT" --ip 127.0.0.1 --web-ip 127.0.0.1 \
    >.data/maildev.log 2>&1 &
  pids+=($!)
  export SMTP_HOST=127.0.0.1 SMTP_PORT=$MAILDEV_SMTP_PORT
  export MAIL_INBOX_URL=${MAIL_INBOX_URL:-http://127.0.0.1:$MAILDEV_WEB_PORT}
}

# s3rver: the S3-compatible storage fake on 127.0.0.1:4569, data in .data/s3 (kept across
# restarts like the database). The app creates its bucket at start (server/plugins/jobs.ts).
S3RVER_PORT=${S3RVER_PORT:-4569}

start_s3rver() {
  if [ -n "${S3_ENDPOINT:-}" ]; then
    log "S3_ENDPOINT is set ($S3_ENDPOINT): not starting the local storage fake"
    return 0
  fi
  mkdir -p .data/s3
  node_modules/.bin/s3rver -d .data/s3 -a 127.0.0.1 -p "$S3RVER_PORT" --silent >.data/s3rver.log 2>&1 &
  pids+=($!)
  export S3_ENDPOINT=http://127.0.0.1:$S3RVER_PORT S3_BUCKET=${S3_BUCKET:-bitslack} S3_REGION=${S3_REGION:-us-east-1}
  export S3_ACCESS_KEY_ID=S3RVER S3_SECRET_ACCESS_KEY=S3RVER
  for _ in $(seq 1 50); do
    (exec 3<>"/dev/tcp/127.0.0.1/$S3RVER_PORT") 2>/dev/null && return 0
    sleep 0.1
  done
  log "the storage fake did not start; see .data/s3rver.log"
  return 1
}

start_fakes() {
  start_maildev
  start_s3rver
}

print_fake_urls() {
  if [ -n "${MAIL_INBOX_URL:-}" ]; then log "mail inbox (every mail the app sends): $MAIL_INBOX_URL"; fi
  if [ -n "${S3_ENDPOINT:-}" ]; then log "object storage: $S3_ENDPOINT, bucket ${S3_BUCKET:-}"; fi
}
