import routeConfig from "../app/routes";

/**
 * Every route in app/routes.ts with its full path and file (nested paths joined; an index route
 * has its parent's path). The access matrix and the bad-bodies suite check their hand-written
 * lists against it, so a new route without a row fails both.
 */
export function configuredRoutes(): Array<{ path: string; file: string }> {
  type Entry = { path?: string; index?: boolean; file: string; children?: Entry[] };
  const walk = (entries: Entry[], parent: string): Array<{ path: string; file: string }> =>
    entries.flatMap((entry) => {
      const path = entry.index ? parent : [parent, entry.path].filter(Boolean).join("/");
      return [{ path, file: entry.file }, ...walk(entry.children ?? [], path)];
    });
  return walk(routeConfig as Entry[], "");
}
