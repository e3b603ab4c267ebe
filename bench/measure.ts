/**
 * Runs `work` repeatedly for about `seconds` of this process's CPU time (after a warm-up, so
 * the JIT has compiled the hot path) and returns calls per CPU second: a one-core figure that a
 * busy machine disturbs less than wall-clock time would.
 */
export function callsPerCpuSecond(work: (i: number) => void, seconds: number, warmup = 200): number {
  for (let i = 0; i < warmup; i++) work(i);
  const start = process.cpuUsage();
  let calls = 0;
  let used = 0;
  while (used < seconds * 1e6) {
    for (let i = 0; i < 20; i++) work(calls + i);
    calls += 20;
    const now = process.cpuUsage(start);
    used = now.user + now.system;
  }
  return calls / (used / 1e6);
}
