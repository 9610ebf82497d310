#!/usr/bin/env bash
# The suite on a busy machine: five consecutive full test runs on a fresh clone while two busy
# loops keep both cores occupied. Run 1 is the whole CI script (.ci/run: npm ci, format, lint,
# type check, build, npm test); runs 2–5 are `npm test`. Stops at the first failing run.
#
#   bash tools/suite-under-load.sh [commit] [work-dir]
#
# Each run's output goes to <work-dir>/run-<n>.out; one line per run (exit code, seconds, load
# average, vitest's counts) to <work-dir>/runs.log. Takes about 70 minutes on 2 cores.
set -u
repo=$(git -C "$(dirname "$0")/.." rev-parse --show-toplevel)
commit=${1:-$(git -C "$repo" rev-parse HEAD)}
work=${2:-/tmp/suite-under-load}
mkdir -p "$work"
clone="$work/clone"
log="$work/runs.log"
rm -rf "$clone" && git clone -q "$repo" "$clone" && git -C "$clone" checkout -q "$commit"
echo "runs at $(git -C "$clone" log --oneline -1), start $(date -u +%FT%TZ)" >>"$log"
(while :; do :; done) &
b1=$!
(while :; do :; done) &
b2=$!
trap 'kill $b1 $b2 2>/dev/null' EXIT
cd "$clone"
for i in 1 2 3 4 5; do
  s=$(date +%s)
  if [ "$i" = 1 ]; then bash .ci/run >"$work/run-$i.out" 2>&1; else npm test >"$work/run-$i.out" 2>&1; fi
  rc=$?
  counts=$(grep -E "Test Files|Tests " "$work/run-$i.out" | sed 's/\x1b\[[0-9;]*m//g' | tr -s ' ' | tr '\n' ';')
  echo "run $i rc=$rc secs=$(($(date +%s) - s)) load=$(cut -d' ' -f1-3 /proc/loadavg) $counts" >>"$log"
  [ "$rc" = 0 ] || break
done
echo "end $(date -u +%FT%TZ)" >>"$log"
