import { useState } from "react";
import { Link } from "react-router";

export interface TeamOption {
  id: number;
  name: string;
  /** The team's hoses: `name` is what an assignment records, `label` adds its diameter. */
  hoses: Array<{ name: string; label: string }>;
  size: number;
  belowMinimum: boolean;
}

interface Outcome {
  kind: "ok" | "error" | "reason";
  message: string;
  details?: string[];
}

const CAUTION =
  "Caution: this plan is information for the dive supervisor. The project's dive safety plan, the supervisor's dive plan, the governing diving standard, the permit conditions and licensed practice decide every dive. No-decompression figures come from the US Navy air table as recalled; verify against the current US Navy Diving Manual.";

/** Assigns the selected cells to a date, a dive team and a hose, with notes. */
export function AssignPanel({ projectId, selectedLabels, confirmedLabels, teams, minTeamSize, workStopped, onAssigned }: {
  projectId: number;
  selectedLabels: string[];
  confirmedLabels: string[];
  teams: TeamOption[];
  minTeamSize: number;
  /** Set while a stop-work event or a stand-down is open: said above the form. */
  workStopped?: string | null;
  onAssigned: (date: string) => void;
}) {
  const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
  const [date, setDate] = useState(tomorrow);
  const [teamId, setTeamId] = useState<number>(teams[0]?.id ?? 0);
  const team = teams.find((candidate) => candidate.id === teamId) ?? teams[0];
  const [hose, setHose] = useState(team?.hoses[0]?.name ?? "");
  const [notes, setNotes] = useState("");
  const [bottomTime, setBottomTime] = useState("");
  const [reason, setReason] = useState("");
  const [outcome, setOutcome] = useState<Outcome | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    setOutcome(null);
    try {
      const response = await fetch(`/api/projects/${projectId}/assignments`, {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ date, team: team?.name, cells: selectedLabels, hose, notes, bottomTimeMinutes: bottomTime ? Number(bottomTime) : null, reason: reason || null }),
      });
      const body = await response.json();
      if (response.status === 201) {
        const details: string[] = [];
        if (body.teamBelowMinimum) details.push(`${body.team} lists ${body.teamBelowMinimum.size} people, below the project's minimum of ${body.teamBelowMinimum.minimum}.`);
        for (const [cell, info] of Object.entries(body.noDecompression as Record<string, { depthFt: number; lookup: { kind: string; tableDepthFsw: number | null; limitMinutes?: number }; exceeds: boolean | null } | null>)) {
          if (!info) { details.push(`${cell}: working depth unknown.`); continue; }
          const figure = info.lookup.kind === "limit" ? `${info.lookup.limitMinutes} min at the ${info.lookup.tableDepthFsw} fsw row` : info.lookup.kind === "unlimited" ? `no limit listed at the ${info.lookup.tableDepthFsw} fsw row` : "deeper than the rows held";
          details.push(`${cell}: working depth ${info.depthFt.toFixed(1)} ft; no-decompression figure ${figure}${info.exceeds ? " — PLANNED BOTTOM TIME EXCEEDS IT" : ""}.`);
        }
        setOutcome({ kind: "ok", message: `Assigned ${body.cells.length} cell(s) to ${body.team} on ${body.date}.`, details });
        onAssigned(body.date);
      } else {
        // The API's error shape: {errors: [{field?, message}], code?, …}.
        const message = (body.errors as Array<{ message: string }> | undefined)?.map((error) => error.message).join(" ") || `The plan was not saved (${response.status}).`;
        setOutcome({ kind: response.status === 422 && body.code === "reason-required" ? "reason" : "error", message });
      }
    } catch {
      setOutcome({ kind: "error", message: "The plan was not saved: the server did not answer." });
    } finally {
      setBusy(false);
    }
  }

  if (teams.length === 0) return <p className="text-sm text-muted">This project has no dive teams yet.</p>;
  const needsReason = confirmedLabels.length > 0 || outcome?.kind === "reason";
  return (
    <form onSubmit={submit} aria-label="Assign cells" className="space-y-2 text-sm">
      <h3 className="text-base font-semibold">Assign {selectedLabels.length} selected cell(s)</h3>
      {workStopped ? <p role="alert" data-testid="assign-work-stopped" className="rounded border-2 border-danger bg-[#fdecec] p-2 font-semibold text-danger">{workStopped}</p> : null}
      <p className="figures break-words text-muted" data-testid="selected-cells">{selectedLabels.join(", ") || "Select cells: click, shift-click, or shift-drag a box."}</p>
      <p role="note" className="rounded border border-caution bg-[#fff7e8] p-2 text-caution">{CAUTION}</p>
      <label className="block">Work date <input type="date" required value={date} onChange={(event) => setDate(event.target.value)} className="ml-2 rounded border border-line px-2 py-1" /></label>
      <label className="block">Dive team
        <select value={team?.id} onChange={(event) => { const next = teams.find((candidate) => candidate.id === Number(event.target.value)); setTeamId(Number(event.target.value)); setHose(next?.hoses[0]?.name ?? ""); }} className="ml-2 rounded border border-line px-2 py-1">
          {teams.map((candidate) => <option key={candidate.id} value={candidate.id}>{candidate.name} ({candidate.size} people)</option>)}
        </select>
      </label>
      {team?.belowMinimum ? <p className="text-danger" data-testid="team-size-flag">{team.name} lists {team.size} people, below the project's minimum team size of {minTeamSize}.</p> : null}
      <label className="block">Hose / station
        <select value={hose} onChange={(event) => setHose(event.target.value)} className="ml-2 rounded border border-line px-2 py-1">
          {team?.hoses.map((entry) => <option key={entry.name} value={entry.name}>{entry.label}</option>)}
        </select>
      </label>
      <label className="block">Planned bottom time per dive (min) <input type="number" min={1} max={600} value={bottomTime} onChange={(event) => setBottomTime(event.target.value)} className="ml-2 w-20 rounded border border-line px-2 py-1" /></label>
      <label className="block">Notes <textarea value={notes} onChange={(event) => setNotes(event.target.value)} rows={2} className="mt-1 block w-full rounded border border-line px-2 py-1" /></label>
      {needsReason ? (
        <label className="block">Reason for working confirmed cells ({confirmedLabels.join(", ") || "see below"})
          <textarea required value={reason} onChange={(event) => setReason(event.target.value)} rows={2} className="mt-1 block w-full rounded border border-line px-2 py-1" />
        </label>
      ) : null}
      <button type="submit" disabled={busy || selectedLabels.length === 0} className="rounded bg-lagoon px-3 py-2 text-white disabled:opacity-50">Assign</button>
      {outcome ? (
        <div role={outcome.kind === "ok" ? "status" : "alert"} className={outcome.kind === "ok" ? "text-ok" : "text-danger"}>
          <p>{outcome.message}</p>
          {outcome.details?.length ? <ul className="list-disc pl-5">{outcome.details.map((line) => <li key={line}>{line}</li>)}</ul> : null}
          {outcome.kind === "ok" ? <Link className="underline" to={`/projects/${projectId}/plans/${date}`}>Open the day plan for {date}</Link> : null}
        </div>
      ) : null}
    </form>
  );
}
