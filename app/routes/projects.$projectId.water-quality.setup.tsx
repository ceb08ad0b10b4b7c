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
import { ALERT_ROLE_CHOICES, DEPTH_RULES, RULE_EXAMPLES, STATION_KINDS, WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import { listMembers } from "~/models/membership.server";
import { roleLabel } from "~/lib/auth/roles";
import { TURBIDITY_UNITS } from "../../shared/water-quality/turbidity-rule";
import {
  createRule, createStation, getWaterQualitySettings, listRules, listStations, ruleInputSchema, saveWaterQualitySettings, settingsInputSchema, stationInputSchema,
} from "~/models/water-quality.server";
import type { Route } from "./+types/projects.$projectId.water-quality.setup";
import { readPageForm } from "~/lib/http/body.server";

// The manager's water-quality setup: monitoring stations, the permit's turbidity rules (each with
// its source), the sampling routine and the wildlife settings.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "water-quality.configure");
  const [stations, rules, settings, members] = await Promise.all([listStations(project), listRules(project), getWaterQualitySettings(project), listMembers(project)]);
  return {
    projectId: project.id, lengthLabel: unitLabel(project.lengthUnit), stations, rules, settings,
    members: members.map((member) => ({ userId: member.userId, name: member.name, role: member.role })),
  };
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
        notifyWithinHours: optionalNumber(form.get("notifyWithinHours")) ?? undefined, source: text(form.get("source")), unit: text(form.get("unit")) || undefined,
      });
      if (!parsed.success) return refused(intent, issuesOf(parsed.error.issues));
      await createRule(project, user, parsed.data, ip);
      return { intent, errors: {}, notice: "Rule added: it is now the project's rule in force." } satisfies ActionResult;
    }
    if (intent === "settings") {
      // Checkboxes send one value per box ticked: read them as lists.
      const parsed = settingsInputSchema.safeParse({ ...Object.fromEntries(form), alertRoles: form.getAll("alertRoles"), alertUserIds: form.getAll("alertUserIds"), alertAddresses: text(form.get("alertAddresses")) });
      if (!parsed.success) return refused(intent, issuesOf(parsed.error.issues));
      await saveWaterQualitySettings(project, user, parsed.data, ip);
      return { intent, errors: {}, notice: "Sampling, alert and wildlife settings saved." } satisfies ActionResult;
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
  const { projectId, stations, rules, settings, lengthLabel, members } = loaderData;
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
          <div>
            <label htmlFor="rule-unit" className="block text-sm font-medium">Unit the permit states the rule in</label>
            <select id="rule-unit" name="unit" defaultValue="NTU" className={inputClass}>{TURBIDITY_UNITS.map((unit) => <option key={unit}>{unit}</option>)}</select>
            <p className="mt-1 text-xs text-muted">The limits below are in this unit. Readings are paired only with a background in their own unit; a reading in the other unit is judged as a number against this rule, and its verdict says so.</p>
          </div>
          <div className="grid grid-cols-2 gap-3">
            <TextField label="Limit" name="limit" inputMode="decimal" hint="Over background, or the ceiling for an absolute rule." error={errorsFor("rule").limit} />
            <label className="mt-6 flex items-center gap-2 text-sm"><input type="checkbox" name="inclusive" defaultChecked /> A reading at the limit is within it</label>
          </div>
          <div className="grid grid-cols-3 gap-3">
            <TextField label="Percent" name="percent" inputMode="decimal" error={errorsFor("rule").percent} />
            <TextField label="Floor" name="floor" inputMode="decimal" error={errorsFor("rule").floor} />
            <TextField label="Cap" name="cap" inputMode="decimal" error={errorsFor("rule").cap} />
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
        <h3 id="settings-heading" className="text-lg font-semibold">Sampling routine, alerts and wildlife</h3>
        {settings.isDefault ? <p className="text-sm text-caution">These are the offered defaults, not saved yet. The wildlife distance and wait are recalled from memory of common permit conditions: check them against the permit.</p> : null}
        <Form method="post" className="max-w-xl space-y-3">
          <fieldset className="space-y-2 rounded border border-line p-3">
            <legend className="px-1 text-sm font-medium">Compliance samples while work is active</legend>
            <label className="flex items-start gap-2 text-sm">
              <input type="radio" name="samplingMode" value="interval" defaultChecked={settings.samplingMode === "interval"} className="mt-1" />
              <span>At an interval: a sample in every stretch of the work day this long</span>
            </label>
            <div className="pl-6"><TextField label="Sample every (min)" name="samplingIntervalMinutes" inputMode="numeric" defaultValue={settings.samplingIntervalMinutes} error={errorsFor("settings").samplingIntervalMinutes} /></div>
            <label className="flex items-start gap-2 text-sm">
              <input type="radio" name="samplingMode" value="per-day" defaultChecked={settings.samplingMode === "per-day"} className="mt-1" />
              <span>So many a day, spaced as the permit words it: at least so long apart (spread over the day) or no more than so long apart (taken close together)</span>
            </label>
            <div className="grid grid-cols-1 gap-3 pl-6 sm:grid-cols-3">
              <TextField label="Samples a day" name="samplesPerDay" inputMode="numeric" defaultValue={settings.samplesPerDay ?? ""} error={errorsFor("settings").samplesPerDay} />
              <div>
                <label htmlFor="gapRule" className="block text-sm font-medium">Spacing</label>
                <select id="gapRule" name="gapRule" defaultValue={settings.gapRule ?? "at-least"} className="mt-1 block w-full rounded border border-line bg-panel px-2 py-2">
                  <option value="at-least">at least</option>
                  <option value="at-most">no more than</option>
                </select>
              </div>
              <TextField label="Hours apart" name="minimumGapHours" inputMode="decimal" defaultValue={settings.minimumGapHours ?? ""} error={errorsFor("settings").minimumGapHours} />
            </div>
            <p className="pl-6 text-xs text-caution">Examples such as "twice daily, at least 4 h apart" or "twice daily, no more than 4 h apart" are recalled from memory of permit wording, not from this project's permit: copy the permit's own words and name them in the source below.</p>
            <div className="grid grid-cols-2 gap-3">
              <TextField label="Work day from" name="workdayStart" type="time" defaultValue={settings.workdayStart} error={errorsFor("settings").workdayStart} />
              <TextField label="to" name="workdayEnd" type="time" defaultValue={settings.workdayEnd} error={errorsFor("settings").workdayEnd} />
            </div>
            <p className="text-xs text-muted">Missed samples are counted on days a dive or a dewatering shift was logged, within the work day, in the project's time zone.</p>
          </fieldset>
          <TextField label="Source of the routine" name="samplingSource" defaultValue={settings.samplingSource} error={errorsFor("settings").samplingSource} />
          <fieldset className="space-y-2 rounded border border-line p-3 text-sm" aria-describedby="alert-help">
            <legend className="px-1 font-medium">Who is e-mailed at once on an exceedance</legend>
            <p id="alert-help" className="text-xs text-muted">Every member with a ticked role, the members ticked by name, and the outside addresses. The banner shows every member regardless.</p>
            <div className="grid grid-cols-1 gap-1 sm:grid-cols-2">
              {ALERT_ROLE_CHOICES.map((role) => (
                <label key={role} className="flex items-center gap-2"><input type="checkbox" name="alertRoles" value={role} defaultChecked={settings.alertRecipients.roles.includes(role)} /> Every {roleLabel(role, "sentence")}</label>
              ))}
            </div>
            {errorsFor("settings").alertRoles ? <p className="text-danger">{errorsFor("settings").alertRoles}</p> : null}
            {members.length > 0 ? (
              <details open={settings.alertRecipients.userIds.length > 0}>
                <summary className="cursor-pointer">Members chosen by name ({settings.alertRecipients.userIds.length})</summary>
                <div className="mt-1 grid grid-cols-1 gap-1 sm:grid-cols-2">
                  {members.map((member) => (
                    <label key={member.userId} className="flex items-center gap-2"><input type="checkbox" name="alertUserIds" value={member.userId} defaultChecked={settings.alertRecipients.userIds.includes(member.userId)} /> {member.name} <span className="text-muted">({roleLabel(member.role, "sentence")})</span></label>
                  ))}
                </div>
                {errorsFor("settings").alertUserIds ? <p className="text-danger">{errorsFor("settings").alertUserIds}</p> : null}
              </details>
            ) : null}
            <label className="block font-medium">Outside addresses (one a line)
              <textarea name="alertAddresses" rows={2} defaultValue={settings.alertRecipients.addresses.join("\n")} className={inputClass} placeholder="duty-officer@agency.example" />
            </label>
            {errorsFor("settings").alertAddresses ? <p className="text-danger">{errorsFor("settings").alertAddresses}</p> : null}
          </fieldset>
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
