/**
 * Searching coordinate reference systems by EPSG code or by words of their name ("Florida East",
 * "utm 17n"), over a list the caller supplies (the server builds it from the bundled EPSG list).
 * Pure: no I/O. A query is a code when it is digits (optionally after "EPSG:"); otherwise every
 * word of the query must begin a word of the name (or its area of use, which ranks lower).
 */
export interface CrsEntry {
  code: number;
  name: string;
  /** The EPSG unit name, e.g. "US survey foot". */
  unit: string;
  /** Where the CRS is used, as the registry words it (may be empty). */
  area: string;
}

export interface CrsMatch extends CrsEntry {
  /** Why it matched: the code, or words of the name or area. */
  matchedBy: "code" | "name" | "area";
}

/** Lower case, without accents; "17N" and "(ftUS)" stay one word each. */
function words(text: string): string[] {
  return text.normalize("NFKD").replace(/[\u0300-\u036f]/g, "").toLowerCase().split(/[^a-z0-9]+/).filter(Boolean);
}

// Each list's words, split once (the server's list holds about 5,100 entries and is searched per keystroke).
const preparedLists = new WeakMap<readonly CrsEntry[], Array<{ nameWords: string[]; areaWords: string[] }>>();
function prepared(entries: readonly CrsEntry[]) {
  let list = preparedLists.get(entries);
  if (!list) {
    list = entries.map((entry) => ({ nameWords: words(entry.name), areaWords: words(entry.area) }));
    preparedLists.set(entries, list);
  }
  return list;
}

const everyWordBegins = (query: string[], target: string[]) => query.every((word) => target.some((candidate) => candidate.startsWith(word)));

/**
 * The entries matching `query`, best first, at most `limit`: the exact code, then codes that begin
 * with the digits (shortest first), then names in which the words appear in the query's order
 * before names that hold them in another order, then areas; ties by name length, then code.
 */
export function searchCrs(entries: readonly CrsEntry[], query: string, limit = 20): CrsMatch[] {
  const trimmed = query.trim();
  if (!trimmed) return [];
  const code = /^(?:epsg\s*:?\s*)?(\d{1,6})$/i.exec(trimmed);
  if (code) {
    const digits = code[1];
    return entries
      .filter((entry) => String(entry.code).startsWith(digits))
      .sort((a, b) => String(a.code).length - String(b.code).length || a.code - b.code)
      .slice(0, limit)
      .map((entry) => ({ ...entry, matchedBy: "code" as const }));
  }
  const queryWords = words(trimmed.replace(/^epsg\s*:?\s*/i, ""));
  if (queryWords.length === 0) return [];
  const scored: Array<{ match: CrsMatch; rank: number }> = [];
  const wordsOf = prepared(entries);
  for (const [index, entry] of entries.entries()) {
    const { nameWords, areaWords } = wordsOf[index];
    if (everyWordBegins(queryWords, nameWords)) {
      // In order: each query word begins a name word after the previous one's.
      let position = -1;
      const inOrder = queryWords.every((word) => {
        const found = nameWords.findIndex((candidate, index) => index > position && candidate.startsWith(word));
        position = found;
        return found >= 0;
      });
      scored.push({ match: { ...entry, matchedBy: "name" }, rank: inOrder ? 0 : 1 });
    } else if (everyWordBegins(queryWords, [...nameWords, ...areaWords])) {
      scored.push({ match: { ...entry, matchedBy: "area" }, rank: 2 });
    }
  }
  return scored
    .sort((a, b) => a.rank - b.rank || a.match.name.length - b.match.name.length || a.match.code - b.match.code)
    .slice(0, limit)
    .map((entry) => entry.match);
}
