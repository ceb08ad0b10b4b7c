/**
 * Cumulative removed volume by survey date, per zone and for the project, from the snapshot each
 * survey date leaves. Removal is measured against the baseline, so a snapshot's removed volume is
 * already cumulative.
 */

export interface SnapshotFiguresInput {
  surveyedOn: string;
  removedVolume: number;
  remainingVolume: number;
  /** zoneId null: the Unzoned row (cells inside the work limit in no zone). */
  zones: ReadonlyArray<{ zoneId: number | null; removedVolume: number; remainingVolume: number }>;
}

export interface ProgressSeries {
  /** Survey dates, oldest first. */
  dates: string[];
  /** Project volume unit, one value per date. */
  totalRemovedVolume: Float64Array;
  totalRemainingVolume: Float64Array;
  zones: Array<{ zoneId: number | null; removedVolume: Float64Array; remainingVolume: Float64Array }>;
}

export function progressSeries(snapshots: readonly SnapshotFiguresInput[], zoneIds: ReadonlyArray<number | null>): ProgressSeries {
  const ordered = [...snapshots].sort((a, b) => (a.surveyedOn < b.surveyedOn ? -1 : a.surveyedOn > b.surveyedOn ? 1 : 0));
  const count = ordered.length;
  const series: ProgressSeries = {
    dates: ordered.map((snapshot) => snapshot.surveyedOn),
    totalRemovedVolume: Float64Array.from(ordered, (snapshot) => snapshot.removedVolume),
    totalRemainingVolume: Float64Array.from(ordered, (snapshot) => snapshot.remainingVolume),
    zones: zoneIds.map((zoneId) => ({ zoneId, removedVolume: new Float64Array(count), remainingVolume: new Float64Array(count) })),
  };
  series.zones.forEach((zone) => {
    ordered.forEach((snapshot, index) => {
      const figures = snapshot.zones.find((candidate) => candidate.zoneId === zone.zoneId);
      // A zone missing from a snapshot (added later) has had nothing measured: NaN, not zero.
      zone.removedVolume[index] = figures ? figures.removedVolume : Number.NaN;
      zone.remainingVolume[index] = figures ? figures.remainingVolume : Number.NaN;
    });
  });
  return series;
}
