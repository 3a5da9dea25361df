/** The machine a run was measured on, recorded beside its figures. */
import { readFileSync } from 'node:fs';
import { cpus, totalmem, platform, release } from 'node:os';

export interface Machine {
  readonly cpu: string;
  /** Logical processors Node sees. */
  readonly cores: number;
  readonly memoryBytes: number;
  readonly node: string;
  readonly os: string;
  /** ISO 8601, UTC. */
  readonly date: string;
}

export function describeMachine(now: Date = new Date()): Machine {
  const processors = cpus();
  return {
    cpu: processors[0]?.model.trim() ?? 'unknown',
    cores: processors.length,
    memoryBytes: totalmem(),
    node: process.version,
    os: `${platform()} ${release()}`,
    date: now.toISOString(),
  };
}

export function machineLine(machine: Machine): string {
  const gib = (machine.memoryBytes / 2 ** 30).toFixed(1);
  return `${machine.cpu}, ${machine.cores} cores, ${gib} GiB, Node ${machine.node}, ${machine.os}, ${machine.date}`;
}

/** The machine's CPU time counters so far (Linux: the "cpu" line of /proc/stat, in clock ticks); null elsewhere. */
export interface CpuTicks {
  readonly busy: number;
  readonly idle: number;
  /** Time the host gave to other guests while this one wanted to run (virtual machines). */
  readonly steal: number;
}

export function readCpuTicks(stat: () => string = () => readFileSync('/proc/stat', 'utf8')): CpuTicks | null {
  let text: string;
  try {
    text = stat();
  } catch {
    return null;
  }
  // cpu  user nice system idle iowait irq softirq steal guest guest_nice (proc(5)); guest time is in user already.
  const fields = /^cpu\s+(.*)$/m.exec(text)?.[1]?.trim().split(/\s+/).map(Number);
  if (fields === undefined || fields.length < 8 || fields.some((n) => !Number.isFinite(n))) return null;
  const [user = 0, nice = 0, system = 0, idle = 0, iowait = 0, irq = 0, softirq = 0, steal = 0] = fields;
  return { busy: user + nice + system + irq + softirq, idle: idle + iowait, steal };
}

/** Shares of all CPU time between two readings: how much of it went to other guests of the host. */
export function cpuShares(start: CpuTicks | null, end: CpuTicks | null): { readonly busy: number; readonly steal: number } | null {
  if (start === null || end === null) return null;
  const busy = end.busy - start.busy;
  const steal = end.steal - start.steal;
  const all = busy + steal + (end.idle - start.idle);
  return all > 0 ? { busy: busy / all, steal: steal / all } : null;
}
