import { useState } from "react";
import { Form } from "react-router";
import { HEAD_COUNT_MAX, VISITORS_MAX_LINES, WEATHER_DOWNTIME_MAX_LINES, type CrewHeadCount, type TeamDay, type VisitorLine, type WeatherDowntime } from "../../shared/daily-report/compile";
import { compiledHeadCountWords } from "../../shared/daily-report/present";
import { SubmitButton } from "./submit-button";
import { TextField } from "./text-field";

// The entered lists of a day's report, edited inline on the day's page until it is signed: head
// counts over the compiled ones, weather downtime, inspections and visitors. Each form sends
// `<list>.<n>.<field>`; a line keeps its number when one above it is removed, so the server's
// refusal lands on the line's own field.

/** How many of a list's fields were refused, said once above the lines. */
function CorrectionsNeeded({ errors, list }: { errors: Record<string, string>; list: string }) {
  const count = Object.keys(errors).filter((field) => field.startsWith(`${list}.`)).length;
  if (count === 0) return null;
  return <p role="alert" className="text-sm text-danger">{count === 1 ? "One line needs a correction" : `${count} corrections are needed`}: see the fields marked below.</p>;
}

interface Column {
  field: string;
  label: string;
  placeholder?: string;
  maxLength: number;
  /** A narrow column (a time): its refusal is said below the line, full width, not wrapped into the column. */
  narrow?: boolean;
  inputMode?: React.HTMLAttributes<HTMLInputElement>["inputMode"];
}

/**
 * Lines of a few text fields each, added and removed with buttons; saving replaces the day's list.
 * `noun` names a line in the labels ("Spell 1: start").
 */
function LinesForm({ list, intent, columns, grid, saved, errors, legend, description, noun, maxLines, submitLabel, testId }: {
  /** The columns' grid on a wide screen, written out whole so that Tailwind finds the class. */
  grid: string;
  list: string; intent: string; columns: readonly Column[]; saved: ReadonlyArray<Record<string, string>>; errors: Record<string, string>;
  legend: string; description: React.ReactNode; noun: string; maxLines: number; submitLabel: string; testId: string;
}) {
  const blank = () => Object.fromEntries(columns.map((column) => [column.field, ""]));
  const [lines, setLines] = useState<Array<{ id: number; values: Record<string, string> }>>(() => {
    const start = saved.map((values, id) => ({ id, values }));
    return start.length > 0 ? start : [{ id: 0, values: blank() }];
  });
  const nextId = () => Math.max(-1, ...lines.map((line) => line.id)) + 1;
  return (
    <Form method="post" className="mt-3 space-y-3 print:hidden" data-testid={`${testId}-form`}>
      <fieldset className="space-y-3">
        <legend className="text-sm font-medium">{legend}</legend>
        <p className="text-sm text-muted">{description}</p>
        <CorrectionsNeeded errors={errors} list={list} />
        {lines.map((line, position) => {
          const name = (field: string) => `${list}.${line.id}.${field}`;
          const errorId = (field: string) => `${name(field)}-error`;
          return (
            <div key={line.id} className={`grid gap-2 rounded border border-line p-3 md:items-start ${grid}`} data-testid={`${testId}-line`}>
              {columns.map((column, index) => (
                <TextField
                  key={column.field}
                  label={index === 0 ? `${noun} ${position + 1}: ${column.label}` : column.label}
                  name={name(column.field)}
                  maxLength={column.maxLength}
                  placeholder={column.placeholder}
                  inputMode={column.inputMode}
                  autoComplete="off"
                  defaultValue={line.values[column.field] ?? ""}
                  {...(column.narrow
                    ? { "aria-invalid": errors[name(column.field)] ? true : undefined, "aria-describedby": errors[name(column.field)] ? errorId(column.field) : undefined }
                    : { error: errors[name(column.field)] })}
                />
              ))}
              <div className="md:pt-6">
                <button type="button" className="rounded border border-line px-3 py-2 text-sm" onClick={() => setLines((current) => current.filter((candidate) => candidate.id !== line.id))} aria-label={`Remove ${noun.toLowerCase()} ${position + 1}`}>
                  Remove
                </button>
              </div>
              {columns.filter((column) => column.narrow && errors[name(column.field)]).map((column) => (
                <p key={column.field} id={errorId(column.field)} className="text-sm text-danger md:col-span-full">{errors[name(column.field)]}</p>
              ))}
            </div>
          );
        })}
        {lines.length < maxLines ? (
          <button type="button" className="rounded border border-line px-3 py-2 text-sm" onClick={() => setLines((current) => [...current, { id: nextId(), values: blank() }])}>
            Add a {noun.toLowerCase()}
          </button>
        ) : null}
      </fieldset>
      <div><SubmitButton intent={intent} tone="plain" pendingLabel="Saving…">{submitLabel}</SubmitButton></div>
    </Form>
  );
}

const CLOCK_HINT = "HH:MM";

