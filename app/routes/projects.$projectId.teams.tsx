import { Form, Link, data } from "react-router";
import { z } from "zod";
import { ActionMessages } from "~/components/form-message";
import { ConfirmedActionForm } from "~/components/confirmed-action-form";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { DomainError, type ErrorDetail } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { readPageForm } from "~/lib/http/body.server";
import { fieldErrorsFrom, parseForm, type FieldErrors } from "~/lib/http/form";
import { createDiveTeam, listDiveTeams, removeDiveTeam, retiredBecause, teamInputSchema, updateDiveTeam, type DiveTeamView } from "~/models/dive-teams.server";
import { listMembers } from "~/models/membership.server";
import { diameterUnitFor, formatDiameter, DIAMETER_RANGE, type DiameterUnit, type TeamEquipment } from "../../shared/dive-plan/equipment";
import type { Route } from "./+types/projects.$projectId.teams";

// The project's dive teams: every member reads them; the manager and the dive supervisor add,
// change, retire and bring back teams through the one teams service the API uses.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const canManage = can(access, "teams.manage");
  const [teams, members] = await Promise.all([listDiveTeams(access.project, { retired: true }), canManage ? listMembers(access.project) : Promise.resolve([])]);
  return {
    projectId: access.project.id,
    teams,
    minTeamSize: access.project.minTeamSize,
    diameterUnit: diameterUnitFor(access.project.lengthUnit),
    canManage,
    canConfigure: can(access, "project.configure"),
    // Names the crew field suggests (members are linked by name).
    memberNames: members.map((member) => member.name),
  };
}

const teamFields = {
  name: z.string(),
  station: z.string().default(""),
  hoses: z.string().max(10_000).default(""),
  pumps: z.string().max(10_000).default(""),
  crew: z.string().max(10_000).default(""),
};
const teamId = z.coerce.number({ error: "Choose a team" }).int().positive();
const actionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("create"), ...teamFields }),
  z.object({ intent: z.literal("update"), teamId, ...teamFields }),
  z.object({ intent: z.literal("remove"), teamId }),
  z.object({ intent: z.literal("return"), teamId }),
]);

/** The crew box: one person a line, "name, duty, e-mail" (duty and e-mail optional). */
function crewLines(text: string) {
  return text.split(/\r?\n/).map((line) => line.trim()).filter(Boolean).map((line) => {
    const [name, duty = "", email = ""] = line.split(",").map((part) => part.trim());
    return { name, duty, ...(email ? { email } : {}) };
  });
}

/**
 * The hoses or pumps box: one a line, "name, diameter" (the diameter optional, in the project's unit;
 * a unit written after it is allowed). A diameter that is not a number is passed on as written, so
 * the service's check names its line.
 */
