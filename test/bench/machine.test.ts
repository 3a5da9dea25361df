/**
 * The CPU time shares printed beside the benchmark's figures, from the "cpu" line of /proc/stat:
 * user nice system idle iowait irq softirq steal guest guest_nice, in clock ticks (Linux proc(5)).
 */
import { describe, expect, it } from 'vitest';
import { cpuShares, readCpuTicks } from '../../bench/lib/machine.ts';

const stat = (cpu: string): (() => string) => () => `${cpu}\ncpu0 1 2 3 4 5 6 7 8 0 0\nintr 12345\n`;

describe('CPU time shares', () => {
  it('reads busy, idle and stolen ticks from the first line (guest time is counted in user already)', () => {
    expect(readCpuTicks(stat('cpu  100 5 20 300 10 1 4 40 7 0'))).toEqual({ busy: 130, idle: 310, steal: 40 });
  });

  it('gives the shares of all CPU time between two readings', () => {
    const start = readCpuTicks(stat('cpu  100 0 0 100 0 0 0 0 0 0'));
    const end = readCpuTicks(stat('cpu  250 0 50 150 0 0 0 50 0 0'));
    // Between them: 200 busy, 50 idle, 50 stolen, of 300 ticks.
    expect(cpuShares(start, end)).toEqual({ busy: 200 / 300, steal: 50 / 300 });
  });

  it('is unknown without /proc/stat or with a line it does not know', () => {
    expect(readCpuTicks(() => { throw new Error('ENOENT'); })).toBeNull();
    expect(readCpuTicks(stat('cpu  1 2 3'))).toBeNull();
    expect(cpuShares(null, readCpuTicks(stat('cpu  1 2 3 4 5 6 7 8 9 10')))).toBeNull();
  });
});
