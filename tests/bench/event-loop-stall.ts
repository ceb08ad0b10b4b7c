import { monitorEventLoopDelay } from "node:perf_hooks";

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
// With --expose-gc (NODE_OPTIONS=--expose-gc) each case starts from a collected heap, so one
// case's garbage is not collected during the next.
const collect = (globalThis as { gc?: () => void }).gc;
/** Whether the benches run with --expose-gc (each case from a collected heap). */
export const collectsBetweenCases = collect !== undefined;

/**
 * The longest event-loop stall and the wall time while `work` runs (the engine and period
 * event-loop benches). The histogram's timer must fire after the work for a stall to be recorded,
 * hence the pause on either side.
 */
export async function measureEventLoopStall(work: () => Promise<unknown>) {
  collect?.();
  await pause(100);
  const histogram = monitorEventLoopDelay({ resolution: 10 });
  histogram.enable();
  await pause(20);
  const started = performance.now();
  await work();
  const seconds = (performance.now() - started) / 1000;
  await pause(50);
  histogram.disable();
  return { seconds, maxDelayMs: histogram.max / 1e6, p99DelayMs: histogram.percentile(99) / 1e6 };
}
