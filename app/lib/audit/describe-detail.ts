/**
 * An audit entry's detail in words for the audit log page. A change recorded as `before` and
 * `after` (the project's settings) is said as what differs, leaf by leaf ("name: Spring A → Spring B;
 * zoneColours › Upper run: Teal → Slate"), not as the two whole objects; other keys follow as
 * `key: value`. Nested objects are walked with " › " between the keys; lists are joined with commas.
 */
type Leaves = Map<string, string>;

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

/** One recorded value in words: none for nothing, lists joined, objects as key: value. */
export function describeValue(value: unknown): string {
  if (value === null || value === undefined || value === "") return "none";
  if (Array.isArray(value)) return value.length === 0 ? "none" : value.map(describeValue).join(", ");
  if (isPlainObject(value)) return Object.entries(value).map(([key, inner]) => `${key}: ${describeValue(inner)}`).join(", ");
  return String(value);
}

function leavesOf(value: unknown, path: string, into: Leaves): Leaves {
  if (isPlainObject(value)) {
    for (const [key, inner] of Object.entries(value)) leavesOf(inner, path ? `${path} › ${key}` : key, into);
  } else {
    into.set(path, describeValue(value));
  }
  return into;
}

/** What differs between two recorded states, one "path: before → after" per changed leaf, in the order of `after`. */
export function describeChange(before: Record<string, unknown>, after: Record<string, unknown>): string[] {
  const was = leavesOf(before, "", new Map());
  const now = leavesOf(after, "", new Map());
  const changes: string[] = [];
  // "—": the leaf was not there on that side (a zone added, a section cleared). A leaf that is
  // "none" on the one side and missing on the other says nothing (a blank field of a new section).
  for (const [path, value] of now) {
    if (!was.has(path) && value === "none") continue;
    if (was.get(path) !== value) changes.push(`${path}: ${was.get(path) ?? "—"} → ${value}`);
  }
  for (const [path, value] of was) if (!now.has(path) && value !== "none") changes.push(`${path}: ${value} → —`);
  return changes;
}

export function describeAuditDetail(detail: Record<string, unknown>, valueWords: (key: string, value: unknown) => string = (_key, value) => describeValue(value)): string {
  const { before, after, ...rest } = detail;
  const parts: string[] = [];
  if (isPlainObject(before) && isPlainObject(after)) {
    const changes = describeChange(before, after);
    parts.push(changes.length > 0 ? changes.join("; ") : "nothing changed");
  } else {
    if (before !== undefined) rest.before = before;
    if (after !== undefined) rest.after = after;
  }
  for (const [key, value] of Object.entries(rest)) parts.push(`${key}: ${valueWords(key, value)}`);
  return parts.join("; ");
}
