import { unitLabel } from "../../shared/units";
import { useRef, useState } from "react";
import { Form, data, redirect, useNavigation } from "react-router";
import { FormMessage } from "~/components/form-message";
import { VerticalBiasFields } from "~/components/vertical-bias-fields";
import { LengthUnitOptions } from "~/components/length-unit-options";
import { SurveyOrderOptions } from "~/components/survey-order-options";
import { requireRole } from "~/lib/auth/access.server";
import { DEFAULT_TIME_ZONE, receivePageUpload } from "~/lib/import/page-upload.server";
import type { Route } from "./+types/projects.$projectId.surveys.new";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "surveys.import");
  return { projectId: project.id, crs: project.crs, lengthUnit: project.lengthUnit, timeZone: DEFAULT_TIME_ZONE, surveyOrder: project.surveyOrder };
}

// Without JavaScript the form posts here; with it, the page's script posts to ./upload instead.
export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "surveys.import");
  const result = await receivePageUpload(request, project, user);
  if (result.ok) throw redirect(result.location);
  return data({ errors: result.errors }, { status: result.status });
}

export function meta() {
  return [{ title: "Upload a survey · Firmsand" }];
}

const fieldClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

export default function UploadSurvey({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const formRef = useRef<HTMLFormElement>(null);
  const fileRef = useRef<HTMLInputElement>(null);
  const [fileName, setFileName] = useState<string | null>(null);
  const [dragging, setDragging] = useState(false);
  const [uploadFraction, setUploadFraction] = useState<number | null>(null);
  const [clientErrors, setClientErrors] = useState<Array<{ field: string; message: string }> | null>(null);
  const [hasElevations, setHasElevations] = useState(false);
  const errors = clientErrors ?? (actionData as { errors?: Array<{ field: string; message: string }> } | undefined)?.errors ?? [];
  const busy = navigation.state === "submitting" || uploadFraction !== null;

  // With JavaScript the upload goes through XMLHttpRequest so the bar can show bytes sent;
  // without it the form posts normally and the server answers the same way.
  function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    if (typeof XMLHttpRequest === "undefined") return;
    event.preventDefault();
    const form = event.currentTarget;
    const request = new XMLHttpRequest();
    request.open("POST", `/projects/${loaderData.projectId}/surveys/upload`);
    request.upload.onprogress = (progress) => setUploadFraction(progress.lengthComputable ? progress.loaded / progress.total : 0);
    request.onload = () => {
      setUploadFraction(null);
      try {
        const body = JSON.parse(request.responseText) as { location?: string; errors?: Array<{ field: string; message: string }> };
        if (body.location) window.location.assign(body.location);
        else setClientErrors(body.errors ?? [{ field: "form", message: `The upload was refused (${request.status}).` }]);
      } catch {
        setClientErrors([{ field: "form", message: `The upload was refused (${request.status}).` }]);
      }
    };
    request.onerror = () => {
      setUploadFraction(null);
      setClientErrors([{ field: "form", message: "The connection dropped during the upload. Try again." }]);
    };
    setClientErrors(null);
    setUploadFraction(0);
    request.send(new FormData(form));
  }

  function onDrop(event: React.DragEvent<HTMLLabelElement>) {
    event.preventDefault();
    setDragging(false);
    const files = event.dataTransfer.files;
    if (files.length > 0 && fileRef.current) {
      fileRef.current.files = files;
      setFileName(files[0].name);
    }
  }

  return (
    <section aria-labelledby="upload-heading" className="max-w-2xl">
      <h2 id="upload-heading" className="text-lg font-semibold">Upload a survey</h2>
      <p className="mt-1 text-sm text-muted">Nothing is stored until you have seen every problem in the file and chosen to import it.</p>
      {errors.length > 0 ? (
        <div className="mt-4"><FormMessage tone="error">{errors.map((error) => error.message).join(" ")}</FormMessage></div>
      ) : null}
      <Form ref={formRef} method="post" encType="multipart/form-data" onSubmit={onSubmit} className="mt-4 space-y-4" aria-busy={busy}>
        <label
          onDragOver={(event) => { event.preventDefault(); setDragging(true); }}
          onDragLeave={() => setDragging(false)}
          onDrop={onDrop}
          className={`block cursor-pointer rounded border-2 border-dashed p-6 text-center ${dragging ? "border-lagoon bg-paper" : "border-line bg-panel"}`}
        >
          <span className="block font-medium">Sounding file (CSV, up to 200 MB)</span>
          <span className="mt-1 block text-sm text-muted">Drop the file here, or choose it.</span>
          <input ref={fileRef} type="file" name="file" accept=".csv,.txt,text/csv" required className="mt-3 block w-full max-w-full text-sm" onChange={(event) => setFileName(event.currentTarget.files?.[0]?.name ?? null)} />
          {fileName ? <span className="mt-2 block text-sm">{fileName}</span> : null}
        </label>

        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="sr-only">The survey</legend>
          <div>
            <label htmlFor="kind" className="block text-sm font-medium">Survey kind</label>
            <select id="kind" name="kind" className={fieldClass} defaultValue="progress">
              <option value="baseline">Baseline (with probe to refusal)</option>
              <option value="progress">Progress (after a dredge pass)</option>
              <option value="closeout">Closeout (verification)</option>
            </select>
          </div>
          <div>
            <label htmlFor="surveyedOn" className="block text-sm font-medium">Survey date</label>
            <input id="surveyedOn" name="surveyedOn" type="date" required className={fieldClass} />
          </div>
          <div>
            <label htmlFor="timeZone" className="block text-sm font-medium">Time zone of the file's times</label>
            <input id="timeZone" name="timeZone" defaultValue={loaderData.timeZone} className={fieldClass} />
          </div>
          <div>
            <label htmlFor="surveyOrder" className="block text-sm font-medium">Survey order (IHO S-44) for QA</label>
            <select id="surveyOrder" name="surveyOrder" className={fieldClass} defaultValue={loaderData.surveyOrder} aria-describedby="surveyOrder-hint">
              <SurveyOrderOptions />
            </select>
            <p id="surveyOrder-hint" className="mt-1 text-sm text-muted">The project's order is chosen; this survey keeps the order it is imported with.</p>
          </div>
        </fieldset>

        <fieldset className="space-y-3 rounded border border-line p-4">
          <legend className="px-1 text-sm font-medium">Vertical reference</legend>
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" name="fileHasElevations" value="1" checked={hasElevations} onChange={(event) => setHasElevations(event.currentTarget.checked)} />
            The file has bottom elevations (no water-surface elevation needed)
          </label>
          <div className="grid gap-4 sm:grid-cols-2">
            <div>
              <label htmlFor="waterSurfaceElevation" className="block text-sm font-medium">Water-surface elevation ({unitLabel(loaderData.lengthUnit)})</label>
              <input id="waterSurfaceElevation" name="waterSurfaceElevation" inputMode="decimal" required={!hasElevations} disabled={hasElevations} className={fieldClass} aria-describedby="wse-hint" />
              <p id="wse-hint" className="mt-1 text-sm text-muted">Read at the staff gauge on the survey day; elevation = water surface − depth.</p>
            </div>
            <div>
              <label htmlFor="datum" className="block text-sm font-medium">Vertical datum</label>
              <input id="datum" name="datum" defaultValue="NAVD88" className={fieldClass} />
            </div>
          </div>
          <VerticalBiasFields projectUnit={loaderData.lengthUnit} />
        </fieldset>

        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="sr-only">Coordinates and units</legend>
          <div>
            <label htmlFor="crs" className="block text-sm font-medium">Coordinate system of the file</label>
            <input id="crs" name="crs" defaultValue={loaderData.crs} className={fieldClass} aria-describedby="crs-hint" />
            <p id="crs-hint" className="mt-1 text-sm text-muted">The project's is {loaderData.crs}; use EPSG:4326 for longitude/latitude.</p>
          </div>
          <div>
            <label htmlFor="lengthUnit" className="block text-sm font-medium">Unit of depths in the file</label>
            <select id="lengthUnit" name="lengthUnit" defaultValue={loaderData.lengthUnit} className={fieldClass}>
              <LengthUnitOptions />
            </select>
          </div>
        </fieldset>

        {uploadFraction !== null ? (
          <div>
            <label htmlFor="upload-progress" className="text-sm">Uploading and checking the file…</label>
            <progress id="upload-progress" max={1} value={uploadFraction} className="mt-1 block w-full">{Math.round(uploadFraction * 100)} %</progress>
          </div>
        ) : null}
        <button type="submit" disabled={busy} className="rounded bg-lagoon px-4 py-2 font-medium text-white hover:bg-lagoon-dark focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon disabled:opacity-60">
          {busy ? "Uploading…" : "Upload and check"}
        </button>
      </Form>
    </section>
  );
}
