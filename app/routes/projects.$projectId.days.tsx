import { Form, Link, data } from "react-router";
import { z } from "zod";
import { BATCH_DAYS, DAY_STATE_DESCRIPTIONS, type DayState } from "../../shared/daily-report/present";
import { localDayOf } from "../../shared/local-time";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { ConflictError, DomainError, ServiceUnavailableError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom } from "~/lib/http/form";
import { readPageForm } from "~/lib/http/body.server";
import { listMembers } from "~/models/membership.server";
import { addSubscriber, batchInputSchema, listMonthDays, listSubscribers, removeSubscriber, sendDailyReportBatch, subscriberInputSchema } from "~/models/daily-reports.server";
import type { Route } from "./+types/projects.$projectId.days";

// The calendar of days, each coloured by its report's state and named in words; a two-week batch
// as one PDF (downloaded, or sent by the manager to the subscribers); the subscribers themselves.

const monthSchema = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/);

const shiftMonth = (month: string, by: number) => {
  const [year, number] = month.split("-").map(Number);
  return new Date(Date.UTC(year!, number! - 1 + by, 1)).toISOString().slice(0, 7);
};
const addDays = (date: string, by: number) => {
  const [year, month, day] = date.split("-").map(Number);
  return new Date(Date.UTC(year!, month! - 1, day! + by)).toISOString().slice(0, 10);
};

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "reports.read");
  const { project } = access;
  const today = localDayOf(Date.now(), project.timeZone);
  const asked = monthSchema.safeParse(new URL(request.url).searchParams.get("month"));
  const month = asked.success ? asked.data : today.slice(0, 7);
  const distribute = can(access, "reports.distribute");
  const [days, subscribers, members] = await Promise.all([
    listMonthDays(project, month),
    distribute ? listSubscribers(project) : Promise.resolve([]),
    distribute ? listMembers(project) : Promise.resolve([]),
  ]);
  return {
    projectId: project.id, timeZone: project.timeZone, today, month, days, distribute, subscribers,
    members: members.map((member) => ({ userId: member.userId, name: member.name, email: member.email })),
    batch: { from: addDays(today, -BATCH_DAYS), to: addDays(today, -1) },
  };
}

const formSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("subscribe-member"), userId: z.string() }),
  z.object({ intent: z.literal("subscribe-address"), email: z.string() }),
  z.object({ intent: z.literal("unsubscribe"), subscriberId: z.coerce.number().int().positive() }),
  z.object({ intent: z.literal("send-batch"), from: z.string(), to: z.string() }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "reports.distribute");
  const form = formSchema.safeParse(Object.fromEntries(await readPageForm(request)));
  const refused = (errors: Record<string, string>, status = 400) => data({ errors, notice: null as string | null }, { status });
  if (!form.success) return refused({ form: "That request is not one this page makes." });
  const input = form.data;
  try {
    if (input.intent === "subscribe-member" || input.intent === "subscribe-address") {
      const parsed = subscriberInputSchema.safeParse(input.intent === "subscribe-member" ? { userId: input.userId } : { email: input.email });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      const added = await addSubscriber(project, user, parsed.data, clientAddress(request));
      return { errors: {} as Record<string, string>, notice: `${added.email} will receive each signed report.` };
    }
    if (input.intent === "unsubscribe") {
      await removeSubscriber(project, user, input.subscriberId, clientAddress(request));
      return { errors: {} as Record<string, string>, notice: "Removed from the subscribers." };
    }
    const parsed = batchInputSchema.safeParse({ from: input.from, to: input.to });
    if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
    const sent = await sendDailyReportBatch(project, user, parsed.data.from, parsed.data.to, clientAddress(request));
    return { errors: {} as Record<string, string>, notice: `The days ${parsed.data.from} to ${parsed.data.to} go out as one PDF to ${sent} ${sent === 1 ? "subscriber" : "subscribers"}.` };
  } catch (error) {
    // The file storage down: nothing was sent; say so with when to try again (the download needs no storage).
    if (error instanceof ServiceUnavailableError) {
      return data({ errors: { form: `${error.message} The batch PDF can still be downloaded: it is made from the database.` } as Record<string, string>, notice: null as string | null }, { status: 503, headers: { "Retry-After": String(error.retryAfterSeconds) } });
    }
    if (error instanceof ConflictError) return refused({ form: error.message, ...fieldErrorsFrom(error.details.filter((detail) => detail.field), (field) => field) }, 409);
    if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, (field) => field));
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Daily reports · Firmsand" }];
}

