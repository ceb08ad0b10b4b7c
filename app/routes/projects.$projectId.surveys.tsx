import { Link } from "react-router";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { Op } from "sequelize";
import { ImportJob } from "~/lib/db.server";
import { EXPIRED_STAGE } from "~/lib/import/abandoned-uploads.server";
import { getProjectStatistics, listSurveys } from "~/models/survey.server";
import type { Route } from "./+types/projects.$projectId.surveys";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project, user } = access;
  const canUpload = can(access, "surveys.import");
  const [surveys, statistics] = await Promise.all([listSurveys(project), getProjectStatistics(project)]);
  const pending = canUpload
    ? await ImportJob.findAll({ where: { projectId: project.id, userId: user.id, state: ["staged", "ready", "committing", "validating", "failed"], stage: { [Op.ne]: EXPIRED_STAGE } }, order: [["createdAt", "DESC"]], limit: 10 })
    : [];
  return {
    projectId: project.id,
    volumeUnit: project.lengthUnit === "m" ? "m³" : "yd³",
    canUpload,
    surveys,
    statistics,
    pending: pending.map((job) => ({ id: job.id, fileName: job.fileName, state: job.state, createdAt: job.createdAt.toISOString() })),
  };
}

const KIND_LABELS = { baseline: "Baseline", progress: "Progress", closeout: "Closeout" } as const;
const percent = (share: number | null) => (share === null ? "—" : `${(share * 100).toFixed(0)} %`);
const volume = (value: number) => Math.round(value).toLocaleString("en-US");

export default function Surveys({ loaderData }: Route.ComponentProps) {
  const { surveys, statistics, canUpload, projectId, volumeUnit, pending } = loaderData;
  const base = `/projects/${projectId}/surveys`;
  return (
    <section aria-labelledby="surveys-heading" className="space-y-6">
      <div className="flex flex-wrap items-center gap-4">
        <h2 id="surveys-heading" className="text-lg font-semibold">Surveys</h2>
        {canUpload ? (
          <Link to={`${base}/new`} className="ml-auto rounded bg-lagoon px-4 py-2 font-medium text-white hover:bg-lagoon-dark focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon">
            Upload a survey
          </Link>
        ) : null}
      </div>

      {pending.length > 0 ? (
        <div className="rounded border border-caution bg-panel p-4">
          <h3 className="font-medium">Your unfinished uploads</h3>
          <ul className="mt-2 list-disc pl-5 text-sm">
            {pending.map((job) => (
              <li key={job.id}><Link className="text-lagoon underline" to={`${base}/imports/${job.id}`}>{job.fileName}</Link> — {job.state === "committing" ? "importing now" : job.state === "failed" ? "failed" : "waiting for review"}</li>
            ))}
          </ul>
        </div>
      ) : null}

      {statistics.totals ? (
        <dl aria-label="Project statistics" className="grid grid-cols-2 gap-3 sm:grid-cols-4" data-testid="project-totals">
          <div className="rounded border border-line bg-panel p-3"><dt className="text-sm text-muted">Planned ({volumeUnit})</dt><dd className="figures text-lg">{volume(statistics.totals.plannedVolume)}</dd></div>
          <div className="rounded border border-line bg-panel p-3"><dt className="text-sm text-muted">Removed ({volumeUnit})</dt><dd className="figures text-lg" data-testid="removed-volume">{volume(statistics.totals.removedVolume)}</dd></div>
          <div className="rounded border border-line bg-panel p-3"><dt className="text-sm text-muted">Remaining ({volumeUnit})</dt><dd className="figures text-lg">{volume(statistics.totals.remainingVolume)}</dd></div>
          <div className="rounded border border-line bg-panel p-3"><dt className="text-sm text-muted">Cells at firm sand / confirmed</dt><dd className="figures text-lg" data-testid="cells-at-firm-sand">{statistics.totals.cellsAtFirmSand} / {statistics.totals.cellsConfirmed} of {statistics.totals.cells}</dd></div>
        </dl>
      ) : (
        <p className="text-sm text-muted">No cell statistics yet: they appear once an active baseline survey with probe depths is imported.</p>
      )}

      {surveys.length === 0 ? (
        <p className="rounded border border-dashed border-line bg-panel p-6 text-muted">
          No surveys yet. {canUpload ? "Upload the baseline survey (with probe depths to refusal) first." : "Survey technicians upload sounding files here after each pass."}
        </p>
      ) : (
        <table className="w-full border-collapse text-sm">
          <caption className="sr-only">Surveys of this project, newest first</caption>
          <thead>
            <tr className="border-b border-line text-left">
              <th scope="col" className="py-2 pr-3">Date</th>
              <th scope="col" className="py-2 pr-3">Kind</th>
              <th scope="col" className="py-2 pr-3">Uploaded by</th>
              <th scope="col" className="py-2 pr-3 text-right">Rows</th>
              <th scope="col" className="py-2 pr-3 text-right">Coverage</th>
              <th scope="col" className="py-2 pr-3">Status</th>
            </tr>
          </thead>
          <tbody>
            {surveys.map((survey) => (
              <tr key={survey.id} className={`border-b border-line ${survey.status === "retracted" ? "text-muted line-through decoration-1" : ""}`}>
                <td className="py-2 pr-3"><Link className="figures whitespace-nowrap text-lagoon underline" to={`${base}/${survey.id}`}><time dateTime={survey.surveyedOn}>{survey.surveyedOn}</time></Link></td>
                <td className="py-2 pr-3">{KIND_LABELS[survey.kind]}</td>
                <td className="py-2 pr-3">{survey.uploadedBy ?? "—"}</td>
                <td className="figures py-2 pr-3 text-right">{survey.rowCount.toLocaleString("en-US")}</td>
                <td className="figures py-2 pr-3 text-right">{percent(survey.coverage)}</td>
                <td className="py-2 pr-3">{survey.status === "active" ? "Active" : "Retracted"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
