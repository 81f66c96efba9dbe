#!/usr/bin/env bash
# Runs one benchmark command and prints its wall time and peak memory
# (resident set size) as docs/benchmarks.md records them:
#   scripts/bench.sh avoidcert count 1342 --to 200 --format csv
# The avoidcert binary is built once into a temporary folder.
set -euo pipefail
cd "$(dirname "$0")/.."
bin=$(mktemp -d)
trap 'rm -rf "$bin"' EXIT
go build -o "$bin/avoidcert" ./cmd/avoidcert
shift # the word "avoidcert"
cd "$bin"
/usr/bin/time -f "wall %e s, peak RSS %M KB, exit %x" ./avoidcert "$@" > out.txt 2> err.txt || true
tail -n 1 err.txt
grep -E '^(lambda|class|stopped|bracket|valid|invalid)' out.txt || tail -n 1 out.txt | cut -c1-80
