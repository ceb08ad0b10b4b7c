import { useEffect, useState } from "react";
import { Form, Link, data, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { FormMessage } from "~/components/form-message";
import { SoundingPlot } from "~/components/sounding-plot";
import { SubmitButton } from "~/components/submit-button";
import { requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { isExpiredJob } from "~/lib/import/abandoned-uploads.server";
import { commitChoicesFromFields } from "~/lib/import/form-fields";
import { findImportJob, jobChoices, jobOptions, jobPreview, presentJobProgress } from "~/lib/import/import-job-view.server";
import { discardImportJob, ImportJobClosed, previewImportJob, beginImportJobCommit } from "~/lib/import/import-service.server";
import { soundingFields } from "../../shared/soundings/parse-csv";
import { delimiterName } from "../../shared/soundings/sniff";
import { unitLabel } from "../../shared/units";
import type { Route } from "./+types/projects.$projectId.surveys.imports.$jobId";
import { readPageForm } from "~/lib/http/body.server";

const FIELD_LABELS: Record<(typeof soundingFields)[number], string> = {
  easting: "Easting (or longitude)",
  northing: "Northing (or latitude)",
  depth: "Water depth",
  probe: "Probe depth to refusal",
  elevation: "Bottom elevation",
  time: "Time",
  id: "Point id",
};


async function loadJob(request: Request, params: Route.LoaderArgs["params"]) {
  const access = await requireRole(request, params.projectId, "surveys.import");
  const { project, user } = access;
  const jobId = z.coerce.number().int().positive().safeParse(params.jobId);
  const job = jobId.success ? await findImportJob(access, jobId.data) : null;
  if (!job) throw new Response("There is no such import.", { status: 404, statusText: "Not Found" });
  return { project, user, job };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project, job } = await loadJob(request, params);
  const preview = jobPreview(job);
  return {
    projectId: project.id,
    lengthUnit: project.lengthUnit,
    job: { ...presentJobProgress(job), fileName: job.fileName, fileSize: Number(job.fileSize), expired: isExpiredJob(job) },
    options: jobOptions(job),
    choices: jobChoices(job),
    preview,
  };
}

/** The form's mapping; "— not in the file —" (an empty value) is null, so no same-named column is used for the field. */
function mappingFromForm(form: FormData): Record<string, string | null> {
  const mapping: Record<string, string | null> = {};
  for (const field of soundingFields) {
    const header = form.get(`column.${field}`);
    if (typeof header === "string") mapping[field] = header === "" ? null : header;
  }
  return mapping;
}

export async function action({ request, params }: Route.ActionArgs) {
  const { project, job } = await loadJob(request, params);
  const form = await readPageForm(request);
  const intent = form.get("intent");
  if (intent === "discard") {
    if ((await discardImportJob(job)) === "in use") return data({ error: "This upload is being checked or imported right now, so it cannot be discarded." }, { status: 409 });
    throw redirect(`/projects/${project.id}/surveys`);
  }
  if (isExpiredJob(job)) return data({ error: job.error ?? "This upload has expired. Upload the file again." }, { status: 410 });
  if (job.state === "committing" || job.state === "done") return data({ error: "This import is already running or finished." }, { status: 409 });
  const excludeRows = form.getAll("excludeRow").map(Number).filter((row) => Number.isInteger(row) && row > 0);
  const fields = Object.fromEntries([...form.entries()].filter(([, value]) => typeof value === "string")) as Record<string, string>;
  const { choices, problems } = commitChoicesFromFields(fields, excludeRows);
  if (!choices) return data({ error: problems.map((problem) => problem.message).join(" ") }, { status: 400 });
  const options = { ...jobOptions(job), columns: mappingFromForm(form) };
  if (intent === "commit") {
    // The commit runs on in the server whether or not this page stays open; the page is read again
    // once the job is claimed, so it shows the progress.
    await beginImportJobCommit(job, options, choices, clientAddress(request));
    throw redirect(`/projects/${project.id}/surveys/imports/${job.id}`);
  }
  try {
    await previewImportJob(job, options, choices);
  } catch (error) {
    if (error instanceof ImportJobClosed) return data({ error: error.message }, { status: 409 });
    throw error;
  }
  return data({ error: null });
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `Import ${loaderData?.job.fileName ?? ""} · Firmsand` }];
}

