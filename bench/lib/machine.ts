/** The machine a run was measured on, recorded beside its figures. */
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
