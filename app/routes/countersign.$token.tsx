import { Form, data } from "react-router";
import { weatherLine } from "../../shared/daily-report/present";
import { localClockOf, localDayOf } from "../../shared/local-time";
import { DailyReportFigures, EquipmentHours, InspectionsAndVisitors, Section } from "~/components/daily-report-figures";
import { FormMessage } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { clientAddress } from "~/lib/http/client-address.server";
import { parseForm } from "~/lib/http/form";
import { readPageForm } from "~/lib/http/body.server";
import { countersignInputSchema, countersignReport, lookUpCountersign } from "~/models/daily-reports.server";
import type { Route } from "./+types/countersign.$token";

// The agency inspector's countersignature, without an account: the e-mailed one-time link is the
// credential. It shows the signed report read-only and takes a typed name; once used it is spent.
const CLOSED_MESSAGES = {
  expired: "This countersign link has expired. Ask the project's dive supervisor or manager to send a new one.",
  used: "This countersign link has already been used, or a newer link replaced it, or the report is already countersigned.",
  unknown: "This countersign link is not valid. Check that you copied the whole link.",
} as const;

export async function loader({ params }: Route.LoaderArgs) {
  const lookup = await lookUpCountersign(params.token);
  if (lookup.status !== "open") return { open: false as const, message: CLOSED_MESSAGES[lookup.status] };
  const { view } = lookup;
  return { open: true as const, email: lookup.email, projectName: lookup.projectName, timeZone: lookup.timeZone, lengthUnit: lookup.lengthUnit, date: view.date, report: view.report, signed: view.signed, amendments: view.amendments, countersigned: view.countersigned };
}

export async function action({ request, params }: Route.ActionArgs) {
  const parsed = parseForm(await readPageForm(request), countersignInputSchema);
  if (!parsed.ok) return data({ errors: parsed.errors, done: null }, { status: 400 });
  const result = await countersignReport(params.token, parsed.data.name, clientAddress(request));
  if (!result.ok) return data({ errors: { form: CLOSED_MESSAGES[result.reason] } as Record<string, string>, done: null }, { status: 410 });
  return { errors: {} as Record<string, string>, done: { name: parsed.data.name, date: result.date } };
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `Countersign${loaderData?.open ? ` the daily report ${loaderData.date}` : ""} · Firmsand` }];
}

export default function Countersign({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  if (actionData?.done) {
    return (
      <Page title="Countersigned">
        <div role="status" className="rounded border border-ok bg-panel p-3" data-testid="countersign-done">
          Thank you, {actionData.done.name}: the daily report of <span className="figures">{actionData.done.date}</span> is countersigned. This link is now spent.
        </div>
      </Page>
    );
  }
  if (!loaderData.open) {
    return (
      <Page title="Countersign a daily report">
        <FormMessage tone="error">{loaderData.message}</FormMessage>
      </Page>
    );
  }
  const { report, signed, amendments, countersigned, date, timeZone, lengthUnit } = loaderData;
  const weather = weatherLine(report.entered.weather);
  const local = (iso: string) => `${localDayOf(Date.parse(iso), timeZone)} ${localClockOf(Date.parse(iso), timeZone)}`;
  return (
    <Page title={`Countersign the daily report of ${date}`} wide>
      <div className="space-y-4">
        <p className="text-sm">
          <strong>{loaderData.projectName}</strong> · local day <span className="figures">{date}</span> in {timeZone}. Signed by <strong>{signed?.name}</strong> at <span className="figures whitespace-nowrap">{signed ? local(signed.at) : ""}</span>.
          This link was sent to <span className="figures">{loaderData.email}</span>; the report is read-only here.
        </p>
        {countersigned ? (
          <p className="rounded border border-caution bg-panel p-3 text-sm" data-testid="countersign-again">
            {countersigned.name} countersigned this report at <span className="figures whitespace-nowrap">{local(countersigned.at)}</span>; it was amended after that (see Amendments below).
            Your countersignature is of the report with its amendments; the earlier one stays on record as of the earlier version.
          </p>
        ) : null}
        {report.missing.length > 0 ? (
          <div className="rounded border border-danger bg-panel p-3 text-sm">
            <p className="font-medium text-danger">Missing when signed</p>
            <ul className="list-disc pl-5">{report.missing.map((item) => <li key={item}>{item}</li>)}</ul>
          </div>
        ) : null}
        <Section title="Weather and notes">
          <p className="text-sm">{weather ?? "No weather entered."}{report.entered.weather?.effect ? <> — effect on the work: {report.entered.weather.effect}</> : null}</p>
          {report.entered.safety ? <p className="mt-1 text-sm"><span className="font-medium">Safety:</span> {report.entered.safety}</p> : null}
          {report.entered.notes ? <p className="mt-1 text-sm"><span className="font-medium">Notes:</span> {report.entered.notes}</p> : null}
        </Section>
        <Section title="Inspections and visitors">
          <InspectionsAndVisitors entered={report.entered} />
        </Section>
        <Section title="Equipment">
          <EquipmentHours equipment={report.entered.equipment} />
        </Section>
        <DailyReportFigures report={report} timeZone={timeZone} lengthUnit={lengthUnit} />
        {amendments.length > 0 ? (
          <Section title="Amendments">
            <ul className="space-y-1 text-sm">{amendments.map((amendment) => <li key={amendment.at + amendment.text}><span className="figures whitespace-nowrap">{local(amendment.at)}</span> by {amendment.by}: {amendment.text}</li>)}</ul>
          </Section>
        ) : null}
        <Section title="Countersignature">
          <Form method="post" className="space-y-3" noValidate>
            <FormMessage tone="error">{errors.form}</FormMessage>
            <p className="text-sm">By typing your name you countersign this report, as signed, as the agency's inspector. The link works once.</p>
            <TextField label="Your name (typed, as your countersignature)" name="name" autoComplete="name" required maxLength={200} error={errors.name} />
            <SubmitButton pendingLabel="Countersigning…">Countersign the report</SubmitButton>
          </Form>
        </Section>
      </div>
    </Page>
  );
}
