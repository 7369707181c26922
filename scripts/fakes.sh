# Local stand-ins for hosted services, started by scripts/start.sh and scripts/dev.sh on
# loopback. Each start_* appends its PID to the caller's `pids` array.
# (The mail fake is added by its feature.)

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
  start_s3rver
}

print_fake_urls() {
  if [ -n "${S3_ENDPOINT:-}" ]; then log "object storage: $S3_ENDPOINT, bucket ${S3_BUCKET:-}"; fi
}