/** Spells of weather downtime: start and end in the project's local time on the day, and the weather that stopped the work. */
export function WeatherDowntimeForm({ saved, errors, timeZone }: { saved: readonly WeatherDowntime[]; errors: Record<string, string>; timeZone: string }) {
  return (
    <LinesForm
      list="weatherDowntime" intent="weather-downtime" grid="md:grid-cols-[7rem_7rem_minmax(0,1fr)_auto]" testId="weather-downtime" noun="Spell" maxLines={WEATHER_DOWNTIME_MAX_LINES} submitLabel="Save weather downtime"
      legend="Weather downtime"
      description={<>Each spell the weather stopped the work: start and end in local time ({timeZone}, 24-hour clock; 24:00 for the day's end), and the weather in words. A storm through midnight is entered on each day. The lost hours join the interruptions above; an hour lost to two causes counts once. Stopping for weather follows the project's dive safety plan.</>}
      columns={[
        { field: "start", label: "start", placeholder: CLOCK_HINT, maxLength: 5, narrow: true, inputMode: "numeric" },
        { field: "end", label: "End", placeholder: CLOCK_HINT, maxLength: 5, narrow: true, inputMode: "numeric" },
        { field: "reason", label: "Weather", placeholder: "lightning within 10 miles", maxLength: 300,  },
      ]}
      saved={saved.map((spell) => ({ start: spell.start, end: spell.end, reason: spell.reason }))}
      errors={errors}
    />
  );
}

/** Inspections and visitors: times of arrival and leaving in local time, who, from where, and why. */
export function VisitorsForm({ saved, errors, timeZone }: { saved: readonly VisitorLine[]; errors: Record<string, string>; timeZone: string }) {
  return (
    <LinesForm
      list="visitors" intent="visitors" grid="md:grid-cols-[8.5rem_6rem_minmax(0,1.2fr)_minmax(0,1.2fr)_minmax(0,2fr)_auto]" testId="visitors" noun="Visitor" maxLines={VISITORS_MAX_LINES} submitLabel="Save inspections and visitors"
      legend="Inspections and visitors today"
      description={<>A line per inspector or visitor: arrived and left in local time ({timeZone}, 24-hour clock), name, organisation, and the purpose or what the inspection covered. Leave "Left" blank while they are on site.</>}
      columns={[
        { field: "arrived", label: "arrived", placeholder: CLOCK_HINT, maxLength: 5, narrow: true, inputMode: "numeric" },
        { field: "left", label: "Left", placeholder: CLOCK_HINT, maxLength: 5, narrow: true, inputMode: "numeric" },
        { field: "name", label: "Name", maxLength: 120,  },
        { field: "organisation", label: "Organisation", maxLength: 120,  },
        { field: "purpose", label: "Purpose or notes", maxLength: 500,  },
      ]}
      saved={saved.map((visitor) => ({ ...visitor }))}
      errors={errors}
    />
  );
}

/**
 * Head counts per team, entered over the compiled ones: a row per team of the report and of the
 * project, the compiled figure and its source beside the input; a blank count keeps the compiled one.
 */
export function CrewsForm({ teams, teamNames, saved, errors }: { teams: readonly TeamDay[]; teamNames: readonly string[]; saved: readonly CrewHeadCount[]; errors: Record<string, string> }) {
  const rows = [...new Set([...teams.map((team) => team.team), ...teamNames])];
  return (
    // noValidate: the server's refusal names the line and the rule ("line 1 (Alpha): … whole number … 0 to 99"), where the browser's would not name the crew.
    <Form method="post" className="mt-3 space-y-3 print:hidden" data-testid="crews-form" noValidate>
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Crew on site, per team</legend>
        <p className="text-sm text-muted">The compiled count comes from the team's roster on the day plan, else from the divers in the dive log. Enter the people who were on site (0 to {HEAD_COUNT_MAX}) where it differs, with the reason if you like; leave it blank to keep the compiled count.</p>
        <CorrectionsNeeded errors={errors} list="crews" />
        {rows.map((team, index) => {
          const compiled = teams.find((candidate) => candidate.team === team);
          const entered = saved.find((crew) => crew.team === team);
          const name = (field: string) => `crews.${index}.${field}`;
          return (
            <div key={team} className="grid gap-2 rounded border border-line p-3 md:grid-cols-[minmax(0,1.4fr)_8rem_minmax(0,2fr)] md:items-start" data-testid="crew-line">
              <input type="hidden" name={name("team")} value={team} />
              <div className="text-sm md:pt-6">
                <span className="font-medium">{team}</span>
                <span className="block text-muted">{compiled?.compiledHeadCount != null ? <>compiled: <span className="figures">{compiledHeadCountWords(compiled)}</span></> : "no compiled count (not on the day plan, no dives logged)"}</span>
              </div>
              <TextField label={`${team}: head count`} name={name("headCount")} type="number" inputMode="numeric" min={0} max={HEAD_COUNT_MAX} step={1} defaultValue={entered ? String(entered.headCount) : ""} error={errors[name("headCount")] ?? errors[name("team")]} />
              <TextField label="Reason (optional)" name={name("reason")} maxLength={500} defaultValue={entered?.reason ?? ""} error={errors[name("reason")]} />
            </div>
          );
        })}
      </fieldset>
      <div><SubmitButton intent="crews" tone="plain" pendingLabel="Saving…">Save head counts</SubmitButton></div>
    </Form>
  );
}
