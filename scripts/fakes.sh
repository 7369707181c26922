# Local stand-ins for hosted services, started by scripts/start.sh and scripts/dev.sh on
# loopback. Each start_* appends its PID to the caller's `pids` array.
# (Mail and storage fakes are added by their features.)

start_fakes() { :; }
print_fake_urls() { :; }
