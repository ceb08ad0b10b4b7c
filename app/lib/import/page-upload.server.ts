import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { commitChoicesSchema } from "./import-options";
import { importOptionsFromFields, type FieldProblem } from "./form-fields";
import { createImportJob, previewImportJob } from "./import-service.server";
import { stagedFileNotText } from "./analyse.server";
import { discardStagedFile, stageUpload, UploadRefused, type StagedUpload } from "./stage-upload.server";

/** The upload page's work: stage the file, read the choices, open an import job and its first preview. */
export const DEFAULT_TIME_ZONE = "America/New_York";

export type PageUploadResult = { ok: true; location: string } | { ok: false; status: number; errors: FieldProblem[] };

export async function receivePageUpload(request: Request, project: ProjectView, user: UserView): Promise<PageUploadResult> {
  let staged;
  try {
    staged = await stageUpload(request);
  } catch (error) {
    if (error instanceof UploadRefused) return { ok: false, status: error.status, errors: [{ field: "file", message: error.message }] };
    throw error;
  }
  const { fields, file } = staged;
  const refused = await refuseUnreadableFile(staged);
  if (refused) return { ok: false, status: 422, errors: [{ field: "file", message: refused }] };
  if (!file) return { ok: false, status: 400, errors: [{ field: "file", message: "Choose a CSV file to upload." }] };
  const { options, problems } = importOptionsFromFields(fields, { crs: project.crs, lengthUnit: project.lengthUnit, timeZone: project.timeZone || DEFAULT_TIME_ZONE, surveyOrder: project.surveyOrder });
  if (!options) {
    await discardStagedFile(file.path);
    return { ok: false, status: 400, errors: problems };
  }
  const job = await createImportJob(project.id, user.id, file, options);
  await previewImportJob(job, options, commitChoicesSchema.parse({}));
  return { ok: true, location: `/projects/${project.id}/surveys/imports/${job.id}` };
}

/**
 * A chosen file that cannot be a sounding file: empty (0 bytes), or not text (an image, a PDF, a
 * workbook…). It is discarded here, before any job reads it; the message says what the file is.
 * Null when the file (or the lack of one) is for the caller to judge.
 */
export async function refuseUnreadableFile(staged: StagedUpload): Promise<string | null> {
  if (!staged.file && staged.emptyFileName) {
    return `The file you chose, ${staged.emptyFileName}, is empty (0 bytes): there is nothing in it to check. Export the soundings again and choose the new file.`;
  }
  if (!staged.file) return null;
  const notText = await stagedFileNotText(staged.file.path, staged.file.fileName);
  if (notText) await discardStagedFile(staged.file.path);
  return notText;
}
