// Preloaded with `node --import` into every process the benchmark measures (the command line
// included, without touching its code): when the process exits, its peak resident set size is
// written to the file named by LEVELWISE_BENCH_PEAK_RSS_FILE. On Linux that is VmHWM from
// /proc/self/status (what `/usr/bin/time -v` reports as "Maximum resident set size"); elsewhere
// process.resourceUsage().maxRSS, the same figure from getrusage.
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

if (target) process.on('exit', () => writeFileSync(target, String(peakRssBytes())));
