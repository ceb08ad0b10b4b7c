import { useEffect, useState } from "react";
import type { CellStatus } from "../../../shared/cell-status";
import { STATUS_LABELS } from "../../../shared/palette";
import { HistoryChart } from "./history-chart";
import type { CellDetail } from "~/models/cells-presenter";
import type { DiveView } from "~/models/dives.server";


/** The cell's logged dives (GET /api/projects/<id>/dives?cell=), read beside its figures. */
function useCellDives(projectId: number, label: string | null, refresh: number) {
  const [dives, setDives] = useState<{ label: string; dives: DiveView[]; caution: string } | null>(null);
  useEffect(() => {
    if (!label) return;
    let cancelled = false;
    fetch(`/api/projects/${projectId}/dives?cell=${encodeURIComponent(label)}`)
      .then(async (response) => (response.ok ? ((await response.json()) as { dives: DiveView[]; caution: string }) : null))
      .then((body) => !cancelled && setDives(body ? { label, ...body } : null))
      .catch(() => !cancelled && setDives(null));
    return () => {
      cancelled = true;
    };
  }, [projectId, label, refresh]);
  return dives && dives.label === label ? dives : null;
}

function CellDives({ dives, lengthLabel }: { dives: { dives: DiveView[]; caution: string } | null; lengthLabel: string }) {
  if (!dives) return <p className="text-muted">Reading the dive log…</p>;
  if (dives.dives.length === 0) return <p className="text-muted">No dives logged.</p>;
  const flagged = dives.dives.some((dive) => dive.noDecompression?.exceeds);
  return (
    <>
      <ul data-testid="inspector-dives">
        {dives.dives.map((dive) => {
          const beyond = dive.noDecompression?.exceeds === true;
          return (
            <li key={dive.id} className={beyond ? "text-danger" : ""}>
              {dive.date}: {dive.team}, {dive.diver}{dive.visitor ? " (visitor)" : ""}, {dive.bottomMinutes} min bottom time, {dive.maxDepth.toFixed(1)} {lengthLabel} max depth
              {beyond ? <strong> — beyond the table's no-decompression figure</strong> : null}
            </li>
          );
        })}
      </ul>
      {flagged ? <p role="note" className="text-xs text-caution">{dives.caution}</p> : null}
    </>
  );
}

/** The clicked cell's figures, soundings, history, assignments and dives (fetched on selection). */
export function CellInspector({ projectId, label, labels, refresh }: { projectId: number; label: string | null; labels: { length: string; volume: string }; refresh: number }) {
  const [detail, setDetail] = useState<CellDetail | null>(null);
  const [error, setError] = useState<string | null>(null);
  const dives = useCellDives(projectId, label, refresh);
  useEffect(() => {
    if (!label) return;
    let cancelled = false;
    setError(null);
    fetch(`/api/projects/${projectId}/cells/${encodeURIComponent(label)}`)
      .then(async (response) => {
        const body = await response.json();
        if (cancelled) return;
        if (!response.ok) {
          setDetail(null);
          setError((body.errors as Array<{ message: string }> | undefined)?.[0]?.message ?? "The cell could not be read.");
        } else setDetail(body);
      })
      .catch(() => !cancelled && setError("The cell could not be read."));
    return () => {
      cancelled = true;
    };
  }, [projectId, label, refresh]);
  if (!label) return <p className="text-sm text-muted">Click a cell (or search for its label) to see its figures.</p>;
  if (error) return <p className="text-sm text-danger">{error}</p>;
  if (!detail || detail.label !== label) return <p className="text-sm text-muted">Reading cell {label}…</p>;
  const volume = (value: number) => `${value.toFixed(1)} ${labels.volume}`;
  return (
    <section aria-label={`Cell ${detail.label}`} className="space-y-2 text-sm">
      <h3 className="text-base font-semibold">Cell {detail.label}{detail.zone ? ` · ${detail.zone}` : ""}</h3>
      <dl className="figures grid grid-cols-2 gap-x-3 gap-y-1">
        <dt>Status</dt><dd data-testid="inspector-status">{STATUS_LABELS[detail.status]}</dd>
        <dt>Planned</dt><dd>{volume(detail.plannedVolume)}</dd>
        <dt>Removed</dt><dd>{volume(detail.removedVolume)}</dd>
        <dt>Remaining</dt><dd>{volume(detail.remainingVolume)}</dd>
        <dt>Mean thickness left</dt><dd>{detail.meanRemainingThickness === null ? "not surveyed" : `${detail.meanRemainingThickness.toFixed(2)} ${labels.length}`}</dd>
        <dt>Coverage</dt><dd>{(detail.coverage * 100).toFixed(0)} %</dd>
        <dt>Soundings</dt><dd data-testid="inspector-soundings">{detail.soundings ?? "—"}</dd>
        <dt>Deepest latest bottom</dt><dd>{detail.workingDepth === null ? "—" : `${detail.workingDepth.toFixed(1)} ${labels.length}`}</dd>
      </dl>
      <HistoryChart history={detail.history} volumeLabel={labels.volume} />
      <h4 className="font-semibold">Assignments</h4>
      {detail.assignments.length === 0 ? <p className="text-muted">None yet.</p> : (
        <ul>{detail.assignments.map((assignment) => <li key={assignment.date}>{assignment.date}: {assignment.team}, {assignment.hose}{assignment.notes ? ` — ${assignment.notes}` : ""}</li>)}</ul>
      )}
      <h4 className="font-semibold">Dives</h4>
      <CellDives dives={dives} lengthLabel={labels.length} />
    </section>
  );
}
