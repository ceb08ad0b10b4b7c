import { Form, Link, data } from "react-router";
import { z } from "zod";
import { FormMessage } from "~/components/form-message";
import { SoundingPlot } from "~/components/sounding-plot";
import { SubmitButton } from "~/components/submit-button";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { setSurveyStatus } from "~/lib/import/commit.server";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import { getSurveyDetails, listSoundings, sampleSoundingPositions, setSurveyVerticalBias } from "~/models/survey.server";
import { verticalBiasFromFields, type FieldProblem } from "~/lib/import/form-fields";
import { VerticalBiasFields } from "~/components/vertical-bias-fields";
import { verticalBiasWords } from "../../shared/qa/vertical-bias";
import { plotOf } from "../../shared/soundings/prepare";
import { lengthUnitSchema, unitLabel } from "../../shared/units";
import type { Route } from "./+types/projects.$projectId.surveys.$surveyId";
import { readPageForm } from "~/lib/http/body.server";

const idSchema = z.coerce.number().int().positive();
const pageSchema = z.coerce.number().int().positive().catch(1);

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const surveyId = idSchema.safeParse(params.surveyId);
  const survey = surveyId.success ? await getSurveyDetails(project, surveyId.data) : null;
  if (!survey) throw new Response("There is no such survey in this project.", { status: 404, statusText: "Not Found" });
  const page = pageSchema.parse(new URL(request.url).searchParams.get("page") ?? 1);
  const [soundings, points, geometry] = await Promise.all([listSoundings(project, survey.id, page), sampleSoundingPositions(project, survey.id), loadProjectGeometry(project.id)]);
  return {
    projectId: project.id,
    lengthUnit: project.lengthUnit,
    // The file's own unit, in the one pair of labels every page uses.
    surveyUnit: (() => {
      const unit = lengthUnitSchema.safeParse(survey.lengthUnit);
      return unit.success ? { short: unitLabel(unit.data), long: unitLabel(unit.data, "length-long") } : { short: survey.lengthUnit, long: survey.lengthUnit };
    })(),
    canRetract: can(access, "surveys.retract"),
    // Whoever may import surveys may say how far a survey's vertical reference may be off.
    canSetBias: can(access, "surveys.import"),
    survey,
    soundings,
    plot: points.length > 0 || (geometry.workLimit?.length ?? 0) > 0 ? plotOf(points, geometry.workLimit) : null,
  };
}

const statusSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("retract"), reason: z.string().trim().min(3, "Give a reason (at least 3 characters).").max(2000) }),
  z.object({ intent: z.literal("restore") }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  // A member of the project first; each intent then asks for its own permission.
  await requireRole(request, params.projectId);
  const form = Object.fromEntries(await readPageForm(request)) as Record<string, string>;
  if (form.intent === "bias" || form.intent === "clear-bias") return biasAction(request, params, form);
  const { project, user } = await requireRole(request, params.projectId, "surveys.retract");
  const surveyId = idSchema.safeParse(params.surveyId);
  if (!surveyId.success) throw new Response("There is no such survey in this project.", { status: 404 });
  const parsed = statusSchema.safeParse(form);
  if (!parsed.success) return data({ error: parsed.error.issues[0]?.message ?? "Check the form." }, { status: 400 });
  const survey = await setSurveyStatus({
    projectId: project.id,
    surveyId: surveyId.data,
    userId: user.id,
    ip: clientAddress(request),
    status: parsed.data.intent === "retract" ? "retracted" : "active",
    reason: parsed.data.intent === "retract" ? parsed.data.reason : undefined,
  });
  if (!survey) throw new Response("There is no such survey in this project.", { status: 404 });
  return data({ error: null, done: parsed.data.intent === "retract" ? "The survey is retracted and the statistics are recomputed without it." : "The survey is restored and the statistics are recomputed." });
}

