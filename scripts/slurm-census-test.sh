#!/usr/bin/env bash
# Runs a census of length 5 as a Slurm job array of 3 shards on a one-node
# cluster started here (scripts/slurm-cluster.sh), merges the shards, and
# compares the result byte for byte with an unsharded census. Run as root on
# Debian (CI): it installs slurm-wlm and munge when missing, starts munged,
# slurmctld and slurmd with generated keys and configuration in a temporary
# folder, and stops them (and only them) on exit.
set -euo pipefail
cd "$(dirname "$0")/.."
# shellcheck source=scripts/slurm-cluster.sh
. scripts/slurm-cluster.sh

# The census: length 5 at few digits, counts to n = 12 (where the 25 count
# groups of length 5 are all apart), 3 shards; the order of the groups is
# refined by the merge as by the unsharded run.
LENGTH=5 TO=12 DIGITS=4 SHARDS=3
WAIT_SECONDS=600

work=$(mktemp -d /tmp/slurm-census-test.XXXXXX)
slurm_remove_work=1
slurm_cluster_start "$work"
start=$(date +%s)

go build -o "$work/avoidcert" ./cmd/avoidcert
export AVOIDCERT="$work/avoidcert" CENSUS_LENGTH=$LENGTH CENSUS_TO=$TO CENSUS_DIGITS=$DIGITS CENSUS_OUT="$work/out"
job=$(slurm_submit_array "$SHARDS" "$work/out")
echo "slurm-census-test: submitted job array $job ($SHARDS shards)"
slurm_wait_array "$job" "$SHARDS" "$WAIT_SECONDS"

shards=()
for i in $(seq "$SHARDS"); do shards+=("$work/out/shard-$i"); done
"$work/avoidcert" census merge --out "$work/merged" --quiet "${shards[@]}"
"$work/avoidcert" census --length $LENGTH --to $TO --digits $DIGITS --jobs 2 --quiet --out "$work/whole"
diff -r --exclude=journal "$work/whole" "$work/merged"
grep -q '"separating_n": 12' "$work/merged/census.json"
echo "slurm-census-test: merged shards equal the unsharded census byte for byte (total $(($(date +%s) - start)) s)"
slurm_ok=1
