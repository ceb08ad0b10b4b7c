import { Form, Link, data } from "react-router";
import { z } from "zod";
import { FIND_CATEGORY_LABELS, HOLD_AGENCY_LABELS, instantToLocalDateTime, localDateTimeToInstant } from "../../shared/finds/finds";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { DomainError, NotFoundError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom } from "~/lib/http/form";
import { liftHold, liftInputSchema, listHolds, noticeInputSchema, recordHoldNotice } from "~/models/holds.server";
import type { Route } from "./+types/projects.$projectId.holds";
import { readPageForm } from "~/lib/http/body.server";

// Stop-work holds around cultural finds and human remains: the cells each holds, who must be told
// and when each was, and the lift, recorded with whoever authorised resuming. Roles that may not
// see find locations see the held cells and dates only.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "finds.read");
  const { project } = access;
  const local = (iso: string | null | undefined) => (iso ? instantToLocalDateTime(new Date(iso), project.timeZone) : null);
  const holds = await listHolds(project, access);
  return {
    projectId: project.id, timeZone: project.timeZone,
    canLift: can(access, "holds.lift"),
    now: local(new Date().toISOString())!.replace(" ", "T"),
    holds: holds.map((hold) => ({
      ...hold, placedAtLocal: local(hold.placedAt), liftedAtLocal: local(hold.liftedAt),
      notices: hold.notices?.map((notice) => ({ ...notice, toldAtLocal: local(notice.toldAt) })),
    })),
  };
}

const idSchema = z.coerce.number().int().positive();
const formSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("lift"), holdId: idSchema, authorisedBy: z.string(), note: z.string().optional(), liftedAt: z.string().optional() }),
  z.object({ intent: z.literal("notice"), holdId: idSchema, agency: z.string(), toldAt: z.string(), note: z.string().optional() }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "holds.lift");
  const form = formSchema.safeParse(Object.fromEntries(await readPageForm(request)));
  if (!form.success) return data({ holdId: null, errors: { form: "That request is not one this page makes." } as Record<string, string>, notice: null }, { status: 400 });
  const input = form.data;
  const refused = (errors: Record<string, string>) => data({ holdId: input.holdId, errors, notice: null }, { status: 400 });
  try {
    if (input.intent === "lift") {
      // The lift time as entered, in the project's time zone (back-dated when the authorisation came earlier).
      const liftedAt = input.liftedAt ? localDateTimeToInstant(input.liftedAt, project.timeZone)?.toISOString() ?? input.liftedAt : undefined;
      const parsed = liftInputSchema.safeParse({ authorisedBy: input.authorisedBy, note: input.note || undefined, liftedAt });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      const lifted = await liftHold(project, user, input.holdId, parsed.data, clientAddress(request));
      return { holdId: input.holdId, errors: {}, notice: `Hold #${input.holdId} lifted: its cells can be assigned again (lifted as of ${instantToLocalDateTime(new Date(lifted.liftedAt), project.timeZone)}).` };
    }
    const toldAt = localDateTimeToInstant(input.toldAt, project.timeZone)?.toISOString() ?? input.toldAt;
    const parsed = noticeInputSchema.safeParse({ agency: input.agency, toldAt, note: input.note || undefined });
    if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
    await recordHoldNotice(project, user, input.holdId, parsed.data, clientAddress(request));
    return { holdId: input.holdId, errors: {}, notice: `Notice to ${HOLD_AGENCY_LABELS[parsed.data.agency]} recorded.` };
  } catch (error) {
    if (error instanceof NotFoundError) return data({ holdId: input.holdId, errors: { form: error.message }, notice: null }, { status: 404 });
    if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, (field) => field));
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Stop-work holds · Firmsand" }];
}

