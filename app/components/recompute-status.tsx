import { useEffect, useRef, useState } from "react";
import { Form, useRevalidator } from "react-router";
import { changeStatusWords, changeVolumeWords, changedVolumes } from "../../shared/volumes/figures-change";
import type { RecomputeJobView } from "~/lib/engine/recompute-jobs.server";
import { SubmitButton } from "./submit-button";

const POLL_MS = 1000;
const whole = (value: number | null) => (value === null ? "none" : Math.round(value).toLocaleString("en-US"));
const when = (iso: string) => new Date(iso).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" });

/**
 * The project's latest recompute on the settings page: while it waits or runs, a progress bar fed
 * by polling the job's API address; once done, what changed between the figures before and after
 * (from the job's summary, computed by the server); once failed, why, and a way to start it again.
 * When it ends, the page's data is read again (cell count, history).
 */
export function RecomputeStatus({ initial, volumeLabel, canStart }: { initial: RecomputeJobView; volumeLabel: string; canStart: boolean }) {
  const [job, setJob] = useState(initial);
  const revalidator = useRevalidator();
  const panel = useRef<HTMLElement>(null);
  useEffect(() => setJob(initial), [initial]);
  const active = job.state === "queued" || job.state === "running";
  // A recompute a save just started is brought into view: the save's own section may be far below.
  useEffect(() => {
    if (active) panel.current?.scrollIntoView({ block: "nearest" });
    // eslint-disable-next-line react-hooks/exhaustive-deps -- once per job
  }, [job.id]);
  useEffect(() => {
    if (!active) return;
    let stopped = false;
    const timer = setInterval(async () => {
      const response = await fetch(job.url, { headers: { Accept: "application/json" } }).catch(() => null);
      if (stopped || !response?.ok) return;
      const next = (await response.json()) as RecomputeJobView;
      setJob(next);
      if (next.state === "done" || next.state === "failed") {
        clearInterval(timer);
        void revalidator.revalidate();
      }
    }, POLL_MS);
    return () => {
      stopped = true;
      clearInterval(timer);
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- one poll per job while it is active
  }, [active, job.url]);

  const version = job.settingsVersion === null ? "" : ` for settings version ${job.settingsVersion}`;
  return (
    <section ref={panel} aria-labelledby="recompute-heading" className={`rounded border bg-panel p-4 ${job.state === "failed" ? "border-danger" : active ? "border-lagoon" : "border-line"}`} data-testid="recompute-status">
      <h2 id="recompute-heading" className="text-lg font-semibold">{active ? "Recomputing every survey's figures" : job.state === "done" ? "Figures recomputed" : "Recompute failed"}</h2>
      <div role="status" aria-live="polite" className="mt-2 space-y-2 text-sm">
        {active ? (
          <>
            <label htmlFor="recompute-progress" className="block">
              {job.state === "queued"
                ? job.attempts > 0
                  ? "The server stopped during this recompute; it starts again once the project's other work (an import or an earlier recompute) is done"
                  : "Waiting for the project's other work (an import or an earlier recompute) to finish"
                : `Working: ${job.stage}`}{version}.
            </label>
            <progress id="recompute-progress" max={1} value={job.fraction} className="block h-3 w-full accent-lagoon">{Math.round(job.fraction * 100)} %</progress>
            <p className="text-muted">
              <span className="figures">{Math.round(job.fraction * 100)} %</span>. The settings are saved; until this finishes the figures, map and quantities are those computed with the settings before.
              You can leave this page: the recompute goes on on the server.
            </p>
          </>
        ) : null}
        {job.state === "done" && job.summary ? (
          <>
            <p>
              Finished <time dateTime={job.finishedAt ?? job.createdAt} className="figures whitespace-nowrap">{when(job.finishedAt ?? job.createdAt)}</time>
              {job.summary.fromVersion !== null && job.summary.toVersion !== null ? <>, from settings version <span className="figures">{job.summary.fromVersion}</span> to <span className="figures">{job.summary.toVersion}</span></> : version}:
              {" "}<strong data-testid="recompute-summary">{job.summaryText}</strong>.
            </p>
            <ChangeTable job={job} volumeLabel={volumeLabel} />
          </>
        ) : null}
        {job.state === "failed" ? (
          <>
            <p className="text-danger">{job.error}</p>
            {canStart ? (
              <Form method="post">
                <SubmitButton intent="recompute" pendingLabel="Starting…">Recompute again</SubmitButton>
              </Form>
            ) : null}
          </>
        ) : null}
      </div>
    </section>
  );
}

function ChangeTable({ job, volumeLabel }: { job: RecomputeJobView; volumeLabel: string }) {
  const summary = job.summary!;
  const volumes = changedVolumes(summary);
  const rows: Array<{ what: string; before: string; after: string }> = [
    ...volumes.map((volume) => ({ what: `${changeVolumeWords[volume.key]} (${volumeLabel})`, before: whole(volume.before), after: whole(volume.after) })),
    ...(summary.cells.before !== summary.cells.after ? [{ what: "cells inside the work limit", before: whole(summary.cells.before), after: whole(summary.cells.after) }] : []),
    ...summary.statusCounts.map((count) => ({ what: `cells ${changeStatusWords[count.status]}`, before: whole(count.before), after: whole(count.after) })),
    ...summary.zones.map((zone) => ({ what: `zone "${zone.name}" planned (${volumeLabel})`, before: whole(zone.plannedBefore), after: whole(zone.plannedAfter) })),
  ];
  if (rows.length === 0) return null;
  return (
    <div className="overflow-x-auto" role="region" aria-label="What the recompute changed" tabIndex={0}>
      <table className="min-w-full text-left text-sm">
        <thead>
          <tr className="border-b border-line"><th scope="col" className="py-1 pr-4 font-medium">Figure</th><th scope="col" className="py-1 pr-4 text-right font-medium">Before</th><th scope="col" className="py-1 text-right font-medium">After</th></tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.what} className="border-b border-line last:border-0">
              <th scope="row" className="py-1 pr-4 font-normal">{row.what}</th>
              <td className="figures py-1 pr-4 text-right whitespace-nowrap">{row.before}</td>
              <td className="figures py-1 text-right whitespace-nowrap">{row.after}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
