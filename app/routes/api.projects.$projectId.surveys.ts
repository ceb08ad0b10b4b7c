import { requireApiAccess } from "~/lib/api/access.server";
import { assertMediaType } from "~/lib/api/body.server";
import { BadRequestError, PayloadTooLargeError } from "~/lib/errors";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { ValidationError, type ErrorDetail } from "~/lib/errors";
import { commitChoicesFromFields, importOptionsFromFields } from "~/lib/import/form-fields";
import { importSurveyFile } from "~/lib/import/import-service.server";
import { refuseUnreadableFile } from "~/lib/import/page-upload.server";
import { discardStagedFile, stageUpload, UploadRefused } from "~/lib/import/stage-upload.server";
import { listSurveys } from "~/models/survey.server";
import type { Route } from "./+types/api.projects.$projectId.surveys";

const DEFAULT_TIME_ZONE = "UTC";

/** The upload's own limit (UPLOAD_MAX_BYTES) replaces the JSON body limit: busboy streams the file to disk. */
async function stage(request: Request) {
  try {
    return await stageUpload(request);
  } catch (error) {
    if (error instanceof UploadRefused) throw error.status === 413 ? new PayloadTooLargeError({ field: "file", message: error.message }) : new BadRequestError({ field: "file", message: error.message });
    throw error;
  }
}

const route = apiRoute<Route.LoaderArgs>({
  // GET — the project's surveys (any member).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    return Response.json({ surveys: await listSurveys(project) }, { headers: { "Cache-Control": "no-store" } });
  },
  // POST multipart (file, kind, surveyedOn, waterSurfaceElevation, optional crs, columns, …):
  // 201 stored; 422 with every problem and nothing stored; 413 over the size limit.
  async POST({ request, params }) {
    // The role is checked before the body is read, so a refused upload never reaches the disk.
    const { project, user } = await requireApiAccess(request, params.projectId, "surveys.import");
    assertMediaType(request, "multipart/form-data");
    const staged = await stage(request);
    const { fields, file } = staged;
    const refused = await refuseUnreadableFile(staged);
    if (refused) throw new ValidationError({ field: "file", message: refused });
    try {
      if (!file) throw new ValidationError({ field: "file", message: "no file was sent in the `file` field" });
      const { options, problems } = importOptionsFromFields(fields, { crs: project.crs, lengthUnit: project.lengthUnit, timeZone: DEFAULT_TIME_ZONE, surveyOrder: project.surveyOrder });
      const { choices, problems: choiceProblems } = commitChoicesFromFields({ outside: "keep", ...fields });
      if (!options || !choices) throw new ValidationError([...problems, ...choiceProblems]);
      const outcome = await importSurveyFile({ projectId: project.id, userId: user.id, ip: clientAddress(request), staged: file, options, choices });
      if (!outcome.ok) {
        const { preview } = outcome;
        const errors: ErrorDetail[] = [
          ...preview.fileProblems.map((message) => ({ field: "file", message })),
          ...preview.problems.map((problem) => ({ row: problem.row, column: problem.column, value: problem.value, message: problem.message })),
        ];
        if (preview.sameFile.length > 0 && !choices.acceptSameFile) {
          errors.push({ field: "file", value: file.sha256, message: `the same file was imported before as survey ${preview.sameFile.map((survey) => `#${survey.surveyId}`).join(", ")}; send acceptSameFile=true to import it again` });
        }
        if (preview.depthUnit && !choices.acceptDepthUnit) {
          errors.push({ column: "depth", message: `${preview.depthUnit.message} Send acceptDepthUnit=true to import the values as declared.` });
        }
        if (preview.bottomShift && !choices.acceptBottomShift) {
          errors.push({ field: "waterSurfaceElevation", message: `${preview.bottomShift.message} Send acceptBottomShift=true to import the bottom as it is.` });
        }
        throw new ValidationError(errors, { blockers: preview.blockers, problemCount: preview.problemCount, warnings: preview.warnings });
      }
      const { committed } = outcome;
      return Response.json(
        { id: committed.surveyId, rowCount: committed.rowCount, soundingCount: committed.soundingCount, warnings: committed.warnings },
        { status: 201, headers: { Location: `/api/projects/${project.id}/surveys/${committed.surveyId}` } },
      );
    } finally {
      if (file) await discardStagedFile(file.path);
    }
  },
});
export const loader = route.loader;
export const action = route.action;
