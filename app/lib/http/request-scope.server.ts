import { AsyncLocalStorage } from "node:async_hooks";

// One HTTP request's scope, opened by the root middleware around everything that answers it. A page
// load runs several loaders (the root, the project layout, the page), each with a Request object of
// its own, and each asked again for the session, the user, the project and the membership: 12 of
// the overview's 24 queries. Within the scope a reading request resolves each once.

const scope = new AsyncLocalStorage<Map<string, Promise<unknown>>>();

/** Runs `answer` (the rest of the request's handling) in a scope of its own. */
export function inRequestScope<T>(answer: () => Promise<T>): Promise<T> {
  return scope.run(new Map(), answer);
}

const READING_METHODS = new Set(["GET", "HEAD"]);

/**
 * `compute()` once per HTTP request and key, for a reading request. A request that changes
 * something (an action) always computes afresh and keeps nothing, so the loaders that run after an
 * action (reading requests of their own) see what it changed. Outside a scope (scripts, tests that
 * call a loader directly) it simply computes.
 */
export function oncePerRequest<T>(request: Request, key: string, compute: () => Promise<T>): Promise<T> {
  const answers = scope.getStore();
  if (!answers || !READING_METHODS.has(request.method.toUpperCase())) return compute();
  let answer = answers.get(key) as Promise<T> | undefined;
  if (!answer) {
    answer = compute();
    answers.set(key, answer);
  }
  return answer;
}
