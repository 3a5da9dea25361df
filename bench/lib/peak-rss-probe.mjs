// Preloaded with `node --import` into every process the benchmark measures (the command line
// included, without touching its code): when the process exits, its peak resident set size and
// the CPU time it used are written, as JSON, to the file named by LEVELWISE_BENCH_PEAK_RSS_FILE.
// The peak is VmHWM from /proc/self/status on Linux (what `/usr/bin/time -v` reports as "Maximum
// resident set size"), elsewhere process.resourceUsage().maxRSS, the same figure from getrusage.
// The CPU time is user + system of the whole process, every thread included (getrusage's
// RUSAGE_SELF): the work a run did, which moves less with a busy host than its wall clock.
import { readFileSync, writeFileSync } from 'node:fs';

const target = process.env.LEVELWISE_BENCH_PEAK_RSS_FILE;

function peakRssBytes() {
  try {
    const match = /^VmHWM:\s+(\d+)\s+kB$/m.exec(readFileSync('/proc/self/status', 'utf8'));
    if (match) return Number(match[1]) * 1024;
  } catch {
    // Not Linux: fall through to getrusage.
  }
  return process.resourceUsage().maxRSS * 1024;
}

function cpuSeconds() {
  const { user, system } = process.cpuUsage();
  return (user + system) / 1e6;
}

if (target) process.on('exit', () => writeFileSync(target, JSON.stringify({ peakRssBytes: peakRssBytes(), cpuSeconds: cpuSeconds() })));
