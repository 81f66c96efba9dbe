# A one-node Slurm cluster on this machine, for the census scripts
# (scripts/slurm-census-test.sh, scripts/census-8.sh). Source it, then:
#
#   slurm_cluster_start WORK    # WORK: an empty folder for keys, state, logs
#   job=$(slurm_submit_array SHARDS LOGDIR [sbatch flags...])
#   slurm_wait_array "$job" SHARDS TIMEOUT_SECONDS
#
# slurm_cluster_start needs root: it installs slurm-wlm and munge from
# Debian when missing, starts munged with a generated key on its own
# socket, and slurmctld and slurmd from a generated slurm.conf (this
# machine's short host name at 127.0.0.1, its CPUs, 80 % of MemTotal, no
# accounting, ports 16817/16818, finished jobs kept for 18 hours). It
# registers an EXIT trap that stops those daemons, and only them, prints
# the tails of the logs when slurm_ok is not 1, and removes WORK when
# slurm_remove_work is set. SLURM_CONF is exported for the Slurm commands.

slurm_pids=()
slurm_ok=0
slurm_work=

slurm_cleanup() {
	local pid log
	for pid in "${slurm_pids[@]}"; do
		kill "$pid" 2>/dev/null || true
	done
	for pid in "${slurm_pids[@]}"; do
		wait "$pid" 2>/dev/null || true
	done
	if [ "$slurm_ok" -ne 1 ] && [ -n "$slurm_work" ]; then
		for log in "$slurm_work"/*.log "$slurm_work"/out/*.log; do
			[ -f "$log" ] && { echo "--- $log"; tail -n 20 "$log"; }
		done
	fi
	if [ -n "${slurm_remove_work:-}" ] && [ -n "$slurm_work" ]; then
		rm -rf "$slurm_work"
	fi
}

# slurm_cluster_start WORK: start the cluster with its files in WORK.
slurm_cluster_start() {
	slurm_work=$1
	trap slurm_cleanup EXIT
	if [ "$(id -u)" -ne 0 ]; then
		echo "slurm: run as root (it starts munged, slurmctld and slurmd)" >&2
		return 1
	fi
	if ! command -v slurmctld >/dev/null || ! command -v slurmd >/dev/null || ! command -v sbatch >/dev/null || ! command -v munged >/dev/null; then
		echo "slurm: installing slurm-wlm and munge"
		apt-get update
		DEBIAN_FRONTEND=noninteractive apt-get install -y slurm-wlm munge
	fi
	chmod 755 "$slurm_work"
	local host mem cpus
	host=$(hostname -s)
	mem=$(awk '/^MemTotal:/ { printf "%d", $2 / 1024 * 0.8 }' /proc/meminfo 2>/dev/null || true)
	[ -n "$mem" ] && [ "$mem" -gt 0 ] || mem=1000
	cpus=$(nproc)

	# munge with a key of our own, on our own socket.
	dd if=/dev/urandom of="$slurm_work/munge.key" bs=1024 count=1 status=none
	chmod 400 "$slurm_work/munge.key"
	munged --foreground --force --key-file="$slurm_work/munge.key" --socket="$slurm_work/munge.socket" \
		--pid-file="$slurm_work/munged.pid" --log-file="$slurm_work/munged.log" --seed-file="$slurm_work/munge.seed" \
		>"$slurm_work/munged.out.log" 2>&1 &
	slurm_pids+=($!)

	mkdir -p "$slurm_work/state" "$slurm_work/spool" "$slurm_work/out"
	export SLURM_CONF="$slurm_work/slurm.conf"
	cat >"$SLURM_CONF" <<CONF
ClusterName=censustest
SlurmctldHost=$host(127.0.0.1)
SlurmctldPort=16817
SlurmdPort=16818
AuthType=auth/munge
AuthInfo=socket=$slurm_work/munge.socket
CredType=cred/munge
SlurmUser=root
SlurmdUser=root
StateSaveLocation=$slurm_work/state
SlurmdSpoolDir=$slurm_work/spool
SlurmctldPidFile=$slurm_work/slurmctld.pid
SlurmdPidFile=$slurm_work/slurmd.pid
SlurmctldLogFile=$slurm_work/slurmctld.log
SlurmdLogFile=$slurm_work/slurmd.log
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
MinJobAge=65533
NodeName=$host NodeAddr=127.0.0.1 CPUs=$cpus RealMemory=$mem State=UNKNOWN
PartitionName=census Nodes=$host Default=YES MaxTime=INFINITE State=UP
CONF

	# Wait for munged's socket before the Slurm daemons need it.
	local _
	for _ in $(seq 100); do [ -S "$slurm_work/munge.socket" ] && break; sleep 0.1; done
	slurmctld -D -c >"$slurm_work/slurmctld.out.log" 2>&1 &
	slurm_pids+=($!)
	slurmd -D -N "$host" >"$slurm_work/slurmd.out.log" 2>&1 &
	slurm_pids+=($!)

	local start
	start=$(date +%s)
	until [ "$(sinfo -h -n "$host" -o %t 2>/dev/null)" = idle ]; do
		if [ $(($(date +%s) - start)) -gt 60 ]; then
			echo "slurm: the node did not become idle within 60 s" >&2
			return 1
		fi
		sleep 0.5
	done
	echo "slurm: one-node cluster up ($cpus CPUs, $mem MB) after $(($(date +%s) - start)) s"
}

# slurm_submit_array SHARDS LOGDIR [FLAGS...]: submit
# scripts/census-array.sbatch as the array 1-SHARDS, with the CENSUS_*
# and AVOIDCERT variables of the caller's environment; print the job id.
slurm_submit_array() {
	local shards=$1 logs=$2
	shift 2
	local job
	job=$(cd "$logs" && sbatch --parsable --array=1-"$shards" --output="$logs/census-%a.log" "$@" \
		"$slurm_repo/scripts/census-array.sbatch")
	echo "${job%%;*}"
}

# slurm_wait_array JOB SHARDS TIMEOUT: wait until the array has left the
# queue (at most TIMEOUT seconds, then cancel it), then fail unless every
# task exited 0.
slurm_wait_array() {
	local job=$1 shards=$2 timeout=$3 begin i
	begin=$(date +%s)
	while [ -n "$(squeue -h -j "$job" 2>/dev/null)" ]; do
		if [ $(($(date +%s) - begin)) -gt "$timeout" ]; then
			echo "slurm: the job array did not finish within $timeout s" >&2
			scancel "$job" || true
			return 1
		fi
		sleep 2
	done
	for i in $(seq "$shards"); do
		if ! scontrol show job "${job}_$i" | grep -q 'ExitCode=0:0'; then
			echo "slurm: array task $i failed:" >&2
			scontrol show job "${job}_$i" | grep -E 'JobState|ExitCode' >&2 || true
			return 1
		fi
	done
	echo "slurm: job array $job done after $(($(date +%s) - begin)) s"
}

slurm_repo=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
