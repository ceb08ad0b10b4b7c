import { useEffect, useId, useRef, useState } from "react";
import { useFetcher } from "react-router";

interface Answer {
  intent: string;
  errors: Record<string, string>;
  notice: string | null;
}

/**
 * "Make a zone of the selected cells", in the map's panel for those who configure the project:
 * the cells' squares, joined and clipped to the work limit, become a new zone named here, saved
 * through the settings page's action and so through the one zones service (its checks, settings
 * version, recompute and audit entry). A cell is held by the zone whose outline holds its centre;
 * where zones overlap, the earlier keeps the shared cells, so a new zone (last in the order) takes
 * only cells no other zone holds.
 */
export function ZoneFromCells({ projectId, selectedLabels, onMade }: { projectId: number; selectedLabels: string[]; onMade: () => void }) {
  const fetcher = useFetcher<Answer>();
  const nameId = useId();
  const [name, setName] = useState("");
  const answer = fetcher.state === "idle" ? fetcher.data : undefined;
  const handled = useRef<Answer | undefined>(undefined);
  useEffect(() => {
    if (!answer || handled.current === answer) return;
    handled.current = answer;
    if (answer.notice) {
      setName("");
      onMade();
    }
  }, [answer, onMade]);
  const error = answer && !answer.notice ? answer.errors.name ?? answer.errors.cells ?? answer.errors.geometry ?? answer.errors.form ?? Object.values(answer.errors).join(" ") : null;
  const count = selectedLabels.length;
  return (
    <fetcher.Form method="post" action={`/projects/${projectId}/settings`} className="space-y-2 rounded border border-line p-3 text-sm" aria-label="Make a zone of the selected cells">
      <h3 className="text-base font-semibold">Make a zone of the selected cells</h3>
      <p className="text-muted">The zone is the selected cells' squares, inside the work limit; it goes last in the zones' order, so cells another zone holds stay in that zone.</p>
      <input type="hidden" name="cells" value={selectedLabels.join(",")} />
      <p className="figures break-words text-muted" data-testid="zone-cells">{count > 0 ? selectedLabels.join(", ") : "Select cells: click, shift-click, or shift-drag a box."}</p>
      <label htmlFor={nameId} className="block font-medium">Name of the new zone</label>
      <input
        id={nameId} name="name" required maxLength={120} value={name} onChange={(event) => setName(event.target.value)}
        aria-invalid={error ? true : undefined} aria-describedby={`${nameId}-answer`}
        className="block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon"
      />
      <button type="submit" name="intent" value="zone-from-cells" disabled={count === 0 || fetcher.state !== "idle"} className="rounded bg-lagoon px-3 py-2 text-white disabled:opacity-50">
        {fetcher.state !== "idle" ? "Saving…" : `Make a zone of ${count} ${count === 1 ? "cell" : "cells"}`}
      </button>
      <div id={`${nameId}-answer`} data-testid="zone-from-cells-answer">
        {answer?.notice ? <p role="status" className="text-ok">{answer.notice}</p> : null}
        {error ? <p role="alert" className="text-danger">{error}</p> : null}
      </div>
    </fetcher.Form>
  );
}
