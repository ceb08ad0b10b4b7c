import { Form, data } from "react-router";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { DomainError, NotFoundError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { readPageForm } from "~/lib/http/body.server";
import { fieldErrorsFrom, type FieldErrors } from "~/lib/http/form";
import { urlIdSchema } from "~/lib/http/url-id";
import { PHOTO_MAX_BYTES } from "~/lib/images/photo.server";
import { stagePhotoUpload } from "~/lib/images/stored-photo.server";
import { discardStagedFile, UploadRefused, type StagedUpload } from "~/lib/import/stage-upload.server";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { DewateringCaution, DewateringNav, formatFigure } from "~/components/dewatering/dewatering-section";
import { JarTestForm, MAX_JARS } from "~/components/dewatering/jar-test-form";
import { projectToday } from "~/models/dewatering.server";
import { JAR_TEST_CAUTION, addJarTestPhoto, jarTestInputSchema, listJarTests, recordJarTest } from "~/models/jar-tests.server";
import type { Route } from "./+types/projects.$projectId.dewatering.jar-tests";

// Jar tests: the operator's bench check of a polymer dose, with a photo of the jars. The operator
// and the manager record them (a phone at the bench); every member reads them.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const [jarTests, today] = await Promise.all([listJarTests(project), projectToday(project)]);
  return { project: { id: project.id }, jarTests, today, canLog: can(access, "dewatering.log"), caution: JAR_TEST_CAUTION, photoMaxMegabytes: PHOTO_MAX_BYTES / 1024 / 1024 };
}

type Intent = "jar-test" | "photo";
type ActionResult = { intent: Intent; errors: FieldErrors; notice: string | null; jarTestId?: number };

const numberOf = (value: string | undefined) => (value === undefined || value.trim() === "" ? null : Number(value.trim()));

