#!/usr/bin/env bash
# Measures the census class by class on a random sample of the symmetry
# classes of one length: each class is run alone as a one-class shard
# (avoidcert census --shard I/C with C the number of classes: counts to N,
# structure, bracket at the census's digits, the checker's acceptance),
# under /usr/bin/time, one after the other (--jobs 1).
#
#   scripts/census-sample.sh LENGTH TO DIGITS SAMPLE SEED OUT.tsv
#   scripts/census-sample.sh 8 25 10 200 1 docs/census-8/sample.tsv
#
# OUT.tsv gets one line per class: the class's index (1-based shard), its
# representative, wall seconds, CPU seconds (user and system) and peak
# resident memory of the whole command, the census's own wall seconds for
# the class (its journal), the n of the final bracket, the structure class
# and primitivity exponent, the certified lambda and its digits, and the
# machine's 1-minute load average when the class started. The summary (on
# stdout) extrapolates the sample's mean CPU time to every class (a census
# with one worker per core is bound by CPU time; wall times depend on the
# machine's load, which the file records) and gives the shard count for a
# 100-core cluster.
# The sample is drawn with a fixed linear congruential generator, so a
# seed names the same classes on every machine.
set -euo pipefail
cd "$(dirname "$0")/.."

if [ $# -ne 6 ]; then
	echo "usage: scripts/census-sample.sh LENGTH TO DIGITS SAMPLE SEED OUT.tsv" >&2
	exit 2
fi
LENGTH=$1 TO=$2 DIGITS=$3 SAMPLE=$4 SEED=$5 OUT=$6
command -v /usr/bin/time >/dev/null || { echo "census-sample: /usr/bin/time is missing (apt-get install time)" >&2; exit 2; }

work=$(mktemp -d /tmp/census-sample.XXXXXX)
trap 'rm -rf "$work"' EXIT
go build -o "$work/avoidcert" ./cmd/avoidcert

# The number of symmetry classes of the length: a shard count above it is
# refused with a message that names it.
classes=$( ("$work/avoidcert" census --length "$LENGTH" --shard 1/1000000 2>&1 || true) | sed -n 's/.*there are only \([0-9]*\) classes.*/\1/p')
[ -n "$classes" ] || { echo "census-sample: cannot tell the number of classes of length $LENGTH" >&2; exit 1; }
[ "$SAMPLE" -le "$classes" ] || { echo "census-sample: a sample of $SAMPLE from $classes classes" >&2; exit 2; }

# A partial Fisher-Yates shuffle of 1..classes driven by the generator
# x -> (6364136223846793005 x + 1442695040888963407) mod 2^64 (Knuth's
# MMIX constants; bash arithmetic wraps at 64 bits), high bits used.
declare -a perm
for ((i = 1; i <= classes; i++)); do perm[i]=$i; done
x=$SEED
for ((i = 1; i <= SAMPLE; i++)); do
	x=$(( x * 6364136223846793005 + 1442695040888963407 ))
	r=$(( (x >> 33) & 0x7fffffff ))
	j=$(( i + r % (classes - i + 1) ))
	t=${perm[i]}; perm[i]=${perm[j]}; perm[j]=$t
done

mkdir -p "$(dirname "$OUT")"
printf 'index\trepresentative\twall_s\tcpu_s\tpeak_rss_kb\tclass_s\tbracket_n\tstructure\texponent\tlambda_lo\tlambda_hi\tdigits\tload1\n' >"$work/out.tsv"
for ((i = 1; i <= SAMPLE; i++)); do
	k=${perm[i]}
	load=$(cut -d' ' -f1 /proc/loadavg)
	dir="$work/shard-$k"
	status=0
	/usr/bin/time -f '%e %U %S %M' -o "$work/time" "$work/avoidcert" census --length "$LENGTH" --to "$TO" --digits "$DIGITS" \
		--shard "$k/$classes" --jobs 1 --quiet --out "$dir" >/dev/null 2>"$work/stderr" || status=$?
	read -r wall user sys rss < <(grep -v '^Command exited' "$work/time")
	cpu=$(awk -v u="$user" -v s="$sys" 'BEGIN { printf "%.2f", u + s }')
	if [ "$status" -ne 0 ]; then
		# A class the census could not finish (a budget: exit 3) is a
		# figure of the sample too: its row says so, with the time spent.
		printf '%s\t%s\t%s\t%s\t%s\t\t\tfailed (exit %s)\t\t\t\t\t%s\n' "$k" "?" "$wall" "$cpu" "$rss" "$status" "$load" >>"$work/out.tsv"
		printf '%d/%d class %d: exit %s after %s s: %s\n' "$i" "$SAMPLE" "$k" "$status" "$wall" "$(tail -n 1 "$work/stderr")" >&2
		rm -rf "$dir"
		continue
	fi
	# rank,representative,members,group,lambda_lo,lambda_hi,radius_lo,radius_hi,
	# structure_class,primitivity_exponent,...,lambda_digits (column 19)
	IFS=, read -r _ rep _ _ lo hi _ _ class exponent _ _ _ _ _ _ _ _ digits _ < <(sed -n 2p "$dir/census.csv")
	seconds=$(sed -n 's/^  "seconds": \(.*\)$/\1/p' "$dir/journal/$rep.json")
	n=$(grep -o '"n": [0-9]*' "$dir/certificates/$rep.json" | awk '{ if ($2 > m) m = $2 } END { print m }')
	printf '%s\t%s\t%s\t%s\t%s\t%.3f\t%s\t%s\t%s\t%s\t%s\t%s\t%s\n' "$k" "$rep" "$wall" "$cpu" "$rss" "$seconds" "$n" "$class" "$exponent" "$lo" "$hi" "$digits" "$load" >>"$work/out.tsv"
	rm -rf "$dir"
	printf '%d/%d %s: wall %s s, CPU %s s, load %s\n' "$i" "$SAMPLE" "$rep" "$wall" "$cpu" "$load" >&2
done
cp "$work/out.tsv" "$OUT"

sort -t$'\t' -k4,4g <(tail -n +2 "$OUT") | awk -F'\t' -v classes="$classes" -v len="$LENGTH" -v to="$TO" -v digits="$DIGITS" '
	{ cpu[NR] = $4; sum += $4; wall += $3; if ($5 > rss) { rss = $5; big = $2 } load += $13; name[NR] = $2; if ($8 ~ /^failed/) failed++ }
	END {
		n = NR
		printf "sample: %d of the %d classes of length %d (counts to %d, %d digits), one at a time\n", n, classes, len, to, digits
		printf "CPU per class: median %.2f s, 90th percentile %.2f s, 99th %.2f s, max %.2f s (%s); mean %.3f s (wall: mean %.3f s)\n", cpu[int((n + 1) / 2)], cpu[int(0.9 * n + 0.5)], cpu[int(0.99 * n + 0.5)], cpu[n], name[n], sum / n, wall / n
		printf "peak memory of one class: %.0f MB (%s)\n", rss / 1024, big
		printf "classes that failed (a budget): %d\n", failed
		printf "mean 1-minute load average during the sample: %.2f\n", load / n
		total = sum / n * classes
		printf "extrapolated: %.0f s of CPU for all %d classes (%.1f h); on 2 cores %.1f h\n", total, classes, total / 3600, total / 7200
		printf "100 cores: 100 shards of about %d classes, about %.0f min each (the slowest class alone takes %.0f s)\n", int((classes + 99) / 100), total / 100 / 60, cpu[n]
	}'
