/**
 * One statistics rewrite at a time per project in this process. Imports, retractions and
 * restores each recompute the whole project; queuing them keeps every rewrite based on all the
 * surveys committed before it (the transaction also takes the project row FOR UPDATE, which
 * covers several processes).
 */
const queues = new Map<number, Promise<unknown>>();

export function withProjectLock<T>(projectId: number, work: () => Promise<T>): Promise<T> {
  const previous = queues.get(projectId) ?? Promise.resolve();
  const next = previous.catch(() => undefined).then(work);
  const settled = next.catch(() => undefined);
  queues.set(projectId, settled);
  void settled.then(() => {
    if (queues.get(projectId) === settled) queues.delete(projectId);
  });
  return next;
}