function ImportProgress({ projectId, jobId, initial }: { projectId: number; jobId: number; initial: { state: string; stage: string; fraction: number; error: string | null; surveyId: number | null } }) {
  const [progress, setProgress] = useState(initial);
  useEffect(() => {
    if (progress.state !== "committing") return;
    const timer = setInterval(async () => {
      const response = await fetch(`/projects/${projectId}/surveys/imports/${jobId}/progress`, { headers: { Accept: "application/json" } });
      if (!response.ok) return;
      const next = (await response.json()) as typeof initial;
      setProgress(next);
      if (next.state !== "committing") {
        clearInterval(timer);
        window.location.assign(next.state === "done" && next.surveyId ? `/projects/${projectId}/surveys/${next.surveyId}` : window.location.pathname);
      }
    }, 700);
    return () => clearInterval(timer);
  }, [progress.state, projectId, jobId]);
  return (
    <div className="rounded border border-line bg-panel p-4" role="status" aria-live="polite">
      <label htmlFor="commit-progress" className="block font-medium">Importing: {progress.stage}</label>
      <progress id="commit-progress" max={1} value={progress.fraction} className="mt-2 block w-full">{Math.round(progress.fraction * 100)} %</progress>
      <p className="mt-2 text-sm text-muted">You can leave this page: the import finishes on the server, and this page picks it up when you come back.</p>
    </div>
  );
}