/** Each state's look on the calendar; the word is always written beside the colour. */
const STATE_STYLE: Record<DayState, string> = {
  "no work": "bg-panel text-muted",
  draft: "bg-[#fbeccd] text-ink border-caution",
  signed: "bg-[#dcefe0] text-ink border-ok",
  countersigned: "bg-[#b9ddc2] text-ink border-ok",
  amended: "bg-[#d8e8ec] text-ink border-lagoon",
};
const STATES = Object.keys(STATE_STYLE) as DayState[];
const WEEKDAYS = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];

function monthName(month: string) {
  const [year, number] = month.split("-").map(Number);
  return new Date(Date.UTC(year!, number! - 1, 1)).toLocaleString("en-US", { month: "long", year: "numeric", timeZone: "UTC" });
}

export default function Days({ loaderData, actionData }: Route.ComponentProps) {
  const { days, projectId, timeZone, month, today, distribute, subscribers, members, batch } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const [year, number] = month.split("-").map(Number);
  // Monday first: blank cells before the 1st.
  const lead = (new Date(Date.UTC(year!, number! - 1, 1)).getUTCDay() + 6) % 7;
  const subscribed = new Set(subscribers.map((subscriber) => subscriber.email));
  return (
    <div className="space-y-4">
      <ActionMessages error={errors.form} notice={actionData?.notice} />
      <h2 className="text-lg font-semibold">Daily reports</h2>
      <p className="text-sm text-muted">Days in {timeZone}, each with its report's state. Open a day to read, complete and sign its report.</p>

      <section aria-labelledby="calendar-heading" className="space-y-3">
        <nav aria-label="Months" className="flex flex-wrap items-center justify-between gap-2">
          <Link className="rounded border border-line bg-panel px-3 py-1 text-sm underline" to={`?month=${shiftMonth(month, -1)}`}>← {monthName(shiftMonth(month, -1))}</Link>
          <h3 id="calendar-heading" className="font-semibold">{monthName(month)}</h3>
          {month < today.slice(0, 7)
            ? <Link className="rounded border border-line bg-panel px-3 py-1 text-sm underline" to={`?month=${shiftMonth(month, 1)}`}>{monthName(shiftMonth(month, 1))} →</Link>
            : <span className="px-3 py-1 text-sm text-muted">This month</span>}
        </nav>
        <ul className="grid grid-cols-1 gap-1 sm:grid-cols-7" data-testid="calendar">
          {WEEKDAYS.map((weekday) => <li key={weekday} aria-hidden="true" className="hidden text-center text-xs font-medium text-muted sm:block">{weekday}</li>)}
          {Array.from({ length: lead }, (_, index) => <li key={`lead-${index}`} aria-hidden="true" className="hidden sm:block" />)}
          {days.map((day) => {
            const weekday = WEEKDAYS[(lead + Number(day.date.slice(8)) - 1) % 7];
            const future = day.date > today;
            const body = (
              <>
                <span className="flex items-baseline justify-between gap-2">
                  <span><span className="text-xs sm:hidden">{weekday} </span><span className="figures font-medium">{Number(day.date.slice(8))}</span></span>
                  {day.dives > 0 ? <span className="text-xs"><span className="figures">{day.dives}</span> {day.dives === 1 ? "dive" : "dives"}</span> : null}
                </span>
                <span className="block text-xs">{future ? "to come" : day.state}</span>
                {!future && day.note ? <span className="block text-xs italic" data-testid="day-note">{day.note}</span> : null}
              </>
            );
            return (
              // Days to come are left off the phone's list (the grid keeps them to hold its weeks).
              <li key={day.date} data-testid="day" data-state={future ? "future" : day.state} data-date={day.date} className={future ? "hidden sm:block" : undefined}>
                {future ? (
                  <div className="min-h-14 rounded border border-dashed border-line p-1.5 text-muted">{body}</div>
                ) : (
                  <Link
                    to={`/projects/${projectId}/days/${day.date}`}
                    aria-label={`${day.date}, ${day.state}${day.note ? ` ${day.note}` : ""}${day.dives > 0 ? `, ${day.dives} ${day.dives === 1 ? "dive" : "dives"}` : ""}`}
                    className={`block min-h-14 rounded border p-1.5 hover:outline-2 hover:outline-lagoon focus-visible:outline-2 focus-visible:outline-lagoon ${STATE_STYLE[day.state]} ${day.state === "no work" ? "border-line" : ""} ${day.date === today ? "ring-2 ring-lagoon" : ""}`}
                  >
                    {body}
                  </Link>
                )}
              </li>
            );
          })}
        </ul>
        <div aria-labelledby="legend-heading" role="group" className="rounded border border-line bg-panel p-3 text-sm">
          <p id="legend-heading" className="mb-1 font-medium">Legend</p>
          <p className="mb-2 text-muted">A signed day shows its latest event: countersigned after an amendment reads "countersigned, with 1 amendment"; amended after the countersignature reads "amended, after countersignature".</p>
          <ul className="grid gap-1 md:grid-cols-2">
            {STATES.map((state) => (
              <li key={state} className="flex items-center gap-2">
                <span aria-hidden="true" className={`inline-block h-4 w-6 shrink-0 rounded border ${STATE_STYLE[state]} ${state === "no work" ? "border-line" : ""}`} />
                <span><span className="font-medium">{state}</span>: {DAY_STATE_DESCRIPTIONS[state]}</span>
              </li>
            ))}
          </ul>
        </div>
      </section>

      <section aria-labelledby="batch-heading" className="rounded border border-line bg-panel p-4">
        <h3 id="batch-heading" className="mb-1 font-semibold">Two-week batch</h3>
        <p className="mb-3 text-sm text-muted">Up to {BATCH_DAYS} days in one PDF, each day on its own pages, signed days as signed.</p>
        <Form method="get" action={`/projects/${projectId}/days/batch.pdf`} reloadDocument className="flex flex-wrap items-end gap-3">
          <TextField label="First day" name="from" type="date" required defaultValue={batch.from} max={today} error={errors.from} />
          <TextField label="Last day" name="to" type="date" required defaultValue={batch.to} max={today} error={errors.to} />
          <button type="submit" className="rounded border border-line bg-panel px-4 py-2 font-medium hover:bg-paper">Download the batch PDF</button>
          {distribute ? (
            <SubmitButton intent="send-batch" formMethod="post" formAction={`/projects/${projectId}/days`} pendingLabel="Sending…" disabled={subscribers.length === 0}>Send to the subscribers</SubmitButton>
          ) : null}
        </Form>
        {distribute && subscribers.length === 0 ? <p className="mt-2 text-sm text-muted">Add subscribers below to send the batch by e-mail.</p> : null}
      </section>

      {distribute ? (
        <section aria-labelledby="subscribers-heading" className="rounded border border-line bg-panel p-4">
          <h3 id="subscribers-heading" className="mb-1 font-semibold">Subscribers</h3>
          <p className="mb-3 text-sm text-muted">They receive each report by e-mail, with its PDF attached, as soon as it is signed.</p>
          {subscribers.length === 0 ? <p className="text-sm text-muted">No subscribers yet.</p> : (
            <ul className="mb-3 divide-y divide-line text-sm" data-testid="subscribers">
              {subscribers.map((subscriber) => (
                <li key={subscriber.id} className="flex flex-wrap items-center justify-between gap-2 py-1.5">
                  <span>{subscriber.member ? <>{subscriber.member} <span className="text-muted">({subscriber.email}, member)</span></> : <>{subscriber.email} <span className="text-muted">(outside address)</span></>}</span>
                  <Form method="post">
                    <input type="hidden" name="subscriberId" value={subscriber.id} />
                    <SubmitButton intent="unsubscribe" tone="plain" pendingLabel="Removing…" aria-label={`Remove ${subscriber.email}`} className="px-3 py-1 text-sm">Remove</SubmitButton>
                  </Form>
                </li>
              ))}
            </ul>
          )}
          <div className="grid gap-4 md:grid-cols-2">
            <Form method="post" className="flex flex-wrap items-end gap-3">
              <div className="min-w-0 flex-1">
                <label htmlFor="subscriber-member" className="block text-sm font-medium">Member</label>
                <select id="subscriber-member" name="userId" required className="mt-1 block w-full min-w-0 rounded border border-line bg-panel px-3 py-2" aria-invalid={errors.userId ? true : undefined}>
                  <option value="">Choose a member…</option>
                  {members.filter((member) => !subscribed.has(member.email)).map((member) => <option key={member.userId} value={member.userId}>{member.name} ({member.email})</option>)}
                </select>
                {errors.userId ? <p className="mt-1 text-sm text-danger">{errors.userId}</p> : null}
              </div>
              <SubmitButton intent="subscribe-member" tone="plain" pendingLabel="Adding…">Add member</SubmitButton>
            </Form>
            <Form method="post" className="flex flex-wrap items-end gap-3">
              <TextField label="Outside address" name="email" type="email" required maxLength={254} placeholder="contract.manager@agency.example" error={errors.email} />
              <SubmitButton intent="subscribe-address" tone="plain" pendingLabel="Adding…">Add address</SubmitButton>
            </Form>
          </div>
        </section>
      ) : null}
    </div>
  );
}
