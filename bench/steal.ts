import { readFileSync } from 'node:fs';

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
