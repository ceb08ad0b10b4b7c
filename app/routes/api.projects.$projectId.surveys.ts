import { clientAddress } from "~/lib/client-address.server";
import { jsonError, requireApiRole } from "~/lib/import/api-access.server";
import { commitChoicesFromFields, importOptionsFromFields } from "~/lib/import/form-fields";
import { importSurveyFile } from "~/lib/import/import-service.server";
import { discardStagedFile, stageUpload, UploadRefused } from "~/lib/import/stage-upload.server";
import { listSurveys } from "~/models/survey.server";
import type { Route } from "./+types/api.projects.$projectId.surveys";

// GET: the project's surveys. POST (multipart: file, kind, surveyedOn, waterSurfaceElevation,
// optional crs, columns, …): 201 stored, 422 with every problem and nothing stored, 403 for roles
// other than surveyor and manager, 413 over the size limit.

export const DEFAULT_TIME_ZONE = "UTC";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireApiRole(request, params.projectId);
  return Response.json({ surveys: await listSurveys(project) }, { headers: { "Cache-Control": "no-store" } });
}

export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, "Use POST to upload a survey.");
  // The role is checked before the body is read, so a refused upload never reaches the disk.
  const { project, user } = await requireApiRole(request, params.projectId, "surveys.import");
  let staged;
  try {
    staged = await stageUpload(request);
  } catch (error) {
    if (error instanceof UploadRefused) return jsonError(error.status, error.message);
    throw error;
  }
  const { fields, file } = staged;
  try {
    if (!file) return Response.json({ errors: [{ row: null, column: "file", message: "no file was sent in the `file` field" }] }, { status: 422 });
    const { options, problems } = importOptionsFromFields(fields, { crs: project.crs, lengthUnit: project.lengthUnit, timeZone: DEFAULT_TIME_ZONE });
    const { choices, problems: choiceProblems } = commitChoicesFromFields({ outside: "keep", ...fields });
    if (!options || !choices) return Response.json({ errors: [...problems, ...choiceProblems] }, { status: 422 });
    const outcome = await importSurveyFile({ projectId: project.id, userId: user.id, ip: clientAddress(request), staged: file, options, choices });
    if (!outcome.ok) {
      const { preview } = outcome;
      const errors = [
        ...preview.fileProblems.map((message) => ({ row: null, column: "file", value: "", message })),
        ...preview.problems.map((problem) => ({ row: problem.row, column: problem.column, value: problem.value, message: problem.message })),
      ];
      if (preview.sameFile.length > 0 && !choices.acceptSameFile) {
        errors.push({ row: null, column: "file", value: file.sha256, message: `the same file was imported before as survey ${preview.sameFile.map((survey) => `#${survey.surveyId}`).join(", ")}; send acceptSameFile=true to import it again` });
      }
      if (preview.depthUnit && !choices.acceptDepthUnit) {
        errors.push({ row: null, column: "depth", value: "", message: `${preview.depthUnit.message} Send acceptDepthUnit=true to import the values as declared.` });
      }
      return Response.json({ errors, blockers: preview.blockers, problemCount: preview.problemCount, warnings: preview.warnings }, { status: 422 });
    }
    const { committed } = outcome;
    return Response.json(
      { id: committed.surveyId, rowCount: committed.rowCount, soundingCount: committed.soundingCount, warnings: committed.warnings },
      { status: 201, headers: { Location: `/api/projects/${project.id}/surveys/${committed.surveyId}` } },
    );
  } finally {
    if (file) await discardStagedFile(file.path);
  }
}
