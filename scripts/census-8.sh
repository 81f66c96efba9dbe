#!/usr/bin/env bash
# The census of length 8 as a Slurm job array on a one-node cluster of this
# machine (scripts/slurm-cluster.sh), then the merge, then a check of the
# merge against a second, unsharded run of a sample of classes.
#
#   scripts/census-8.sh OUT [SHARDS]          (as root; see docs/census-8.md)
#
# OUT receives shards/shard-1 .. shard-SHARDS (each a census folder with its
# journal, and its Slurm log shards/census-I.log ending with the shard's wall
# time and peak memory), all/ (the merged census: census.md, census.csv,
# census.json, certificates/, refined/), check/ (the sample run again) and
# times.txt. SHARDS defaults to 32; two shards run at once on a 2-core
# machine, each with one worker and CENSUS_MAX_MEMORY (default 8G) of
# memory, the merge with two workers and twice that.
#
# Run again with the same OUT after an interruption: every shard continues
# from its journal, and a finished shard is only checked again.
#
# The parameters (docs/census-8.md says why): counts to CENSUS_TO (25),
# CENSUS_DIGITS (10) significant digits of lambda, the order of the groups
# refined up to CENSUS_REFINE (20) digits; CENSUS_WAIT_HOURS (48) bounds the
# wait for the job array; CENSUS_CHECK (20) classes are run again unsharded.
# CENSUS_LENGTH (8) tries the script out on a small length in seconds:
#   CENSUS_LENGTH=5 CENSUS_TO=12 CENSUS_DIGITS=4 CENSUS_REFINE=8 scripts/census-8.sh /tmp/c5 3
set -euo pipefail
cd "$(dirname "$0")/.."
# shellcheck source=scripts/slurm-cluster.sh
. scripts/slurm-cluster.sh

OUT=${1:?usage: scripts/census-8.sh OUT [SHARDS]}
SHARDS=${2:-32}
LENGTH=${CENSUS_LENGTH:-8}
TO=${CENSUS_TO:-25} DIGITS=${CENSUS_DIGITS:-10} REFINE=${CENSUS_REFINE:-20}
MEMORY=${CENSUS_MAX_MEMORY:-8G} # in G: the merge gets twice as much
WAIT_HOURS=${CENSUS_WAIT_HOURS:-48}
CHECK=${CENSUS_CHECK:-20}
command -v /usr/bin/time >/dev/null || { echo "census-8: /usr/bin/time is missing (apt-get install time)" >&2; exit 2; }

mkdir -p "$OUT/shards"
OUT=$(cd "$OUT" && pwd)
work=$(mktemp -d /tmp/census-8-slurm.XXXXXX)
slurm_remove_work=1
slurm_cluster_start "$work"

go build -o "$work/avoidcert" ./cmd/avoidcert
bin=$work/avoidcert
"$bin" version | tee "$OUT/times.txt"
echo "machine: $(nproc) CPUs, $(awk '/^MemTotal:/ { printf "%.1f GiB", $2 / 1048576 }' /proc/meminfo), $(grep -m1 'model name' /proc/cpuinfo | cut -d: -f2 | sed 's/^ *//')" | tee -a "$OUT/times.txt"

export AVOIDCERT=$bin CENSUS_LENGTH=$LENGTH CENSUS_TO=$TO CENSUS_DIGITS=$DIGITS CENSUS_REFINE=$REFINE \
	CENSUS_MAX_MEMORY=$MEMORY CENSUS_OUT="$OUT/shards"
begin=$(date +%s)
job=$(slurm_submit_array "$SHARDS" "$OUT/shards")
echo "census-8: job array $job: $SHARDS shards of length $LENGTH, counts to $TO, $DIGITS digits, started $(date -u +%FT%TZ)" | tee -a "$OUT/times.txt"
slurm_wait_array "$job" "$SHARDS" $((WAIT_HOURS * 3600))
shards=()
for i in $(seq "$SHARDS"); do
	[ -f "$OUT/shards/shard-$i/census.json" ] || { echo "census-8: shard $i has no census.json; see $OUT/shards/census-$i.log" >&2; exit 1; }
	shards+=("$OUT/shards/shard-$i")
	grep -h "^shard $i/$SHARDS: wall" "$OUT/shards/census-$i.log" | tail -n 1 >>"$OUT/times.txt" || true
done
echo "census-8: job array done after $(($(date +%s) - begin)) s" | tee -a "$OUT/times.txt"

rm -rf "$OUT/all"
/usr/bin/time -f "merge: wall %e s, peak memory %M KB" -a -o "$OUT/times.txt" \
	"$bin" census merge --out "$OUT/all" --jobs 2 --max-memory "$(( ${MEMORY%G} * 2 ))G" --quiet "${shards[@]}"
tail -n 1 "$OUT/times.txt"

# The sample: CHECK classes spread over the list, each run alone as a
# one-class shard (unsharded as far as its row goes), compared with its
# row of the merge: every column that belongs to the class (not the rank,
# group or refinement, which depend on the others) and the certificate
# file, byte for byte.
classes=$( ("$bin" census --length $LENGTH --shard 1/1000000 2>&1 || true) | sed -n 's/.*there are only \([0-9]*\) classes.*/\1/p')
rm -rf "$OUT/check"
mkdir -p "$OUT/check"
own() { # the columns of a census.csv row that belong to its class alone
	awk -F, -v rep="$2" 'NR > 1 && $2 == rep { out = $2; for (i = 3; i <= NF; i++) if (i != 4 && (i < 13 || i > 19)) out = out "," $i; print out }' "$1"
}
for ((s = 0; s < CHECK; s++)); do
	k=$(( s * classes / CHECK + 1 ))
	"$bin" census --length $LENGTH --to "$TO" --digits "$DIGITS" --refine-digits "$REFINE" --max-memory "$MEMORY" \
		--shard "$k/$classes" --jobs 1 --quiet --out "$OUT/check/$k" >/dev/null
	rep=$(sed -n 2p "$OUT/check/$k/census.csv" | cut -d, -f2)
	row=$(own "$OUT/check/$k/census.csv" "$rep")
	if [ -z "$row" ] || [ "$row" != "$(own "$OUT/all/census.csv" "$rep")" ] ||
		! cmp -s "$OUT/check/$k/certificates/$rep.json" "$OUT/all/certificates/$rep.json"; then
		echo "census-8: class $rep: the merged row differs from the unsharded run in $OUT/check/$k" >&2
		exit 1
	fi
done
echo "census-8: $CHECK classes run again unsharded: rows and certificates equal to the merge's" | tee -a "$OUT/times.txt"
sed -n 1,12p "$OUT/all/census.md" | grep '^- '
slurm_ok=1
