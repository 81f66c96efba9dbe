package main

import (
	"bytes"
	"os"
	"strconv"
	"strings"
)

// machineMemory is the memory this process can have: the machine's
// physical memory (MemTotal of /proc/meminfo), or the cgroup's limit when
// that is lower (a container, a CI runner, a Slurm job). ok is false when
// neither can be read.
func machineMemory() (bytes int64, what string, ok bool) {
	if total, ok := memTotal(); ok {
		bytes, what = total, "this machine's memory"
	}
	if limit, ok := cgroupLimit(); ok && (bytes == 0 || limit < bytes) {
		bytes, what = limit, "the memory limit of this process's control group"
	}
	return bytes, what, bytes > 0
}

// memTotal reads MemTotal (in KiB) from /proc/meminfo.
func memTotal() (int64, bool) {
	data, err := os.ReadFile("/proc/meminfo") // a kernel file of a few KiB, not user input
	if err != nil {
		return 0, false
	}
	for line := range bytes.Lines(data) {
		if rest, ok := bytes.CutPrefix(line, []byte("MemTotal:")); ok {
			kib, err := strconv.ParseInt(strings.TrimSuffix(strings.TrimSpace(string(rest)), " kB"), 10, 64)
			return kib << 10, err == nil && kib > 0
		}
	}
	return 0, false
}

// cgroupLimit reads the cgroup v2 memory limit of this process ("max" is
// none).
func cgroupLimit() (int64, bool) {
	data, err := os.ReadFile("/sys/fs/cgroup/memory.max") // a kernel file, not user input
	if err != nil {
		return 0, false
	}
	v, err := strconv.ParseInt(strings.TrimSpace(string(data)), 10, 64)
	return v, err == nil && v > 0
}
