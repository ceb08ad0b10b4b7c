import { Form, Link } from "react-router";
import { z } from "zod";
import { requireRole } from "~/lib/auth/access.server";
import { roleLabel, isRole } from "~/lib/auth/roles";
import { auditActionLabel } from "~/lib/audit/action-label";
import { describeAuditDetail, describeValue } from "~/lib/audit/describe-detail";
import { AUDIT_ACTION_NAMES, listAuditPeople, listProjectAuditEvents, type AuditFilter } from "~/lib/audit/audit.server";
import type { Route } from "./+types/projects.$projectId.audit";

// The audit log, narrowed by person, action and a range of local days. The filter lives in the
// query string, so a filtered view is a link a manager can send; a value that makes no sense is
// named and left out rather than answered with an error page.

const DAY = /^\d{4}-\d{2}-\d{2}$/;
const dayField = (what: string) =>
  z.string().regex(DAY, `The ${what} date must be a date (YYYY-MM-DD).`).refine((value) => !Number.isNaN(Date.parse(`${value}T00:00:00Z`)), `The ${what} date is not a day of the calendar.`);
const fields = {
  page: z.coerce.number({ error: "The page must be a whole number." }).int("The page must be a whole number.").min(1, "The page must be 1 or more.").max(100_000, "The page must be 100,000 or less."),
  person: z.coerce.number({ error: "Choose a person from the list." }).int().positive("Choose a person from the list."),
  action: z.enum(AUDIT_ACTION_NAMES, { error: "Choose an action from the list." }),
  from: dayField("from"),
  to: dayField("to"),
};
type FieldName = keyof typeof fields;

/** Reads each filter field on its own: an empty field is no filter, a wrong one is named and ignored. */
function readQuery(searchParams: URLSearchParams) {
  const problems: string[] = [];
  const read = <K extends FieldName>(name: K): z.infer<(typeof fields)[K]> | undefined => {
    const raw = searchParams.get(name)?.trim();
    if (!raw) return undefined;
    const parsed = fields[name].safeParse(raw);
    if (parsed.success) return parsed.data as z.infer<(typeof fields)[K]>;
    problems.push(parsed.error.issues[0]?.message ?? `The ${name} filter is not understood.`);
    return undefined;
  };
  const filter: AuditFilter = { userId: read("person"), action: read("action"), from: read("from"), to: read("to") };
  if (filter.from && filter.to && filter.from > filter.to) {
    problems.push(`The from date (${filter.from}) is after the to date (${filter.to}): the dates were swapped.`);
    [filter.from, filter.to] = [filter.to, filter.from];
  }
  return { page: read("page") ?? 1, filter, problems };
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "audit.read");
  const { page, filter, problems } = readQuery(new URL(request.url).searchParams);
  const people = await listAuditPeople(project);
  if (filter.userId && !people.some((person) => person.id === filter.userId)) problems.push("That person has no entries in this project's log.");
  return {
    projectId: project.id,
    timeZone: project.timeZone,
    people,
    actions: AUDIT_ACTION_NAMES.map((action) => ({ value: action, label: auditActionLabel(action) })).sort((a, b) => a.label.localeCompare(b.label)),
    filter,
    problems,
    ...(await listProjectAuditEvents(project, page, filter)),
  };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Audit log · Firmsand" }];
}

/** The detail in words: a settings change as what differs, a role by its label. */
function describe(detail: Record<string, unknown>): string {
  return describeAuditDetail(detail, (key, value) => (key === "role" && isRole(value) ? roleLabel(value) : describeValue(value)));
}

/** The query string of a filter and page, leaving out what is not set (page 1 included). */
function queryOf(filter: AuditFilter, page: number): string {
  const params = new URLSearchParams();
  if (filter.userId) params.set("person", String(filter.userId));
  if (filter.action) params.set("action", filter.action);
  if (filter.from) params.set("from", filter.from);
  if (filter.to) params.set("to", filter.to);
  if (page > 1) params.set("page", String(page));
  const query = params.toString();
  return query ? `?${query}` : "";
}

const fieldClass = "mt-1 block w-full rounded border border-line bg-panel px-2 py-1.5 text-sm focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

