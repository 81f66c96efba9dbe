#!/usr/bin/env bash
# Runs a census of length 5 as a Slurm job array of 3 shards on a one-node
# cluster started here, merges the shards, and compares the result byte
# for byte with an unsharded census. Run as root on Debian (CI): it installs
# slurm-wlm and munge when missing, starts munged, slurmctld and slurmd with
# generated keys and configuration in a temporary folder, and stops them
# (and only them) on exit.
set -euo pipefail
cd "$(dirname "$0")/.."
repo=$PWD

# The census: length 5 at few digits, counts to n = 12 (where the 25 count
# groups of length 5 are all apart), 3 shards.
LENGTH=5 TO=12 DIGITS=4 SHARDS=3
WAIT_SECONDS=600

if [ "$(id -u)" -ne 0 ]; then
	echo "slurm-census-test: run as root (it starts munged, slurmctld and slurmd)" >&2
	exit 1
fi
if ! command -v slurmctld >/dev/null || ! command -v slurmd >/dev/null || ! command -v sbatch >/dev/null || ! command -v munged >/dev/null; then
	echo "slurm-census-test: installing slurm-wlm and munge"
	apt-get update
	DEBIAN_FRONTEND=noninteractive apt-get install -y slurm-wlm munge
fi

work=$(mktemp -d /tmp/slurm-census-test.XXXXXX)
chmod 755 "$work"
pids=()
ok=0
cleanup() {
	for pid in "${pids[@]}"; do
		kill "$pid" 2>/dev/null || true
	done
	for pid in "${pids[@]}"; do
		wait "$pid" 2>/dev/null || true
	done
	if [ "$ok" -ne 1 ]; then
		for log in "$work"/*.log "$work"/out/*.log; do
			[ -f "$log" ] && { echo "--- $log"; tail -n 20 "$log"; }
		done
	fi
	rm -rf "$work"
}
trap cleanup EXIT

host=$(hostname -s)
mem=$(awk '/^MemTotal:/ { printf "%d", $2 / 1024 * 0.8 }' /proc/meminfo 2>/dev/null || true)
[ -n "$mem" ] && [ "$mem" -gt 0 ] || mem=1000

# munge with a key of our own, on our own socket.
dd if=/dev/urandom of="$work/munge.key" bs=1024 count=1 status=none
chmod 400 "$work/munge.key"
munged --foreground --force --key-file="$work/munge.key" --socket="$work/munge.socket" \
	--pid-file="$work/munged.pid" --log-file="$work/munged.log" --seed-file="$work/munge.seed" \
	>"$work/munged.out.log" 2>&1 &
pids+=($!)

mkdir -p "$work/state" "$work/spool" "$work/out"
export SLURM_CONF="$work/slurm.conf"
cat >"$SLURM_CONF" <<CONF
ClusterName=censustest
SlurmctldHost=$host(127.0.0.1)
SlurmctldPort=16817
SlurmdPort=16818
AuthType=auth/munge
AuthInfo=socket=$work/munge.socket
CredType=cred/munge
SlurmUser=root
SlurmdUser=root
StateSaveLocation=$work/state
SlurmdSpoolDir=$work/spool
SlurmctldPidFile=$work/slurmctld.pid
SlurmdPidFile=$work/slurmd.pid
SlurmctldLogFile=$work/slurmctld.log
SlurmdLogFile=$work/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
SchedulerType=sched/builtin
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
MpiDefault=none
SwitchType=switch/none
ReturnToService=2
MinJobAge=600
NodeName=$host NodeAddr=127.0.0.1 CPUs=2 RealMemory=$mem State=UNKNOWN
PartitionName=census Nodes=$host Default=YES MaxTime=INFINITE State=UP
CONF

# Wait for munged's socket before the Slurm daemons need it.
for _ in $(seq 100); do [ -S "$work/munge.socket" ] && break; sleep 0.1; done
slurmctld -D -c >"$work/slurmctld.out.log" 2>&1 &
pids+=($!)
slurmd -D -N "$host" >"$work/slurmd.out.log" 2>&1 &
pids+=($!)

start=$(date +%s)
until [ "$(sinfo -h -n "$host" -o %t 2>/dev/null)" = idle ]; do
	if [ $(($(date +%s) - start)) -gt 60 ]; then
		echo "slurm-census-test: the node did not become idle within 60 s" >&2
		exit 1
	fi
	sleep 0.5
done
echo "slurm-census-test: one-node cluster up after $(($(date +%s) - start)) s"

go build -o "$work/avoidcert" ./cmd/avoidcert

begin=$(date +%s)
job=$(cd "$work/out" && AVOIDCERT="$work/avoidcert" CENSUS_LENGTH=$LENGTH CENSUS_TO=$TO CENSUS_DIGITS=$DIGITS \
	CENSUS_OUT="$work/out" sbatch --parsable --array=1-$SHARDS --output="$work/out/census-%a.log" \
	"$repo/scripts/census-array.sbatch")
job=${job%%;*}
echo "slurm-census-test: submitted job array $job ($SHARDS shards)"
while [ -n "$(squeue -h -j "$job" 2>/dev/null)" ]; do
	if [ $(($(date +%s) - begin)) -gt $WAIT_SECONDS ]; then
		echo "slurm-census-test: the job array did not finish within $WAIT_SECONDS s" >&2
		scancel "$job" || true
		exit 1
	fi
	sleep 1
done
for i in $(seq "$SHARDS"); do
	if ! scontrol show job "${job}_$i" | grep -q 'ExitCode=0:0'; then
		echo "slurm-census-test: array task $i failed:" >&2
		scontrol show job "${job}_$i" | grep -E 'JobState|ExitCode' >&2 || true
		exit 1
	fi
done
echo "slurm-census-test: job array done after $(($(date +%s) - begin)) s"

shards=()
for i in $(seq "$SHARDS"); do shards+=("$work/out/shard-$i"); done
"$work/avoidcert" census merge --out "$work/merged" "${shards[@]}"
"$work/avoidcert" census --length $LENGTH --to $TO --digits $DIGITS --jobs 2 --quiet --out "$work/whole"
diff -r --exclude=journal "$work/whole" "$work/merged"
grep -q '"separating_n": 12' "$work/merged/census.json"
echo "slurm-census-test: merged shards equal the unsharded census byte for byte (total $(($(date +%s) - start)) s)"
ok=1