/** Records or clears the survey's vertical-reference bias; a refused value names its field. */
async function biasAction(request: Request, params: Route.ActionArgs["params"], form: Record<string, string>) {
  const { project, user } = await requireRole(request, params.projectId, "surveys.import");
  const surveyId = idSchema.safeParse(params.surveyId);
  if (!surveyId.success) throw new Response("There is no such survey in this project.", { status: 404 });
  const problems: FieldProblem[] = [];
  const bias = form.intent === "clear-bias" ? null : verticalBiasFromFields(form, project.lengthUnit, problems);
  if (form.intent === "bias" && bias === null && problems.length === 0) problems.push({ field: "verticalBiasValue", message: "Give the bias and where it comes from, or clear it." });
  if (problems.length > 0) return data({ error: problems.map((problem) => problem.message).join(" "), biasProblems: problems }, { status: 422 });
  const saved = await setSurveyVerticalBias(project, { surveyId: surveyId.data, userId: user.id, ip: clientAddress(request), bias });
  if (saved === undefined) throw new Response("There is no such survey in this project.", { status: 404 });
  return data({ error: null, done: saved ? `Reference bias recorded: ${verticalBiasWords(saved)}. Pay periods that use this survey now carry it in their ±.` : "Reference bias cleared." });
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `Survey ${loaderData?.survey.surveyedOn ?? ""} · Firmsand` }];
}

const number = (value: number | null, digits = 2) => (value === null || value === undefined ? "—" : value.toFixed(digits));