export default function Holds({ loaderData, actionData }: Route.ComponentProps) {
  const { holds, projectId, canLift } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const errorsFor = (holdId: number) => (actionData?.holdId === holdId ? errors : {});
  return (
    <div className="space-y-6">
      <ActionMessages error={errors.form} notice={actionData?.notice} />
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 className="text-lg font-semibold">Stop-work holds</h2>
        <Link to={`/projects/${projectId}/finds`} className="text-sm underline">Finds catalogue</Link>
      </div>
      <p className="text-sm text-muted">
        A cultural find or human remains stops work on the cells around it. Held cells cannot be assigned until the hold is lifted, and a hold is lifted only
        with the authorisation the permit conditions and the agencies require. These records support, never replace, that authorisation.
      </p>
      {holds.length === 0 ? <p className="text-sm text-muted">No holds.</p> : null}
      <ul className="space-y-4">
        {holds.map((hold) => {
          const holdErrors = errorsFor(hold.id);
          return (
            <li key={hold.id} className={`rounded border bg-panel p-3 ${hold.lifted ? "border-line" : "border-danger"}`} data-testid="hold">
              <p className="font-medium">
                Hold #{hold.id} {hold.lifted ? <span className="text-sm text-ok">lifted {hold.liftedAtLocal}</span> : <span className="text-sm text-danger">in force</span>}
              </p>
              <p className="text-sm text-muted">Placed <span className="figures">{hold.placedAtLocal}</span> ({loaderData.timeZone}) on {hold.cells.length} cells</p>
              <p className="figures mt-1 text-xs break-words" data-testid="hold-cells">{hold.cells.join(" ")}</p>
              {hold.find ? (
                <p className="mt-2 text-sm">
                  Around <Link className="figures underline" to={`/projects/${projectId}/finds/${hold.find.id}`}>{hold.find.catalogueNumber}</Link> ({FIND_CATEGORY_LABELS[hold.find.category]}),
                  radius <span className="figures">{hold.radiusM}</span> m. <span className="text-muted">Source: {hold.radiusSource}</span>
                </p>
              ) : null}
              {hold.notices && hold.notices.length > 0 ? (
                <ul className="mt-2 space-y-1 text-sm">
                  {hold.notices.map((notice) => (
                    <li key={notice.agency}>
                      {HOLD_AGENCY_LABELS[notice.agency]}: {notice.toldAtLocal ? <span className="text-ok">told <span className="figures">{notice.toldAtLocal}</span></span> : <span className="text-danger">not yet told</span>}
                      {notice.note ? <span className="text-muted"> · {notice.note}</span> : null}
                    </li>
                  ))}
                </ul>
              ) : null}
              {hold.lifted && hold.authorisedBy ? <p className="mt-2 text-sm">Resumption authorised by {hold.authorisedBy}{hold.liftNote ? ` · ${hold.liftNote}` : ""}</p> : null}
              {canLift && !hold.lifted ? (
                <div className="mt-3 grid gap-4 md:grid-cols-2">
                  {hold.notices?.some((notice) => !notice.toldAtLocal) ? (
                    <Form method="post" className="space-y-2">
                      <input type="hidden" name="holdId" value={hold.id} />
                      <label className="block text-sm font-medium" htmlFor={`agency-${hold.id}`}>Record a notice</label>
                      <select id={`agency-${hold.id}`} name="agency" className="block w-full rounded border border-line bg-panel px-3 py-2">
                        {hold.notices.filter((notice) => !notice.toldAtLocal).map((notice) => <option key={notice.agency} value={notice.agency}>{HOLD_AGENCY_LABELS[notice.agency]}</option>)}
                      </select>
                      <TextField label="Told at (project time)" name="toldAt" type="datetime-local" required defaultValue={loaderData.now} error={holdErrors.toldAt} />
                      <TextField label="How, and whom" name="note" maxLength={2000} error={holdErrors.note} />
                      <SubmitButton intent="notice" tone="plain" pendingLabel="Recording…">Record notice</SubmitButton>
                    </Form>
                  ) : null}
                  <Form method="post" className="space-y-2">
                    <input type="hidden" name="holdId" value={hold.id} />
                    <TextField label="Resumption authorised by" name="authorisedBy" required maxLength={200} hint="Name and office, as the authorisation gives them." error={holdErrors.authorisedBy} />
                    <TextField label="Note" name="note" maxLength={2000} error={holdErrors.note} />
                    <TextField label="Lifted at (project time)" name="liftedAt" type="datetime-local" required defaultValue={loaderData.now} hint="When resuming was authorised, if earlier than now." error={holdErrors.liftedAt} />
                    <SubmitButton intent="lift" tone="danger" pendingLabel="Lifting…" aria-label={`Lift hold #${hold.id}`}>Lift hold</SubmitButton>
                  </Form>
                </div>
              ) : null}
            </li>
          );
        })}
      </ul>
    </div>
  );
}