export default function ImportJobPage({ loaderData, actionData }: Route.ComponentProps) {
  const { job, preview, choices, projectId, options } = loaderData;
  const navigation = useNavigation();
  const base = `/projects/${projectId}/surveys`;
  const actionError = (actionData as { error?: string | null } | undefined)?.error ?? null;

  if (job.expired) {
    return (
      <section className="space-y-3">
        <h2 className="text-lg font-semibold">Upload {job.fileName} expired</h2>
        <FormMessage tone="error">{job.error ?? "This upload waited too long without being imported, so its staged file was removed. Nothing was stored."}</FormMessage>
        <Link className="text-lagoon underline" to={`${base}/new`}>Upload the file again</Link>
      </section>
    );
  }
  if (job.state === "committing") return <section className="space-y-4"><h2 className="text-lg font-semibold">Import {job.fileName}</h2><ImportProgress projectId={projectId} jobId={job.id} initial={job} /></section>;
  if (job.state === "done" && job.surveyId) {
    return (
      <section className="space-y-3">
        <h2 className="text-lg font-semibold">Imported {job.fileName}</h2>
        <FormMessage tone="success">The survey is stored and the cell statistics are updated.</FormMessage>
        <Link className="text-lagoon underline" to={`${base}/${job.surveyId}`}>Open the survey</Link>
      </section>
    );
  }
  if (!preview) return <section><h2 className="text-lg font-semibold">Import {job.fileName}</h2><p className="mt-2 text-muted">The file has not been checked yet.</p></section>;

  const excluded = new Set(choices.excludeRows);
  // One "leave out" box per row, on the row's first problem.
  const firstOfRow = new Map<number, number>();
  preview.problems.forEach((problem, index) => { if (!firstOfRow.has(problem.row)) firstOfRow.set(problem.row, index); });
  const busy = navigation.state !== "idle";
  const notText = preview.shape.headers.length === 0 && preview.rowsChecked === false && preview.fileProblems.length > 0 && preview.rowCount === 0 && !preview.shape.hasHeader;
  const remembered = new Set(preview.rememberedFields ?? []);
  const unit = unitLabel(loaderData.lengthUnit);
  // The depth-unit and bottom notes have their own boxes with the confirmation; the list holds the rest.
  const notes = preview.warnings.filter((warning) => warning !== preview.depthUnit?.message && warning !== preview.bottomShift?.message);
  const spikeRows = preview.plot?.spikes?.map((spike) => spike.row) ?? preview.qa?.spikes.rows ?? [];
  return (
    <section aria-labelledby="import-heading" className="min-w-0 space-y-6 [overflow-wrap:anywhere]">
      <div>
        <h2 id="import-heading" className="text-lg font-semibold">Check {job.fileName}</h2>
        <p className="text-sm text-muted">
          {options.kind} survey of {options.surveyedOn} · {preview.rowCount.toLocaleString("en-US")} rows
          {notText ? "" : ` · columns separated by ${delimiterName(preview.shape.delimiter)}`}
          {preview.shape.decimalComma ? " · decimal comma" : ""}{preview.shape.hasBom ? " · byte-order mark" : ""}{preview.shape.hasHeader || notText ? "" : " · no header row"}
        </p>
      </div>
      {job.state === "failed" && job.error ? <FormMessage tone="error">{job.error}</FormMessage> : null}
      {actionError ? <FormMessage tone="error">{actionError}</FormMessage> : null}

      <Form method="post" className="min-w-0 space-y-6" aria-busy={busy}>
        {notText ? null : (
        <fieldset className="min-w-0 max-w-full rounded border border-line bg-panel p-4">
          <legend className="px-1 font-medium">Columns</legend>
          <p className="text-sm text-muted">Guessed from the header names{preview.lonLatHeaders ? " (longitude/latitude recognised: choose EPSG:4326 as the file's CRS on upload)" : ""}{remembered.size > 0 ? "; fields marked “as last time” come from this project's last accepted mapping" : ""}; change any of them. The mapping is remembered for this project's next upload.</p>
          <div className="mt-3 grid gap-3 sm:grid-cols-2">
            {soundingFields.map((field) => (
              <div key={field} className="min-w-0">
                <label htmlFor={`column-${field}`} className="block text-sm font-medium">{FIELD_LABELS[field]}{remembered.has(field) ? <span className="ml-2 text-xs font-normal text-muted">as last time</span> : null}</label>
                <select id={`column-${field}`} name={`column.${field}`} defaultValue={preview.mapping[field] ?? ""} className="mt-1 block w-full min-w-0 max-w-full rounded border border-line bg-panel px-2 py-1">
                  <option value="">— not in the file —</option>
                  {preview.shape.headers.map((header) => <option key={header} value={header}>{header.length > 48 ? `${header.slice(0, 47)}…` : header}</option>)}
                </select>
              </div>
            ))}
          </div>
          {/* Width 0 with a minimum of the whole row: the wide table scrolls inside its box and never
              widens the fieldset (a scroll box still lends its content's width to its parent's sizing). */}
          <div className="mt-4 w-0 min-w-full overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="First rows of the file, scrollable">
            <table className="w-full border-collapse text-xs">
              <caption className="text-left text-sm text-muted">First rows of the file</caption>
              <thead><tr>{preview.shape.headers.map((header) => <th key={header} scope="col" className="whitespace-nowrap border-b border-line px-2 py-1 text-left [overflow-wrap:normal]">{header.length > 48 ? `${header.slice(0, 47)}…` : header}</th>)}</tr></thead>
              <tbody>{preview.shape.firstRows.map((row, index) => <tr key={index}>{row.map((cell, cellIndex) => <td key={cellIndex} className={`figures whitespace-nowrap border-b border-line px-2 py-1 [overflow-wrap:normal] ${/^[-+]?\d[\d.,]*$/.test(cell.trim()) ? "text-right" : ""}`}>{cell.length > 48 ? `${cell.slice(0, 47)}…` : cell}</td>)}</tr>)}</tbody>
            </table>
          </div>
        </fieldset>
        )}

        {preview.fileProblems.length > 0 ? (
          <div role="alert" className="rounded border border-danger bg-panel p-4">
            <h3 className="font-medium text-danger">Problems with the file as a whole</h3>
            <ul className="mt-2 list-disc pl-5 text-sm">{preview.fileProblems.map((message) => <li key={message}>{message}</li>)}</ul>
          </div>
        ) : null}

        {preview.rowsChecked === false ? (
          <div className="rounded border border-danger bg-panel p-4" data-testid="rows-not-checked">
            <h3 className="font-medium text-danger">No rows were checked</h3>
            <p className="mt-1 text-sm">
              {preview.rowCount === 0
                ? "Nothing was read from this file, so there is nothing to import."
                : `None of the ${preview.rowCount.toLocaleString("en-US")} rows could be read until the problems with the file as a whole (above) are fixed.`}
            </p>
          </div>
        ) : (
        <div className="rounded border border-line bg-panel p-4">
          <h3 className="font-medium">Row problems: {preview.problemCount.toLocaleString("en-US")} in {preview.problemRows.toLocaleString("en-US")} of {preview.rowCount.toLocaleString("en-US")} rows</h3>
          {preview.problemCount === 0 ? (
            <p className="mt-1 text-sm text-ok">Every row passes the rules.</p>
          ) : (
            <>
              <p className="mt-1 text-sm"><a className="text-lagoon underline" href={`${base}/imports/${job.id}/problems.csv`} download>Download the problems as CSV</a>{preview.problemCount > preview.problems.length ? ` (the first ${preview.problems.length} are listed here)` : ""}</p>
              <label className="mt-2 flex items-center gap-2 text-sm">
                <input type="checkbox" name="excludeErrorRows" value="1" defaultChecked={choices.excludeErrorRows} />
                Leave out every row with a problem
              </label>
              <div className="mt-2 max-h-96 overflow-auto">
                <table className="w-full border-collapse text-sm" data-testid="problems-table">
                  <caption className="sr-only">Row problems</caption>
                  <thead><tr className="text-left"><th scope="col" className="px-2">Leave out</th><th scope="col" className="px-2 text-right">Row</th><th scope="col" className="px-2">Column</th><th scope="col" className="px-2">Value</th><th scope="col" className="px-2">Rule</th><th scope="col" className="px-2">Problem</th></tr></thead>
                  <tbody>
                    {preview.problems.map((problem, index) => (
                      <tr key={index} className="border-t border-line">
                        <td className="px-2">{firstOfRow.get(problem.row) === index ? <input type="checkbox" name="excludeRow" value={problem.row} defaultChecked={excluded.has(problem.row)} aria-label={`Leave out row ${problem.row}`} /> : null}</td>
                        <td className="figures px-2 text-right">{problem.row}</td>
                        <td className="px-2">{problem.column || "—"}</td>
                        <td className="figures px-2">{problem.value || "—"}</td>
                        <td className="px-2">{problem.rule}</td>
                        <td className="px-2">{problem.message}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            </>
          )}
        </div>
        )}

        {preview.outside.count > 0 ? (
          <fieldset className="rounded border border-caution bg-panel p-4">
            <legend className="px-1 font-medium">{preview.outside.count.toLocaleString("en-US")} sounding{preview.outside.count === 1 ? "" : "s"} outside the work limit</legend>
            <p className="text-sm">Rows {preview.outside.rows.slice(0, 30).join(", ")}{preview.outside.count > 30 ? " …" : ""}.</p>
            <div className="mt-2 flex gap-6 text-sm">
              <label className="flex items-center gap-2"><input type="radio" name="outside" value="keep" defaultChecked={choices.outside === "keep"} /> Keep them</label>
              <label className="flex items-center gap-2"><input type="radio" name="outside" value="drop" defaultChecked={choices.outside === "drop"} /> Drop them</label>
            </div>
          </fieldset>
        ) : null}

        {preview.depthUnit ? (
          <div className="rounded border border-caution bg-panel p-4 text-sm" data-testid="depth-unit">
            <h3 className="font-medium">Depth unit: check before importing</h3>
            <p className="mt-1">{preview.depthUnit.message}</p>
            <label className="mt-2 flex items-center gap-2">
              <input type="checkbox" name="acceptDepthUnit" value="1" defaultChecked={choices.acceptDepthUnit} />
              The {options.fileHasElevations ? "elevations" : "depths"} are right as given; import them as {unitLabel(options.lengthUnit, "length-long")}.
            </label>
          </div>
        ) : null}

        {preview.bottomShift ? (
          <div className="rounded border border-caution bg-panel p-4 text-sm" data-testid="bottom-shift">
            <h3 className="font-medium">The whole bottom {preview.bottomShift.direction === "down" ? "dropped" : "rose"} {Math.abs(preview.bottomShift.medianShift).toFixed(1)} {unit}: check before importing</h3>
            <p className="mt-1">{preview.bottomShift.message}</p>
            <label className="mt-2 flex items-center gap-2">
              <input type="checkbox" name="acceptBottomShift" value="1" defaultChecked={choices.acceptBottomShift} />
              The {options.fileHasElevations ? "elevations and their datum are" : `water-surface elevation (${options.waterSurfaceElevation ?? "—"} ${unit}) is`} right; the bottom really moved.
            </label>
          </div>
        ) : null}

        {preview.sameFile.length > 0 ? (
          <label className="flex items-center gap-2 rounded border border-caution bg-panel p-4 text-sm">
            <input type="checkbox" name="acceptSameFile" value="1" defaultChecked={choices.acceptSameFile} />
            This same file was imported before (survey {preview.sameFile.map((survey) => `#${survey.surveyId} ${survey.kind} ${survey.surveyedOn}`).join(", ")}). Import it again anyway.
          </label>
        ) : null}

        {notes.length > 0 ? (
          <div className="rounded border border-line bg-panel p-4">
            <h3 className="font-medium">Notes</h3>
            <ul className="mt-1 list-disc pl-5 text-sm">{notes.map((warning) => <li key={warning}>{warning}</li>)}</ul>
          </div>
        ) : null}

        {preview.qa ? (
          <div className="rounded border border-line bg-panel p-4 text-sm">
            <h3 className="font-medium">Survey QA</h3>
            <ul className="mt-1 list-disc pl-5">
              <li>Cells with soundings: {preview.qa.cellsWithSoundings} of {preview.qa.cellsInLimit} in the work limit; median {preview.qa.medianPerCell ?? "—"} soundings per cell; {preview.qa.sparseCells} cells with fewer than {preview.qa.minimumPerCell}.</li>
              <li data-testid="spikes">
                Spikes: {preview.qa.spikes.count}
                {preview.spikeRule ? ` — a spike is a sounding ${preview.spikeRule}` : Number.isFinite(preview.qa.spikes.threshold) ? ` (more than ${preview.qa.spikes.threshold.toFixed(2)} ${unit} from its neighbours' median)` : " (not judged: no allowance for this survey order)"}
                {preview.qa.spikes.count > 0 ? `. Rows ${spikeRows.slice(0, 40).join(", ")}${preview.qa.spikes.count > 40 ? " …" : ""}; drawn as triangles on the plot below.` : "."}
              </li>
              <li>Crossing lines: {preview.qa.crossings.comparisons} comparisons{preview.qa.crossings.withinAllowanceShare !== null ? `, ${(preview.qa.crossings.withinAllowanceShare * 100).toFixed(0)} % within the IHO S-44 order ${preview.qa.order} allowance` : ""}.</li>
            </ul>
          </div>
        ) : null}

        {preview.plot ? <SoundingPlot title="Soundings of this file and the work limit" data={{ ...preview.plot, highlighted: preview.outside.points }} /> : null}

        {preview.rowsChecked === false ? null : <p className="text-sm">{preview.storedCount.toLocaleString("en-US")} soundings would be stored.</p>}

        {preview.blockers.length > 0 ? (
          <div className="rounded border border-danger bg-panel p-3 text-sm" data-testid="blockers">
            <p className="font-medium">Not ready to import:</p>
            <ul className="list-disc pl-5">{preview.blockers.map((blocker) => <li key={blocker}>{blocker}</li>)}</ul>
          </div>
        ) : null}
        <div className="flex flex-wrap gap-3">
          <SubmitButton intent="recheck" tone="plain" pendingLabel="Checking…">Check again with these choices</SubmitButton>
          <SubmitButton intent="commit" pendingLabel="Starting the import…" disabled={preview.blockers.length > 0 || busy}>Import the survey</SubmitButton>
          <SubmitButton intent="discard" tone="plain" pendingLabel="Discarding…" formNoValidate>Discard this upload</SubmitButton>
        </div>
        {preview.blockers.length > 0 ? <p className="text-sm text-muted">Change the choices above and check again; the import button unlocks when nothing blocks it.</p> : null}
      </Form>
    </section>
  );
}