export default function SurveyPage({ loaderData, actionData }: Route.ComponentProps) {
  const { survey, soundings, plot, canRetract, projectId } = loaderData;
  const result = actionData as { error?: string | null; done?: string } | undefined;
  const qa = survey.qa as { cellsWithSoundings?: number; cellsInLimit?: number; medianPerCell?: number | null; sparseCells?: number; spikes?: { count: number }; crossings?: { comparisons: number; withinAllowanceShare: number | null }; order?: string; surveyOrder?: string; warnings?: string[] };
  const base = `/projects/${projectId}/surveys`;
  return (
    <section aria-labelledby="survey-heading" className="space-y-6">
      <div>
        <p className="text-sm"><Link className="text-lagoon underline" to={base}>All surveys</Link></p>
        <h2 id="survey-heading" className="text-lg font-semibold">{survey.kind[0].toUpperCase() + survey.kind.slice(1)} survey of {survey.surveyedOn}</h2>
        <p className="text-sm text-muted" data-testid="survey-status">
          {survey.status === "active" ? "Active" : `Retracted${survey.retractedBy ? ` by ${survey.retractedBy}` : ""}: ${survey.retractedReason ?? ""}`} · {survey.fileName} · {survey.rowCount.toLocaleString("en-US")} rows, {survey.soundingCount.toLocaleString("en-US")} soundings · uploaded by {survey.uploadedBy ?? "—"}
        </p>
      </div>
      {result?.error ? <FormMessage tone="error">{result.error}</FormMessage> : null}
      {result?.done ? <FormMessage tone="success">{result.done}</FormMessage> : null}

      <dl className="grid gap-2 text-sm sm:grid-cols-3">
        <div><dt className="text-muted">Water surface</dt><dd>{survey.fileHasElevations ? "file has elevations" : `${number(survey.waterSurfaceElevation)} ${loaderData.surveyUnit.short} ${survey.datum}`}</dd></div>
        <div><dt className="text-muted">Coordinates</dt><dd>{survey.crs}, depths in {loaderData.surveyUnit.long}</dd></div>
        <div><dt className="text-muted">Time zone</dt><dd>{survey.timeZone}</dd></div>
        <div className="sm:col-span-3"><dt className="text-muted">Reference bias (95 %)</dt><dd data-testid="survey-bias">{survey.verticalBias ? <><span className="figures">± {survey.verticalBias.value} {unitLabel(survey.verticalBias.unit)}</span> — {survey.verticalBias.source}</> : "none recorded"}</dd></div>
      </dl>

      {loaderData.canSetBias ? (
        <Form method="post" className="space-y-3 rounded border border-line bg-panel p-4" aria-labelledby="bias-heading">
          <h3 id="bias-heading" className="font-medium">Reference bias</h3>
          <VerticalBiasFields projectUnit={loaderData.lengthUnit} current={survey.verticalBias} />
          <div className="flex flex-wrap gap-3">
            <SubmitButton intent="bias" pendingLabel="Saving…">Save the bias</SubmitButton>
            {survey.verticalBias ? <SubmitButton intent="clear-bias" tone="plain" pendingLabel="Clearing…">Clear it</SubmitButton> : null}
          </div>
        </Form>
      ) : null}

      <div className="rounded border border-line bg-panel p-4 text-sm">
        <h3 className="font-medium">QA summary</h3>
        <ul className="mt-1 list-disc pl-5">
          {(qa.surveyOrder ?? qa.order) ? <li>Judged against IHO S-44 order {qa.surveyOrder ?? qa.order}, the order this survey was imported with; a later change of the project's order does not change it.</li> : null}
          <li>Cells with soundings: {qa.cellsWithSoundings ?? "—"} of {qa.cellsInLimit ?? "—"}; median {qa.medianPerCell ?? "—"} per cell; {qa.sparseCells ?? 0} sparse cells.</li>
          <li>Spikes: {qa.spikes?.count ?? 0}.</li>
          <li>Crossing lines: {qa.crossings?.comparisons ?? 0} comparisons{qa.crossings?.withinAllowanceShare != null ? `, ${(qa.crossings.withinAllowanceShare * 100).toFixed(0)} % within the IHO S-44 order ${qa.order} allowance` : ""}.</li>
          {(qa.warnings ?? []).map((warning) => <li key={warning}>{warning}</li>)}
        </ul>
      </div>

      {plot ? <SoundingPlot title="Soundings of this survey and the work limit" data={plot} /> : null}

      <div>
        <h3 className="font-medium">Soundings</h3>
        {soundings && soundings.total > 0 ? (
          <>
            <table className="mt-2 w-full border-collapse text-xs">
              <caption className="sr-only">Soundings, page {soundings.page} of {soundings.pageCount}</caption>
              <thead><tr className="text-left"><th scope="col" className="px-2 text-right">Row</th><th scope="col" className="px-2">Point</th><th scope="col" className="px-2 text-right">Easting</th><th scope="col" className="px-2 text-right">Northing</th><th scope="col" className="px-2 text-right">Depth</th><th scope="col" className="px-2 text-right">Probe</th><th scope="col" className="px-2 text-right">Elevation</th><th scope="col" className="px-2 text-right">Refusal elev.</th><th scope="col" className="px-2">Time</th></tr></thead>
              <tbody>
                {soundings.soundings.map((sounding) => (
                  <tr key={sounding.sourceRow} className="border-t border-line">
                    <td className="figures px-2 text-right">{sounding.sourceRow}</td><td className="figures px-2">{sounding.pointId ?? "—"}</td>
                    <td className="figures px-2 text-right">{number(sounding.easting)}</td><td className="figures px-2 text-right">{number(sounding.northing)}</td>
                    <td className="figures px-2 text-right">{number(sounding.depth)}</td><td className="figures px-2 text-right">{number(sounding.probe)}</td>
                    <td className="figures px-2 text-right">{number(sounding.elevation)}</td><td className="figures px-2 text-right">{number(sounding.refusalElevation)}</td>
                    <td className="px-2">{sounding.time ?? "—"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <nav aria-label="Sounding pages" className="mt-2 flex items-center gap-3 text-sm">
              {soundings.page > 1 ? <Link className="text-lagoon underline" to={`?page=${soundings.page - 1}`}>Previous page</Link> : null}
              <span>Page {soundings.page} of {soundings.pageCount}</span>
              {soundings.page < soundings.pageCount ? <Link className="text-lagoon underline" to={`?page=${soundings.page + 1}`}>Next page</Link> : null}
            </nav>
          </>
        ) : <p className="text-sm text-muted">This survey has no soundings.</p>}
      </div>

      {canRetract ? (
        survey.status === "active" ? (
          <Form method="post" className="space-y-2 rounded border border-line bg-panel p-4">
            <h3 className="font-medium">Retract this survey</h3>
            <p className="text-sm text-muted">The soundings are kept; the statistics are recomputed without them. It can be restored.</p>
            <label htmlFor="reason" className="block text-sm font-medium">Reason</label>
            <textarea id="reason" name="reason" required minLength={3} rows={2} className="block w-full rounded border border-line px-3 py-2" />
            <SubmitButton intent="retract" tone="danger" pendingLabel="Retracting and recomputing…">Retract</SubmitButton>
          </Form>
        ) : (
          <Form method="post" className="rounded border border-line bg-panel p-4">
            <SubmitButton intent="restore" pendingLabel="Restoring and recomputing…">Restore this survey</SubmitButton>
          </Form>
        )
      ) : null}
    </section>
  );
}
