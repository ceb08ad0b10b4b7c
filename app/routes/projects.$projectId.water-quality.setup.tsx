import { Form, Link, data } from "react-router";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { DomainError, type ErrorDetail } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom, type FieldErrors } from "~/lib/http/form";
import { unitLabel } from "../../shared/units";
import { TURBIDITY_RULE_KINDS } from "../../shared/water-quality/turbidity-rule";
import { DEPTH_RULES, RULE_EXAMPLES, STATION_KINDS, WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import {
  createRule, createStation, getWaterQualitySettings, listRules, listStations, ruleInputSchema, saveWaterQualitySettings, settingsInputSchema, stationInputSchema,
} from "~/models/water-quality.server";
import type { Route } from "./+types/projects.$projectId.water-quality.setup";
import { readPageForm } from "~/lib/http/body.server";

// The manager's water-quality setup: monitoring stations, the permit's turbidity rules (each with
// its source), the sampling routine and the wildlife settings.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "water-quality.configure");
  const [stations, rules, settings] = await Promise.all([listStations(project), listRules(project), getWaterQualitySettings(project)]);
  return { projectId: project.id, lengthLabel: unitLabel(project.lengthUnit), stations, rules, settings };
}

type ActionResult = { intent: string; errors: FieldErrors; notice: string | null };
const text = (value: FormDataEntryValue | null) => (value === null ? "" : String(value).trim());
const optionalNumber = (value: FormDataEntryValue | null) => (text(value) === "" ? null : Number(text(value)));