function equipmentLines(text: string) {
  return text.split(/\r?\n/).map((line) => line.trim()).filter(Boolean).map((line) => {
    const comma = line.lastIndexOf(",");
    if (comma < 0) return { name: line, diameter: null };
    const name = line.slice(0, comma).trim();
    const written = line.slice(comma + 1).trim().replace(/\s*(in|inch|inches|mm|")$/i, "");
    if (written === "") return { name, diameter: null };
    const value = Number(written.replace(",", "."));
    return { name, diameter: Number.isFinite(value) ? value : written };
  });
}

type ActionResult = { intent: string; teamId: number | null; errors: FieldErrors; notice: string | null };

/** A refusal's details on the form's inputs: `members.3` is the crew box's fourth line, `hoses.1.diameter` the second hose's diameter. */
function formErrors(details: readonly ErrorDetail[]): FieldErrors {
  const worded = details.map((detail) => {
    const [field, index] = (detail.field ?? "").split(".");
    if ((field === "members" || field === "hoses" || field === "pumps") && index !== undefined) return { ...detail, message: `Line ${Number(index) + 1}: ${detail.message}` };
    return detail;
  });
  return fieldErrorsFrom(worded, (field) => {
    const first = field.split(".")[0];
    return first === "members" ? "crew" : first;
  });
}

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "teams.manage");
  const parsed = parseForm(await readPageForm(request), actionSchema);
  if (!parsed.ok) return data<ActionResult>({ intent: "invalid", teamId: null, errors: parsed.errors, notice: null }, { status: 400 });
  const input = parsed.data;
  const ip = clientAddress(request);
  const forTeam = "teamId" in input ? input.teamId : null;
  try {
    switch (input.intent) {
      case "create":
      case "update": {
        const checked = teamInputSchema.safeParse({ name: input.name, station: input.station, hoses: equipmentLines(input.hoses), pumps: equipmentLines(input.pumps), members: crewLines(input.crew) });
        if (!checked.success) {
          return data<ActionResult>({ intent: input.intent, teamId: forTeam, errors: formErrors(checked.error.issues.map((issue) => ({ field: issue.path.join("."), message: issue.message }))), notice: null }, { status: 400 });
        }
        const team = input.intent === "create" ? await createDiveTeam(project, user, checked.data, { ip }) : await updateDiveTeam(project, user, input.teamId, checked.data, { ip });
        return { intent: input.intent, teamId: forTeam, errors: {} as FieldErrors, notice: `${team.name} saved.${team.belowMinimum ? ` It lists ${team.members.length} ${team.members.length === 1 ? "person" : "people"}, fewer than the minimum team size of ${project.minTeamSize}: its plans will be flagged.` : ""}` } satisfies ActionResult;
      }
      case "remove": {
        const removed = await removeDiveTeam(project, user, input.teamId, { ip });
        return { intent: input.intent, teamId: null, errors: {} as FieldErrors, notice: removed.outcome === "deleted" ? `${removed.team.name} deleted.` : `${removed.team.name}: ${retiredBecause(removed.records)}` } satisfies ActionResult;
      }
      case "return": {
        const team = await updateDiveTeam(project, user, input.teamId, { retired: false }, { ip });
        return { intent: input.intent, teamId: null, errors: {} as FieldErrors, notice: `${team.name} is back in service.` } satisfies ActionResult;
      }
    }
  } catch (error) {
    if (error instanceof DomainError) return data<ActionResult>({ intent: input.intent, teamId: forTeam, errors: formErrors(error.details), notice: null }, { status: 400 });
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Dive teams · Firmsand" }];
}

const boxClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 font-mono text-sm focus:outline-2 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger";

/** A hoses or pumps box as the form fills it: "Hose A, 6" a line, the name alone when no diameter is given. */
const equipmentText = (entries: TeamEquipment[]) => entries.map((entry) => (entry.diameter === null ? entry.name : `${entry.name}, ${entry.diameter}`)).join("\n");

function EquipmentBox({ id, name, label, example, unit, defaultValue, error }: { id: string; name: "hoses" | "pumps"; label: string; example: string; unit: DiameterUnit; defaultValue: string; error?: string }) {
  const { min, max } = DIAMETER_RANGE[unit];
  return (
    <div>
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <textarea
        id={id} name={name} rows={3} defaultValue={defaultValue} className={boxClass}
        aria-invalid={error ? true : undefined} aria-describedby={`${id}-hint${error ? ` ${id}-error` : ""}`}
      />
      <p id={`${id}-hint`} className="mt-1 text-sm text-muted">
        One a line: name, diameter in {unit === "in" ? "inches" : "millimetres"} ({min}–{max} {unit}), e.g. <span className="figures">{example}</span>. Leave the diameter off when it is not known.
      </p>
      {error ? <p id={`${id}-error`} className="mt-1 text-sm text-danger">{error}</p> : null}
    </div>
  );
}

function TeamForm({ team, errors, memberNames, intent, unit }: { team: DiveTeamView | null; errors: FieldErrors; memberNames: string[]; intent: "create" | "update"; unit: DiameterUnit }) {
  const key = team ? `team-${team.id}` : "new-team";
  const crewText = team ? team.members.map((member) => [member.name, member.duty, member.userId ? "" : member.email].filter((part, index) => part || index === 0).join(", ")).join("\n") : "";
  return (
    <Form method="post" className="grid gap-3 sm:grid-cols-2" aria-label={team ? `Change ${team.name}` : "New dive team"}>
      {team ? <input type="hidden" name="teamId" value={team.id} /> : null}
      <TextField label="Team name" name="name" defaultValue={team?.name ?? ""} required maxLength={120} error={errors.name} />
      <TextField label="Station" name="station" defaultValue={team?.station ?? ""} maxLength={200} error={errors.station} hint="Where the team works from: a barge, a landing." />
      <div>
        <label htmlFor={`${key}-crew`} className="block text-sm font-medium">Crew, one person a line</label>
        <textarea
          id={`${key}-crew`} name="crew" rows={4} defaultValue={crewText} className={boxClass}
          aria-invalid={errors.crew ? true : undefined} aria-describedby={`${key}-crew-hint${errors.crew ? ` ${key}-crew-error` : ""}`}
        />
        <p id={`${key}-crew-hint`} className="mt-1 text-sm text-muted">
          Name, duty, e-mail (duty and e-mail optional), e.g. <span className="figures">Ana Reyes, standby diver</span>. A project member's name links their account{memberNames.length > 0 ? ` (members: ${memberNames.join(", ")})` : ""}.
        </p>
        {errors.crew ? <p id={`${key}-crew-error`} className="mt-1 text-sm text-danger">{errors.crew}</p> : null}
      </div>
      <div className="space-y-3">
        <EquipmentBox id={`${key}-hoses`} name="hoses" label="Hoses" example={unit === "in" ? "Hose A, 6" : "Hose A, 150"} unit={unit} defaultValue={team ? equipmentText(team.hoses) : ""} error={errors.hoses} />
        <EquipmentBox id={`${key}-pumps`} name="pumps" label="Pumps" example={unit === "in" ? "Pump 1, 6" : "Pump 1, 150"} unit={unit} defaultValue={team ? equipmentText(team.pumps) : ""} error={errors.pumps} />
      </div>
      <div className="sm:col-span-2"><SubmitButton intent={intent} pendingLabel="Saving…">{team ? `Save ${team.name}` : "Add team"}</SubmitButton></div>
    </Form>
  );
}

function Equipment({ entries, what }: { entries: TeamEquipment[]; what: string }) {
  if (entries.length === 0) return <p className="text-sm text-muted">No {what} listed.</p>;
  return (
    <ul className="text-sm">
      {entries.map((entry) => (
        <li key={entry.name}>{entry.name} {entry.diameter === null ? <span className="text-muted">— diameter not given</span> : <>— <span className="figures">{formatDiameter(entry.diameter, entry.diameterUnit)}</span></>}</li>
      ))}
    </ul>
  );
}

function Crew({ team }: { team: DiveTeamView }) {
  if (team.members.length === 0) return <p className="text-sm text-muted">No one listed.</p>;
  return (
    <ul className="text-sm">
      {team.members.map((member) => (
        <li key={member.name}>{member.name}{member.duty ? <span className="text-muted"> — {member.duty}</span> : null}{member.userId ? <span className="text-muted"> (member)</span> : null}</li>
      ))}
    </ul>
  );
}

export default function TeamsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { teams, canManage, minTeamSize, memberNames } = loaderData;
  const inService = teams.filter((team) => team.retiredAt === null);
  const retired = teams.filter((team) => team.retiredAt !== null);
  const errorsFor = (intent: string, teamId: number | null): FieldErrors => (actionData && actionData.intent === intent && actionData.teamId === teamId ? actionData.errors : {});
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-xl font-semibold">Dive teams</h2>
        <Link className="text-sm underline" to={`/projects/${loaderData.projectId}/plans`}>Back to dive plans</Link>
      </div>
      <p className="text-sm text-muted">
        The minimum team size is <span className="figures">{minTeamSize}</span>{loaderData.canConfigure ? <> (set on the <Link className="underline" to={`/projects/${loaderData.projectId}/settings#dive-work-heading`}>settings page</Link>)</> : null}.
        Team size, duties and standby cover follow the project's dive safety plan and the applicable commercial diving standard; this list does not approve a team.
        Hose and pump diameters are kept for planning and the day sheet: guarding of suction intakes, lock-out of pumps before a diver approaches an intake, and hose handling follow the same safety plan.
      </p>
      <ActionMessages error={actionData && ["remove", "return", "invalid"].includes(actionData.intent) ? actionData.errors.form ?? actionData.errors.teamId : undefined} notice={actionData?.notice} />

      {inService.length === 0 ? <p className="rounded border border-line bg-panel p-4 text-sm">No dive teams yet.{canManage ? " Add the first one below." : " The manager or the dive supervisor adds them."}</p> : null}
      <ul className="space-y-4">
        {inService.map((team) => (
          <li key={team.id} className="rounded border border-line bg-panel p-4" aria-labelledby={`team-${team.id}-name`}>
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h3 id={`team-${team.id}-name`} className="text-lg font-semibold">{team.name}</h3>
              <p className="text-sm text-muted">{team.station || "No station set"}</p>
            </div>
            {team.belowMinimum ? <p className="mt-1 text-sm font-semibold text-danger">Lists {team.members.length} {team.members.length === 1 ? "person" : "people"}, below the minimum team size of {minTeamSize}.</p> : null}
            <div className="mt-2 grid gap-3 sm:grid-cols-2">
              <div><h4 className="text-sm font-medium">Crew</h4><Crew team={team} /></div>
              <div className="grid gap-3 sm:grid-cols-2">
                <div><h4 className="text-sm font-medium">Hoses</h4><Equipment entries={team.hoses} what="hoses" /></div>
                <div><h4 className="text-sm font-medium">Pumps</h4><Equipment entries={team.pumps} what="pumps" /></div>
              </div>
            </div>
            {canManage ? (
              <div className="mt-3 flex flex-wrap items-start gap-3">
                <details className="min-w-0 flex-1" open={actionData?.intent === "update" && actionData.teamId === team.id && Object.keys(actionData.errors).length > 0}>
                  <summary className="cursor-pointer text-sm font-medium text-lagoon-dark">Change {team.name}</summary>
                  <div className="mt-3"><TeamForm team={team} errors={errorsFor("update", team.id)} memberNames={memberNames} intent="update" unit={loaderData.diameterUnit} /></div>
                </details>
                <ConfirmedActionForm
                  question={`Remove ${team.name}? A team that dives, assignments or finds name is retired instead, and its records keep naming it.`}
                  intent="remove" fields={{ teamId: team.id }} label="Remove" pendingLabel="Removing…" accessibleName={`Remove ${team.name}`} tone="plain"
                />
              </div>
            ) : null}
          </li>
        ))}
      </ul>

      {canManage ? (
        <section aria-labelledby="new-team-heading" className="rounded border border-line bg-panel p-4">
          <h3 id="new-team-heading" className="text-lg font-semibold">New dive team</h3>
          <div className="mt-3"><TeamForm team={null} errors={errorsFor("create", null)} memberNames={memberNames} intent="create" unit={loaderData.diameterUnit} /></div>
        </section>
      ) : null}

      {retired.length > 0 ? (
        <section aria-labelledby="retired-heading">
          <h3 id="retired-heading" className="text-lg font-semibold">Retired teams</h3>
          <p className="text-sm text-muted">Kept because dives, assignments or finds name them; they take no new cells.</p>
          <ul className="mt-2 space-y-2">
            {retired.map((team) => (
              <li key={team.id} className="flex flex-wrap items-center justify-between gap-2 rounded border border-line bg-panel px-4 py-2">
                <span>{team.name} <span className="text-sm text-muted">retired <time className="figures whitespace-nowrap" dateTime={team.retiredAt!}>{team.retiredAt!.slice(0, 10)}</time></span></span>
                {canManage ? (
                  <Form method="post">
                    <input type="hidden" name="teamId" value={team.id} />
                    <SubmitButton intent="return" tone="plain" pendingLabel="Bringing back…" aria-label={`Bring ${team.name} back`}>Bring back</SubmitButton>
                  </Form>
                ) : null}
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </div>
  );
}
