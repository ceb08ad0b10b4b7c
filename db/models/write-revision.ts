import type { ModelStatic, Sequelize, Transaction } from "sequelize";

// The process's write revision: every create, update, upsert and delete that goes through a
// Sequelize model moves it on, once when the statement runs and once more when its transaction
// commits. The app's read cache (app/lib/cache/read-cache.server.ts) keeps an answer only while the
// revision it was computed at stands.

let revision = 0;

/** The process's write revision (for tests and diagnostics). */
export function writeRevision(): number {
  return revision;
}

/** Moves the revision on now and again when `transaction` (if any) commits. */
export function noteWrite(transaction?: Transaction | null): void {
  revision++;
  transaction?.afterCommit(() => {
    revision++;
  });
}

const INSTANCE_HOOKS = ["afterCreate", "afterUpdate", "afterSave", "afterDestroy", "afterUpsert"] as const;
const BULK_HOOKS = ["afterBulkCreate", "afterBulkUpdate", "afterBulkDestroy"] as const;

type HookOptions = { transaction?: Transaction | null; model?: unknown };

/** Registers the hooks that move the revision on every model write except `ignoredModels`'. Once per Sequelize instance. */
export function watchModelWrites(sequelize: Sequelize, ignoredModels: ReadonlySet<ModelStatic<never>>): void {
  const ignored = ignoredModels as ReadonlySet<unknown>;
  for (const hook of INSTANCE_HOOKS) {
    sequelize.addHook(hook, "firmsand-read-cache", ((subject: unknown, options?: HookOptions) => {
      // afterUpsert gets [instance, created]; the others the instance.
      const instance = Array.isArray(subject) ? subject[0] : subject;
      if (!ignored.has((instance as object | undefined)?.constructor)) noteWrite(options?.transaction);
    }) as never);
  }
  for (const hook of BULK_HOOKS) {
    sequelize.addHook(hook, "firmsand-read-cache", ((first: unknown, second?: HookOptions) => {
      // afterBulkCreate gets (instances, options); afterBulkUpdate and afterBulkDestroy (options).
      const options = (Array.isArray(first) ? second : first) as HookOptions | undefined;
      const model = options?.model ?? (Array.isArray(first) ? (first[0] as object | undefined)?.constructor : undefined);
      if (!ignored.has(model)) noteWrite(options?.transaction);
    }) as never);
  }
}