export default function ProjectAudit({ loaderData }: Route.ComponentProps) {
  const { events, page, pageCount, total, projectId, filter, people, actions, problems, timeZone } = loaderData;
  const base = `/projects/${projectId}/audit`;
  const filtered = Boolean(filter.userId || filter.action || filter.from || filter.to);
  return (
    <section aria-labelledby="audit-heading">
      <h2 id="audit-heading" className="text-lg font-semibold">Audit log</h2>
      <Form method="get" action={base} className="mt-3 grid gap-3 rounded border border-line bg-panel p-3 sm:grid-cols-2 lg:grid-cols-[1.4fr_1.4fr_1fr_1fr_auto]" aria-label="Filter the audit log">
        <div>
          <label htmlFor="audit-person" className="block text-sm font-medium">Person</label>
          <select id="audit-person" name="person" defaultValue={filter.userId ?? ""} className={fieldClass}>
            <option value="">Everyone</option>
            {people.map((person) => <option key={person.id} value={person.id}>{person.name} ({person.email})</option>)}
          </select>
        </div>
        <div>
          <label htmlFor="audit-action" className="block text-sm font-medium">Action</label>
          <select id="audit-action" name="action" defaultValue={filter.action ?? ""} className={fieldClass}>
            <option value="">Every action</option>
            {actions.map((action) => <option key={action.value} value={action.value}>{action.label}</option>)}
          </select>
        </div>
        <div>
          <label htmlFor="audit-from" className="block text-sm font-medium">From</label>
          <input id="audit-from" name="from" type="date" defaultValue={filter.from ?? ""} className={`${fieldClass} figures`} />
        </div>
        <div>
          <label htmlFor="audit-to" className="block text-sm font-medium">To</label>
          <input id="audit-to" name="to" type="date" defaultValue={filter.to ?? ""} className={`${fieldClass} figures`} />
        </div>
        <div className="flex items-end gap-3">
          <button type="submit" className="rounded bg-lagoon px-3 py-1.5 text-sm text-white hover:bg-lagoon-dark focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon">Filter</button>
          {filtered ? <Link to={base} className="py-1.5 text-sm text-lagoon underline">Clear</Link> : null}
        </div>
      </Form>
      {problems.length > 0 ? (
        <ul className="mt-2 text-sm text-caution" role="alert">
          {problems.map((problem) => <li key={problem}>{problem}</li>)}
        </ul>
      ) : null}
      <p className="mt-3 text-sm text-muted" data-testid="audit-count">
        {total === 0 ? null : <><span className="figures">{total.toLocaleString("en-US")}</span> {total === 1 ? "entry" : "entries"}{filtered ? " match" : ""}. </>}
        Times are the project's local time ({timeZone}); the dates filter whole local days.
      </p>
      {events.length === 0 ? (
        <div className="mt-3 rounded border border-dashed border-line p-4 text-sm" data-testid="audit-empty">
          {filtered ? (
            <p>No entries match this filter. <Link className="text-lagoon underline" to={base}>Show the whole log</Link>.</p>
          ) : total > 0 ? (
            <p>There is no page {page}. <Link className="text-lagoon underline" to={base}>Back to the newest entries</Link>.</p>
          ) : (
            <p className="text-muted">Nothing recorded yet: sign-ins, invitations, imports and other changes appear here as they happen.</p>
          )}
        </div>
      ) : (
        // Scrolls sideways on a narrow screen; focusable so a keyboard can scroll it too.
        <div className="mt-3 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Audit entries">
          <table className="w-full text-left text-sm">
            <thead>
              <tr className="border-b border-line">
                <th scope="col" className="py-2 pr-4">When</th><th scope="col" className="pr-4">Who</th><th scope="col" className="pr-4">What</th>
                <th scope="col" className="pr-4">Detail</th><th scope="col">From</th>
              </tr>
            </thead>
            <tbody>
              {events.map((event) => (
                <tr key={event.id} className="border-b border-line align-top">
                  <td className="figures whitespace-nowrap py-1 pr-4"><time dateTime={event.at}>{event.localDay} {event.localTime}</time></td>
                  <td className="pr-4 [overflow-wrap:anywhere]">{event.actor ?? "—"}</td>
                  <td className="pr-4">{auditActionLabel(event.action)}</td>
                  <td className="pr-4 [overflow-wrap:anywhere]">{describe(event.detail)}</td>
                  <td className="figures">{event.ip ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {pageCount > 1 ? (
        <nav aria-label="Audit log pages" className="mt-4 flex items-center gap-4 text-sm">
          {page > 1 ? <Link className="text-lagoon underline" to={`${base}${queryOf(filter, page - 1)}`}>Newer</Link> : null}
          <span>Page <span className="figures">{page}</span> of <span className="figures">{pageCount}</span></span>
          {page < pageCount ? <Link className="text-lagoon underline" to={`${base}${queryOf(filter, page + 1)}`}>Older</Link> : null}
        </nav>
      ) : null}
    </section>
  );
}