/** The form's inputs as the API's jar test body, and which jar row each listed jar came from (blank rows are left out). */
function jarTestBodyFrom(fields: Record<string, string>) {
  const value = (name: string) => (fields[name] ?? "").trim();
  const rows: number[] = [];
  const jars = [];
  for (let row = 0; row < MAX_JARS; row += 1) {
    const [dose, ntu, clarity] = ["dose", "ntu", "clarity"].map((part) => value(`jar-${row}-${part}`));
    if (dose === "" && ntu === "" && clarity === "") continue;
    rows.push(row);
    jars.push({ doseMgPerL: numberOf(dose) ?? Number.NaN, settlingMinutes: numberOf(value("settlingMinutes")) ?? Number.NaN, turbidityNtu: numberOf(ntu), clarity });
  }
  const body = {
    date: value("date"), time: value("time") || null, sampleSource: value("sampleSource"),
    polymer: { product: value("polymerProduct"), lot: value("polymerLot") || null, benchStockPercent: numberOf(value("benchStockPercent")) ?? Number.NaN },
    jarVolumeMl: numberOf(value("jarVolumeMl")) ?? Number.NaN,
    raw: { turbidityNtu: numberOf(value("rawNtu")) },
    jars, chosenDoseMgPerL: numberOf(value("chosenDose")), notes: value("notes"),
  };
  const JAR_INPUTS: Record<string, string> = { doseMgPerL: "dose", turbidityNtu: "ntu", clarity: "clarity" };
  const FIELDS: Record<string, string> = {
    "polymer.product": "polymerProduct", "polymer.lot": "polymerLot", "polymer.benchStockPercent": "benchStockPercent", polymer: "polymerProduct",
    "raw.turbidityNtu": "rawNtu", chosenDoseMgPerL: "chosenDose",
  };
  const inputOf = (field: string) => {
    const jar = /^jars\.(\d+)\.(\w+)$/.exec(field);
    if (jar) return jar[2] === "settlingMinutes" ? "settlingMinutes" : `jar-${rows[Number(jar[1])]}-${JAR_INPUTS[jar[2]] ?? "dose"}`;
    return FIELDS[field] ?? field.split(".")[0];
  };
  return { body, inputOf };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { user, project } = await requireRole(request, params.projectId, "dewatering.log");
  const ip = clientAddress(request);
  const refused = (result: Omit<ActionResult, "notice">) => data({ ...result, notice: null } satisfies ActionResult, { status: 400 });
  // The jar test form carries its photo, so it is multipart; a url-encoded post is read within the page-form limit.
  let staged: StagedUpload;
  if ((request.headers.get("Content-Type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    try {
      staged = await stagePhotoUpload(request);
    } catch (error) {
      if (error instanceof UploadRefused) return refused({ intent: "photo", errors: { form: error.message } });
      throw error;
    }
  } else {
    staged = { fields: Object.fromEntries([...(await readPageForm(request)).entries()].filter((entry): entry is [string, string] => typeof entry[1] === "string")), file: null };
  }
  const intent: Intent = staged.fields.intent === "photo" ? "photo" : "jar-test";
  const emptyFile = staged.emptyFileName ? `"${staged.emptyFileName}" is an empty file; choose the photo again.` : null;
  try {
    if (staged.fields.intent === "photo") {
      const jarTestId = urlIdSchema.safeParse(staged.fields.jarTestId ?? "");
      if (!jarTestId.success) return refused({ intent, errors: { form: "Choose a jar test." } });
      if (!staged.file) return refused({ intent, jarTestId: jarTestId.data, errors: { file: emptyFile ?? "Choose a photo to add." } });
      await addJarTestPhoto(project, user, jarTestId.data, staged.file, ip);
      return { intent, jarTestId: jarTestId.data, errors: {}, notice: "Added the photo." } satisfies ActionResult;
    }
    if (staged.fields.intent !== "jar-test") return refused({ intent, errors: { form: "That request is not one this page makes." } });
    if (emptyFile) return refused({ intent, errors: { file: emptyFile } });
    const { body, inputOf } = jarTestBodyFrom(staged.fields);
    const parsed = jarTestInputSchema.safeParse(body);
    if (!parsed.success) return refused({ intent, errors: fieldErrorsFrom(detailsOf(parsed.error), inputOf) });
    try {
      const { jarTest } = await recordJarTest(project, user, parsed.data, staged.file, ip);
      const chosen = jarTest.chosenDoseMgPerL === null ? "no dose chosen" : `dose chosen ${formatFigure(jarTest.chosenDoseMgPerL, 2)} mg/L`;
      return { intent, errors: {}, notice: `Recorded the jar test of ${jarTest.date}: ${jarTest.jars.length} dosed ${jarTest.jars.length === 1 ? "jar" : "jars"}, ${chosen}${jarTest.photos.length > 0 ? ", with its photo" : ""}.` } satisfies ActionResult;
    } catch (error) {
      if (error instanceof DomainError) return refused({ intent, errors: fieldErrorsFrom(error.details, inputOf) });
      throw error;
    }
  } catch (error) {
    if (error instanceof NotFoundError) throw new Response(error.message, { status: 404 });
    if (error instanceof DomainError) return refused({ intent, errors: fieldErrorsFrom(error.details, (field) => field) });
    throw error;
  } finally {
    if (staged.file) await discardStagedFile(staged.file.path);
  }
}

type JarTestView = Route.ComponentProps["loaderData"]["jarTests"][number];

function JarTestCard({ test, projectId, canLog, actionData }: { test: JarTestView; projectId: number; canLog: boolean; actionData: ActionResult | undefined }) {
  const photoUrl = (photoId: number, thumb = false) => `/api/projects/${projectId}/dewatering/jar-tests/${test.id}/photos/${photoId}${thumb ? "?size=thumb" : ""}`;
  const headingId = `jar-test-${test.id}`;
  const photoErrors = actionData?.intent === "photo" && actionData.jarTestId === test.id ? actionData.errors : {};
  return (
    <article aria-labelledby={headingId} className="space-y-2 rounded border border-line bg-panel p-3" data-testid={`jar-test-${test.id}`}>
      <header className="flex flex-wrap items-baseline justify-between gap-x-3">
        <h3 id={headingId} className="font-semibold"><time dateTime={test.date} className="figures whitespace-nowrap">{test.date}</time>{test.time ? <span className="figures"> {test.time}</span> : null} · {test.polymer.product}{test.polymer.lot ? `, lot ${test.polymer.lot}` : ""}</h3>
        <p className="text-sm">
          {test.chosenDoseMgPerL === null ? <span className="text-muted">no dose chosen</span> : <strong>Dose chosen: <span className="figures">{formatFigure(test.chosenDoseMgPerL, 2)} mg/L</span></strong>}
        </p>
      </header>
      <p className="text-sm text-muted">
        Bench stock <span className="figures">{formatFigure(test.polymer.benchStockPercent, 3)} %</span> · jars of <span className="figures">{formatFigure(test.jarVolumeMl, 0)} mL</span>
        {test.sampleSource ? ` · sample from ${test.sampleSource}` : ""} · raw sample {test.raw.turbidityNtu === null ? "not measured" : <span className="figures">{formatFigure(test.raw.turbidityNtu, 1)} NTU</span>}
      </p>
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label={`Jars of the test of ${test.date}`}>
        <table className="w-full border-collapse text-sm">
          <thead>
            <tr className="border-b border-line text-left"><th className="py-1 pr-2 text-right">Dose</th><th className="pr-2 text-right">Stock added</th><th className="pr-2 text-right">Settled</th><th className="pr-2 text-right">Turbidity</th><th className="pr-2">Clarity</th><th className="text-right">Removed</th></tr>
          </thead>
          <tbody>
            {test.jars.map((jar, index) => (
              <tr key={index} className={`border-b border-line ${jar.doseMgPerL === test.chosenDoseMgPerL ? "font-semibold" : ""}`}>
                <td className="text-right figures py-1 pr-2 whitespace-nowrap">{formatFigure(jar.doseMgPerL, 2)} mg/L</td>
                <td className="text-right figures pr-2 whitespace-nowrap">{formatFigure(jar.stockMl, 2)} mL</td>
                <td className="text-right figures pr-2 whitespace-nowrap">{formatFigure(jar.settlingMinutes, 0)} min</td>
                <td className="text-right figures pr-2 whitespace-nowrap">{jar.turbidityNtu === null ? "–" : `${formatFigure(jar.turbidityNtu, 1)} NTU`}</td>
                <td className="pr-2 whitespace-nowrap">{jar.clarityLabel}</td>
                <td className="text-right figures whitespace-nowrap">{jar.turbidityRemoval === null ? "–" : `${formatFigure(jar.turbidityRemoval * 100, 0)} %`}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {test.clearestAtLowestDose !== null && test.clearestAtLowestDose !== test.chosenDoseMgPerL ? (
        <p className="text-xs text-muted">The clearest jar at the lowest dose was <span className="figures">{formatFigure(test.clearestAtLowestDose, 2)} mg/L</span>.</p>
      ) : null}
      {test.notes ? <p className="text-sm">{test.notes}</p> : null}
      {test.photos.length > 0 ? (
        <ul className="grid grid-cols-2 gap-2 sm:grid-cols-4">
          {test.photos.map((photo) => (
            <li key={photo.id} className="rounded border border-line p-1 text-xs">
              <a href={photoUrl(photo.id)}><img src={photoUrl(photo.id, true)} alt={`Jars of the test of ${test.date}: ${photo.originalFileName}`} className="aspect-[4/3] w-full object-cover" loading="lazy" /></a>
            </li>
          ))}
        </ul>
      ) : <p className="text-xs text-muted">No photo yet.</p>}
      {canLog ? (
        <Form method="post" encType="multipart/form-data" className="flex flex-wrap items-end gap-2" aria-label={`Add a photo to the test of ${test.date}`}>
          <input type="hidden" name="jarTestId" value={test.id} />
          <div>
            <label htmlFor={`jar-test-${test.id}-photo`} className="block text-sm">Add a photo</label>
            <input id={`jar-test-${test.id}-photo`} name="file" type="file" accept="image/jpeg,image/png,image/webp" required className="block w-full text-sm" />
          </div>
          <SubmitButton pendingLabel="Uploading…" intent="photo" tone="plain" className="py-2">Upload</SubmitButton>
          {photoErrors.file ? <p className="w-full text-sm text-danger">{photoErrors.file}</p> : null}
        </Form>
      ) : null}
    </article>
  );
}

export default function DewateringJarTests({ loaderData, actionData }: Route.ComponentProps) {
  const { project, jarTests } = loaderData;
  const result = actionData as ActionResult | undefined;
  const errors = result?.intent === "jar-test" ? result.errors : ({} as FieldErrors);
  return (
    <div className="space-y-5">
      <DewateringNav projectId={project.id} />
      <DewateringCaution text={loaderData.caution} />
      <ActionMessages error={result?.errors.form} notice={result?.notice} />
      {loaderData.canLog ? (
        <section aria-labelledby="record-jar-test" className="rounded border border-line bg-panel p-4">
          <h2 id="record-jar-test" className="mb-3 font-semibold">Record a jar test</h2>
          <JarTestForm key={result?.intent === "jar-test" ? (result.notice ?? "form") : "form"} defaultDate={loaderData.today} errors={errors} photoMaxMegabytes={loaderData.photoMaxMegabytes} />
        </section>
      ) : null}
      <section aria-labelledby="jar-test-list" className="space-y-3">
        <h2 id="jar-test-list" className="font-semibold">Jar tests</h2>
        {jarTests.length === 0 ? <p className="text-sm text-muted">No jar tests recorded yet.</p> : jarTests.map((test) => <JarTestCard key={test.id} test={test} projectId={project.id} canLog={loaderData.canLog} actionData={result} />)}
      </section>
    </div>
  );
}

export function meta() {
  return [{ title: "Jar tests · Firmsand" }];
}