function refused(intent: string, details: readonly ErrorDetail[], status = 400) {
  return data<ActionResult>({ intent, errors: fieldErrorsFrom(details, (field) => field.split(".")[0]), notice: null }, { status });
}
const issuesOf = (issues: ReadonlyArray<{ path: PropertyKey[]; message: string }>): ErrorDetail[] => issues.map((issue) => ({ field: issue.path.map(String).join("."), message: issue.message }));

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "water-quality.configure");
  const form = await readPageForm(request);
  const intent = text(form.get("intent"));
  const ip = clientAddress(request);
  try {
    if (intent === "station") {
      const x = optionalNumber(form.get("x"));
      const y = optionalNumber(form.get("y"));
      const parsed = stationInputSchema.safeParse({
        name: text(form.get("name")), kind: text(form.get("kind")), position: x === null && y === null ? null : { x, y }, depth: text(form.get("depth")) || null, rule: optionalNumber(form.get("rule")),
      });
      if (!parsed.success) return refused(intent, issuesOf(parsed.error.issues));
      await createStation(project, user, parsed.data, ip);
      return { intent, errors: {}, notice: `Station “${parsed.data.name}” added.` } satisfies ActionResult;
    }
    if (intent === "rule") {
      const parsed = ruleInputSchema.safeParse({
        kind: text(form.get("kind")), limit: optionalNumber(form.get("limit")), inclusive: form.get("inclusive") === "on", percent: optionalNumber(form.get("percent")),
        floor: optionalNumber(form.get("floor")), cap: optionalNumber(form.get("cap")), pairingWindowMinutes: optionalNumber(form.get("pairingWindowMinutes")) ?? undefined,
        notifyWithinHours: optionalNumber(form.get("notifyWithinHours")) ?? undefined, source: text(form.get("source")),
      });
      if (!parsed.success) return refused(intent, issuesOf(parsed.error.issues));
      await createRule(project, user, parsed.data, ip);
      return { intent, errors: {}, notice: "Rule added: it is now the project's rule in force." } satisfies ActionResult;
    }
    if (intent === "settings") {
      const parsed = settingsInputSchema.safeParse(Object.fromEntries(form));
      if (!parsed.success) return refused(intent, issuesOf(parsed.error.issues));
      await saveWaterQualitySettings(project, user, parsed.data, ip);
      return { intent, errors: {}, notice: "Sampling and wildlife settings saved." } satisfies ActionResult;
    }
    return refused("invalid", [{ message: "Unknown action." }]);
  } catch (error) {
    if (error instanceof DomainError) return refused(intent, error.details, 409);
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Water-quality setup · Firmsand" }];
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

export default function WaterQualitySetup({ loaderData, actionData }: Route.ComponentProps) {
  const { projectId, stations, rules, settings, lengthLabel } = loaderData;
  const errorsFor = (intent: string): FieldErrors => (actionData?.intent === intent ? (actionData.errors as FieldErrors) : {});
  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-xl font-semibold">Water-quality setup</h2>
        <Link to={`/projects/${projectId}/water-quality`} className="text-sm text-lagoon underline">Back to water quality</Link>
      </div>
      <p role="note" className="rounded border border-caution bg-[#fff7e8] p-2 text-sm text-caution">{WATER_QUALITY_CAUTION} Set every figure here from the permit; examples are offered, never assumed.</p>
      <ActionMessages error={(actionData?.errors as FieldErrors | undefined)?.form} notice={actionData?.notice} />

      <section aria-labelledby="rules-heading" className="space-y-3">
        <h3 id="rules-heading" className="text-lg font-semibold">Turbidity rules</h3>
        {rules.length === 0 ? <p className="text-sm text-muted">No rule yet: compliance readings cannot be judged until one is set.</p> : (
          <ul className="space-y-1 text-sm">
            {rules.map((rule) => (
              <li key={rule.id}><span className={rule.inForce ? "font-semibold" : "text-muted"}>{rule.inForce ? "In force" : "Earlier"}</span> · {rule.summary} · pairing window {rule.pairingWindowMinutes} min · notify within {rule.notifyWithinHours} h · <span className="text-muted">source: {rule.source}</span></li>
            ))}
          </ul>
        )}
        <details className="rounded border border-line bg-panel p-3 text-sm">
          <summary className="cursor-pointer font-medium">Published examples (check them against your permit)</summary>
          <ul className="mt-2 list-disc pl-5">{RULE_EXAMPLES.map((example) => <li key={example.label}>{example.label}: kind {example.kind}, limit {example.limit} NTU. {example.source}.</li>)}</ul>
        </details>
        <Form method="post" className="max-w-xl space-y-3">
          <div>
            <label htmlFor="rule-kind" className="block text-sm font-medium">Kind</label>
            <select id="rule-kind" name="kind" className={inputClass}>{TURBIDITY_RULE_KINDS.map((kind) => <option key={kind}>{kind}</option>)}</select>
          </div>
          <div className="grid grid-cols-2 gap-3">
            <TextField label="Limit (NTU)" name="limit" inputMode="decimal" hint="Over background, or the ceiling for an absolute rule." error={errorsFor("rule").limit} />
            <label className="mt-6 flex items-center gap-2 text-sm"><input type="checkbox" name="inclusive" defaultChecked /> A reading at the limit is within it</label>
          </div>
          <div className="grid grid-cols-3 gap-3">
            <TextField label="Percent" name="percent" inputMode="decimal" error={errorsFor("rule").percent} />
            <TextField label="Floor (NTU)" name="floor" inputMode="decimal" error={errorsFor("rule").floor} />
            <TextField label="Cap (NTU)" name="cap" inputMode="decimal" error={errorsFor("rule").cap} />
          </div>
          <div className="grid grid-cols-2 gap-3">
            <TextField label="Pairing window (min)" name="pairingWindowMinutes" inputMode="numeric" defaultValue="60" error={errorsFor("rule").pairingWindowMinutes} />
            <TextField label="Notify the agency within (h)" name="notifyWithinHours" inputMode="decimal" defaultValue="24" error={errorsFor("rule").notifyWithinHours} />
          </div>
          <TextField label="Source (permit number and condition)" name="source" required maxLength={2000} error={errorsFor("rule").source} />
          <SubmitButton intent="rule" pendingLabel="Saving…">Add rule</SubmitButton>
        </Form>
      </section>

      <section aria-labelledby="stations-heading" className="space-y-3">
        <h3 id="stations-heading" className="text-lg font-semibold">Monitoring stations</h3>
        {stations.length === 0 ? <p className="text-sm text-muted">None yet.</p> : (
          <ul className="space-y-1 text-sm">{stations.map((station) => <li key={station.id}>{station.name} · {station.kind}{station.depth ? ` · ${station.depth}` : ""}{station.position ? ` · E ${station.position.x} N ${station.position.y}` : ""}{station.ruleId ? ` · own rule ${station.ruleId}` : ""}</li>)}</ul>
        )}
        <Form method="post" className="max-w-xl space-y-3">
          <TextField label="Name" name="name" required maxLength={120} error={errorsFor("station").name} />
          <div className="grid grid-cols-2 gap-3">
            <div>
              <label htmlFor="station-kind" className="block text-sm font-medium">Kind</label>
              <select id="station-kind" name="kind" className={inputClass}>{STATION_KINDS.map((kind) => <option key={kind}>{kind}</option>)}</select>
            </div>
            <div>
              <label htmlFor="station-depth" className="block text-sm font-medium">Depth rule</label>
              <select id="station-depth" name="depth" className={inputClass}><option value="">—</option>{DEPTH_RULES.map((depth) => <option key={depth}>{depth}</option>)}</select>
            </div>
          </div>
          {rules.length > 1 ? (
            <div>
              <label htmlFor="station-rule" className="block text-sm font-medium">Rule</label>
              <select id="station-rule" name="rule" className={inputClass}>
                <option value="">The project's rule in force</option>
                {rules.map((rule) => <option key={rule.id} value={rule.id}>Rule {rule.id}: {rule.summary}</option>)}
              </select>
            </div>
          ) : null}
          <div className="grid grid-cols-2 gap-3">
            <TextField label="Easting (project CRS)" name="x" inputMode="decimal" error={errorsFor("station").position} />
            <TextField label="Northing (project CRS)" name="y" inputMode="decimal" />
          </div>
          <SubmitButton intent="station" pendingLabel="Saving…">Add station</SubmitButton>
        </Form>
      </section>

      <section aria-labelledby="settings-heading" className="space-y-3">
        <h3 id="settings-heading" className="text-lg font-semibold">Sampling routine and wildlife</h3>
        {settings.isDefault ? <p className="text-sm text-caution">These are the offered defaults, not saved yet. The wildlife distance and wait are recalled from memory of common permit conditions: check them against the permit.</p> : null}
        <Form method="post" className="max-w-xl space-y-3">
          <div className="grid grid-cols-3 gap-3">
            <TextField label="Sample every (min)" name="samplingIntervalMinutes" inputMode="numeric" defaultValue={settings.samplingIntervalMinutes} error={errorsFor("settings").samplingIntervalMinutes} />
            <TextField label="Work day from" name="workdayStart" type="time" defaultValue={settings.workdayStart} error={errorsFor("settings").workdayStart} />
            <TextField label="to" name="workdayEnd" type="time" defaultValue={settings.workdayEnd} error={errorsFor("settings").workdayEnd} />
          </div>
          <TextField label="Source of the routine" name="samplingSource" defaultValue={settings.samplingSource} error={errorsFor("settings").samplingSource} />
          <div className="grid grid-cols-2 gap-3">
            <TextField label={`Shutdown distance (${lengthLabel})`} name="shutdownDistance" inputMode="decimal" defaultValue={settings.shutdownDistance} error={errorsFor("settings").shutdownDistance} />
            <TextField label="Wait after it leaves (min)" name="standDownWaitMinutes" inputMode="numeric" defaultValue={settings.standDownWaitMinutes} error={errorsFor("settings").standDownWaitMinutes} />
          </div>
          <TextField label="Source of the distance and wait" name="standDownSource" defaultValue={settings.standDownSource} error={errorsFor("settings").standDownSource} />
          <label className="block text-sm font-medium">Species (one a line)<textarea name="species" rows={3} defaultValue={settings.species.join("\n")} className={inputClass} /></label>
          {errorsFor("settings").species ? <p className="text-sm text-danger">{errorsFor("settings").species}</p> : null}
          <SubmitButton intent="settings" pendingLabel="Saving…">Save settings</SubmitButton>
        </Form>
      </section>
    </div>
  );
}
