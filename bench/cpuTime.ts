import { readFileSync } from 'node:fs';

// CPU-time readings from /proc for the scale-out benchmark.

const CLOCK_TICKS = 100; // USER_HZ on Linux

/**
 * The share of this machine's CPU time the hypervisor gave to other guests ("steal" in
 * /proc/stat) between two readings. Wall-clock rates drop by about that share; on these virtual
 * machines it has been seen at 0 to 20% from one run to the next.
 */
export interface CpuTicks {
  steal: number;
  total: number;
}

export function cpuTicks(): CpuTicks {
  // cpu  user nice system idle iowait irq softirq steal guest guest_nice
  const fields = readFileSync('/proc/stat', 'utf8').split('\n')[0]!.trim().split(/\s+/).slice(1, 9).map(Number);
  return { steal: fields[7]!, total: fields.reduce((sum, x) => sum + x, 0) };
}

export function stealPercent(before: CpuTicks, after: CpuTicks): number {
  const total = after.total - before.total;
  return total > 0 ? (100 * (after.steal - before.steal)) / total : 0;
}

/** CPU seconds (user + system) from a /proc stat file: a process's (all threads) or one thread's. */
export function cpuSecondsOf(statPath: string): number {
  const stat = readFileSync(statPath, 'utf8');
  const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  return (Number(fields[11]) + Number(fields[12])) / CLOCK_TICKS; // utime + stime
}

export const processCpuSeconds = (pid: number): number => cpuSecondsOf(`/proc/${pid}/stat`);
