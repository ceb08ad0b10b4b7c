/**
 * Air no-decompression limits, as information for dive planning only, never approval: the dive
 * supervisor's dive plan, the project's dive safety plan, the governing diving standard and the
 * permit conditions decide.
 *
 * Source of the figures: a transcription of the US Navy Diving Manual, revision 7, table 9-7
 * (no-decompression limits for air dives), RECALLED FROM MEMORY and not yet checked against the
 * manual: verify against the current US Navy Diving Manual before relying on them.
 * Rule: enter the table at the exact or next deeper depth (published, US Navy Diving Manual).
 */
export const NO_DECOMPRESSION_SOURCE =
  "US Navy Diving Manual rev. 7, table 9-7 (air), as recalled — verify against the current US Navy Diving Manual";

export const NO_DECOMPRESSION_CAUTION =
  "Information only, not approval. The dive supervisor's dive plan, the project's dive safety plan, the governing diving standard, the permit conditions and licensed practice decide every dive.";

/** Table rows: depth (feet of sea water) → limit in minutes; null = no limit listed ("unlimited"). */
export const AIR_NO_DECOMPRESSION_ROWS: ReadonlyArray<{ depthFsw: number; limitMinutes: number | null }> = [
  { depthFsw: 10, limitMinutes: null },
  { depthFsw: 15, limitMinutes: null },
  { depthFsw: 20, limitMinutes: null },
  { depthFsw: 25, limitMinutes: 1102 },
  { depthFsw: 30, limitMinutes: 371 },
  { depthFsw: 35, limitMinutes: 232 },
  { depthFsw: 40, limitMinutes: 163 },
  { depthFsw: 45, limitMinutes: 125 },
  { depthFsw: 50, limitMinutes: 92 },
  { depthFsw: 55, limitMinutes: 74 },
  { depthFsw: 60, limitMinutes: 63 },
];

export type NoDecompressionLookup =
  | { kind: "limit"; tableDepthFsw: number; limitMinutes: number }
  | { kind: "unlimited"; tableDepthFsw: number }
  /** Deeper than the rows held here: no figure is offered; the full table and the dive plan decide. */
  | { kind: "beyond-table"; tableDepthFsw: null };

/**
 * The row to read for a planned depth in feet of sea water: the exact or next deeper row.
 * Depths in fresh water are entered as if they were sea water here (the conservative reading
 * for springs and lakes), so callers pass the depth in feet as measured.
 */
export function noDecompressionLimit(depthFsw: number): NoDecompressionLookup {
  if (!Number.isFinite(depthFsw) || depthFsw < 0) throw new Error(`a planned depth must be a number of feet at or below the surface, not ${depthFsw}`);
  const row = AIR_NO_DECOMPRESSION_ROWS.find((candidate) => candidate.depthFsw >= depthFsw);
  if (!row) return { kind: "beyond-table", tableDepthFsw: null };
  return row.limitMinutes === null ? { kind: "unlimited", tableDepthFsw: row.depthFsw } : { kind: "limit", tableDepthFsw: row.depthFsw, limitMinutes: row.limitMinutes };
}

/** True when a planned bottom time exceeds the looked-up limit, or no figure exists for the depth. */
export function exceedsNoDecompressionLimit(depthFsw: number, bottomTimeMinutes: number): boolean {
  const lookup = noDecompressionLimit(depthFsw);
  if (lookup.kind === "unlimited") return false;
  if (lookup.kind === "beyond-table") return true;
  return bottomTimeMinutes > lookup.limitMinutes;
}
