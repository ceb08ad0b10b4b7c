import { useRef, useState } from "react";
import { Form, Link, data, useSearchParams } from "react-router";
import { ZoneEditor, type EditableZone } from "~/components/zone-editor";
import { ZoneFileUpload } from "~/components/zone-file-upload";
import { SETUP_STEP_KEYS } from "../../shared/setup-steps";
import { CrsCombobox } from "~/components/crs-combobox";
import { z } from "zod";
import { lengthUnitSchema, unitLabel, type LengthUnit } from "../../shared/units";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { WorkLimitOutline, type LonLatPolygons } from "~/components/work-limit-outline";
import { LengthUnitOptions } from "~/components/length-unit-options";
import { SurveyOrderOptions } from "~/components/survey-order-options";
import { SURVEY_ORDER_SOURCE, SURVEY_ORDERS } from "../../shared/qa/tvu";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { DomainError, validationErrorFrom } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fileTooLargeMessage } from "~/lib/http/upload-size.server";
import { readFileForm } from "~/lib/http/body.server";
import { fieldErrorsFrom, parseForm, type FieldErrors } from "~/lib/http/form";
import { createZoneFromCells, getLatestRecompute, getProjectSettings, LARGE_GRID_CELLS, listSettingsVersions, previewWorkLimit, previewZoneFile, projectPatchSchema, prospectiveCellCount, recomputeProjectFigures, saveZonesFromFile, updateProjectSettings, type ProjectPatch, type ZoneFilePreview } from "~/models/project-setup.server";
import { zoneCandidatesOf } from "../../shared/grid/zone-file";
import { RecomputeStatus } from "~/components/recompute-status";
import { SettingsHistory } from "~/components/settings-history";
import { WORK_LIMIT_ACCEPT, WORK_LIMIT_MAX_BYTES, type WorkLimitFormat } from "../../shared/grid/work-limit-geojson";
import { readWorkLimitFile } from "~/lib/geo/work-limit-files.server";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { GridPreview, type TypedGrid } from "~/components/grid-preview";
import type { Route } from "./+types/projects.$projectId.settings";

// The manager's settings page: one form per section, each saved on its own through the project
// setup service (which checks, keeps the settings history, queues a recompute when surveys exist
// and writes the audit log); the latest recompute's progress or summary, and the history.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "project.configure");
  const [settings, recompute, history] = await Promise.all([getProjectSettings(access.project), getLatestRecompute(access.project), listSettingsVersions(access.project, 20)]);
  // The CRS's definition, for the grid preview to lay the typed grid out in the browser.
  return { settings, recompute, history, canArchive: can(access, "project.archive"), crsDefinition: resolveCrsDefinition(settings.crs).definition };
}

const blankToUndefined = (value: unknown) => (value === "" || value === null ? undefined : value);
const number = z.coerce.number({ error: "Enter a number" }).finite("Enter a number");
const optionalNumber = z.preprocess(blankToUndefined, number.optional());

const actionSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("identity"),
    name: z.string(),
    description: z.string(),
    agency: z.string(),
    permitNumbers: z.string(),
    timeZone: z.string(),
    verticalDatum: z.string(),
  }),
  z.object({ intent: z.literal("coordinates"), crs: z.string(), lengthUnit: z.enum(lengthUnitSchema.options, { error: "Choose a length unit" }) }),
  z.object({ intent: z.literal("work-limit-preview"), file: z.instanceof(File, { error: "Choose the work limit's file" }) }),
  z.object({ intent: z.literal("work-limit-save"), geoJson: z.string().min(1) }),
  z.object({
    intent: z.literal("grid"),
    cellSize: number,
    rotationDegrees: optionalNumber,
    originX: optionalNumber,
    originY: optionalNumber,
    rasterResolution: optionalNumber,
    maxEdge: optionalNumber,
    confirmLargeGrid: z.literal("yes").optional(),
  }),
  z.object({ intent: z.literal("tolerances"), firmSand: number, firmShare: number, minCoverage: number, overDredgeAllowance: number, surveyOrder: z.enum(SURVEY_ORDERS, { error: `Choose one of the IHO S-44 orders: ${SURVEY_ORDERS.join(", ")}` }) }),
  z.object({
    intent: z.literal("dive-work"),
    minTeamSize: z.coerce.number({ error: "Enter a whole number" }).int("Enter a whole number"),
    workDayStart: z.string().trim(),
    workDayEnd: z.string().trim(),
  }),
  // A zone drawn on the map (its outline as lon/lat GeoJSON) or renamed (no geometry: the outline stays).
  z.object({
    intent: z.literal("zone-save"),
    zoneId: z.preprocess(blankToUndefined, z.coerce.number().int().positive().optional()),
    name: z.string(),
    geometry: z.preprocess(blankToUndefined, z.string().optional()),
    colour: z.preprocess(blankToUndefined, z.string().optional()),
  }),
  // A zone's colour, one of the palette's (checked with the zones, as any zone sent to the project).
  z.object({ intent: z.literal("zone-colour"), zoneId: z.coerce.number().int().positive(), colour: z.string() }),
  z.object({ intent: z.literal("zone-delete"), zoneId: z.coerce.number().int().positive() }),
  // A zone one place earlier or later in the order (where zones overlap, the shared cells count in the earlier one).
  z.object({ intent: z.literal("zone-move"), zoneId: z.coerce.number().int().positive(), direction: z.enum(["up", "down"], { error: "Move a zone up or down" }) }),
  // A file of zones read and checked, shown on the map before it is saved.
  z.object({ intent: z.literal("zones-file-preview"), file: z.instanceof(File, { error: "Choose the zones' file" }) }),
  // The previewed zones saved, named, added to the zones there are or replacing them.
  z.object({ intent: z.literal("zones-file-save"), mode: z.enum(["add", "replace"], { error: "Choose whether the file's zones are added or replace the zones" }), zones: z.string().min(1, "Preview the file first") }),
  // A zone made of the cells selected on the map (labels separated by commas).
  z.object({ intent: z.literal("zone-from-cells"), name: z.string(), cells: z.string(), colour: z.preprocess(blankToUndefined, z.string().optional()) }),
  // Every survey's figures again with the settings in force (after a recompute failed or was given up).
  z.object({ intent: z.literal("recompute") }),
  z.object({ intent: z.literal("finds"), cataloguePrefix: z.string(), holdRadiusM: number, holdRadiusSource: z.string() }),
  z.object({
    intent: z.literal("emergency"),
    hospitalName: z.string(),
    hospitalPhone: z.string(),
    chamberName: z.string(),
    chamberPhone: z.string(),
    emergencyNumber: z.string(),
    siteAddress: z.string(),
    accessPoint: z.string(),
  }),
]);

interface WorkLimitPreview {
  geoJson: string;
  format: WorkLimitFormat;
  /** What the reader says of the file (left-out features, holes found). */
  note: string | null;
  lonLat: LonLatPolygons;
  coordinates: "lon-lat" | "project-crs";
  area: number;
  cellCount: number;
}

/** A file of zones as read: each zone with its outline (lon/lat) or its problems. */
export interface ZonesFilePreview {
  fileName: string;
  format: WorkLimitFormat;
  note: string | null;
  /** Problems of the file as a whole (features that are not polygons). */
  problems: string[];
  zones: ZoneFilePreview[];
}

type ActionResult = { intent: string; errors: FieldErrors; notice: string | null; preview?: WorkLimitPreview; largeGrid?: number; zonesFile?: ZonesFilePreview; problems?: string[] };

const savedZonesSchema = z.array(z.object({ source: z.string(), name: z.string(), geometry: z.unknown() })).min(1).max(100);

/** What a zone change said: overlaps (the earlier zone keeps the shared cells) and the recompute. */
function zoneChangeWords(lengthUnit: LengthUnit, overlaps: Array<{ first: string; second: string; area: number }>, recompute: unknown): string {
  const shared = overlaps.map((overlap) => ` "${overlap.second}" overlaps "${overlap.first}" by about ${Math.round(overlap.area).toLocaleString("en-US")} ${unitLabel(lengthUnit, "area")}: the cells they share count in "${overlap.first}", the earlier zone.`).join("");
  return `${shared}${recompute ? " Every survey's figures are being recomputed: the progress is shown at the top of the page." : ""}`;
}

const answered = (result: ActionResult, status = 200) => data<ActionResult>(result, { status });
const failed = (intent: string, errors: FieldErrors, extra: Partial<ActionResult> = {}) => answered({ intent, errors, notice: null, ...extra }, 400);

/** A service refusal's details as the page's field errors (a detail's last path segment is the input's name). */
const fieldErrorsOf = (error: DomainError) => fieldErrorsFrom(error.details, (field) => field.split(".").pop()!);

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "project.configure");
  // Every section's form is read within the largest one's limit: the work limit is a small file.
  const form = await readFileForm(request, WORK_LIMIT_MAX_BYTES);
  if (!form) {
    return answered({ intent: "work-limit-preview", errors: { workLimit: fileTooLargeMessage(WORK_LIMIT_MAX_BYTES, "simplify the outline first") }, notice: null }, 413);
  }
  const parsed = parseForm(form, actionSchema);
  if (!parsed.ok) return failed("invalid", parsed.errors);
  const input = parsed.data;
  const ip = clientAddress(request);
  try {
    let patch: ProjectPatch;
    switch (input.intent) {
      case "recompute": {
        const { started } = await recomputeProjectFigures(project, user);
        return answered({ intent: input.intent, errors: {}, notice: started ? "Recompute started: its progress is shown at the top of the page." : "A recompute is already under way: its progress is shown at the top of the page." });
      }
      case "identity":
      case "coordinates": {
        const { intent: _intent, ...fields } = input;
        patch = fields;
        break;
      }
      case "tolerances":
        patch = { tolerances: { firmSand: input.firmSand, firmShare: input.firmShare, minCoverage: input.minCoverage, overDredgeAllowance: input.overDredgeAllowance, surveyOrder: input.surveyOrder } };
        break;
      case "dive-work":
        // Both times blank clears the working hours; one without the other is named by the service.
        patch = {
          minTeamSize: input.minTeamSize,
          workDay: input.workDayStart === "" && input.workDayEnd === "" ? null : { start: input.workDayStart, end: input.workDayEnd },
        };
        break;
      case "finds":
        patch = { finds: { cataloguePrefix: input.cataloguePrefix, holdRadiusM: input.holdRadiusM, holdRadiusSource: input.holdRadiusSource } };
        break;
      case "emergency": {
        const { intent: _intent, ...emergency } = input;
        patch = { emergency };
        break;
      }
      case "work-limit-preview": {
        const file = await readWorkLimitFile(input.file.name, new Uint8Array(await input.file.arrayBuffer()));
        const preview = await previewWorkLimit(project, file.geoJson);
        return answered({ intent: input.intent, errors: {}, notice: null, preview: { ...preview, geoJson: JSON.stringify(preview.lonLat), format: file.format, note: file.note } });
      }
      case "work-limit-save":
        patch = { workLimit: JSON.parse(input.geoJson) };
        break;
      case "zones-file-preview": {
        let file;
        try {
          file = await readWorkLimitFile(input.file.name, new Uint8Array(await input.file.arrayBuffer()));
        } catch (error) {
          // The reader names the file; here it is the zones' file.
          if (error instanceof DomainError) return failed(input.intent, { zonesFile: error.details.map((detail) => detail.message).join(" ") || error.message });
          throw error;
        }
        const { candidates, problems } = zoneCandidatesOf(file.geoJson);
        if (candidates.length === 0) return failed(input.intent, { zonesFile: `${input.file.name}: ${problems.join(" ")}` });
        const zones = await previewZoneFile(project, candidates);
        return answered({ intent: input.intent, errors: {}, notice: null, zonesFile: { fileName: input.file.name, format: file.format, note: file.note, problems, zones } });
      }
      case "zones-file-save": {
        let zones;
        try {
          zones = savedZonesSchema.parse(JSON.parse(input.zones));
        } catch {
          return failed(input.intent, { zonesFile: "The previewed zones did not arrive whole; preview the file again." });
        }
        const before = input.mode === "add" ? (await getProjectSettings(project)).zones.length : 0;
        try {
          const { settings, recompute, overlaps } = await saveZonesFromFile(project, user, { mode: input.mode, zones: zones.map(({ name, geometry }) => ({ name, geometry })) }, { ip });
          const what = input.mode === "add" ? `${zones.length} ${zones.length === 1 ? "zone" : "zones"} added from the file.` : `The zones replaced by the file's ${zones.length}.`;
          return answered({ intent: input.intent, errors: {}, notice: `${what}${zoneChangeWords(settings.lengthUnit, overlaps, recompute)}` });
        } catch (error) {
          if (!(error instanceof DomainError)) throw error;
          // Each problem named by the file's feature (a zone already there by its own name).
          const problems = error.details.map((detail) => {
            const at = /^zones\.(\d+)\./.exec(detail.field ?? "");
            const index = at ? Number(at[1]) - before : -1;
            const source = index >= 0 && index < zones.length ? zones[index].source : null;
            return source ? `${source[0].toUpperCase()}${source.slice(1)}: ${detail.message}` : detail.message;
          });
          return failed(input.intent, { zonesFile: "Nothing was saved: the zones below need fixing." }, { problems });
        }
      }
      case "zone-from-cells": {
        const cells = input.cells.split(",").map((label) => label.trim()).filter(Boolean);
        const { settings, recompute, overlaps, centresOutside, cells: made } = await createZoneFromCells(project, user, { name: input.name, colour: input.colour, cells }, { ip });
        const outside = centresOutside.length > 0
          ? ` ${centresOutside.join(", ")} ${centresOutside.length === 1 ? "has its" : "have their"} centre outside the work limit: a zone holds a cell by its centre, so ${centresOutside.length === 1 ? "it stays" : "they stay"} where ${centresOutside.length === 1 ? "it was" : "they were"} (Unzoned or another zone).`
          : "";
        return answered({ intent: input.intent, errors: {}, notice: `Zone "${input.name.trim()}" made of ${made} ${made === 1 ? "cell" : "cells"}.${outside}${zoneChangeWords(settings.lengthUnit, overlaps, recompute)}` });
      }
      case "zone-save":
      case "zone-delete":
      case "zone-move":
      case "zone-colour": {
        // Through the same check as zones sent to the API: the whole list, changed in one place.
        const { zones } = await getProjectSettings(project);
        const current = zones.map((zone) => ({ id: zone.id, name: zone.name, colour: zone.colour, geometry: zone.geometry }));
        if (input.intent === "zone-move") {
          const at = current.findIndex((zone) => zone.id === input.zoneId);
          if (at < 0) return failed(input.intent, { form: "That zone is no longer there; the page shows the zones as they are now." });
          const to = input.direction === "up" ? at - 1 : at + 1;
          if (to < 0 || to >= current.length) return failed(input.intent, { form: `That zone is already ${input.direction === "up" ? "first" : "last"}.` });
          const order = [...current];
          [order[at], order[to]] = [order[to], order[at]];
          patch = { zones: order };
          break;
        }
        if (input.intent === "zone-colour") {
          if (!current.some((zone) => zone.id === input.zoneId)) return failed(input.intent, { form: "That zone is no longer there; the page shows the zones as they are now." });
          patch = { zones: current.map((zone) => (zone.id === input.zoneId ? { ...zone, colour: input.colour } : zone)) };
          break;
        }
        if (input.intent === "zone-delete") {
          if (!current.some((zone) => zone.id === input.zoneId)) return failed(input.intent, { form: "That zone is no longer there; the page shows the zones as they are now." });
          patch = { zones: current.filter((zone) => zone.id !== input.zoneId) };
          break;
        }
        let geometry: unknown;
        if (input.geometry !== undefined) {
          try {
            geometry = JSON.parse(input.geometry);
          } catch {
            return failed(input.intent, { geometry: "The drawn outline did not arrive whole; draw it again." });
          }
        }
        const existing = input.zoneId === undefined ? undefined : current.find((zone) => zone.id === input.zoneId);
        if (input.zoneId !== undefined && !existing) return failed(input.intent, { form: "That zone is no longer there; the page shows the zones as they are now." });
        if (!existing && geometry === undefined) return failed(input.intent, { geometry: "Draw the zone's outline on the map first." });
        const saved = { id: existing?.id, name: input.name, colour: input.colour ?? existing?.colour, geometry: geometry ?? existing!.geometry };
        patch = { zones: existing ? current.map((zone) => (zone.id === existing.id ? saved : zone)) : [...current, saved] };
        break;
      }
      case "grid": {
        const { intent: _intent, confirmLargeGrid, ...grid } = input;
        const cells = await prospectiveCellCount(project, grid);
        if (cells !== null && cells > LARGE_GRID_CELLS && confirmLargeGrid !== "yes") {
          return failed(input.intent, {
            cellSize: `This grid has ${cells.toLocaleString("en-US")} cells, more than ${LARGE_GRID_CELLS.toLocaleString("en-US")}: the map and every recompute slow down with the count. Tick the box below to save it anyway.`,
          }, { largeGrid: cells });
        }
        patch = { grid };
        break;
      }
    }
    const checked = projectPatchSchema.safeParse(patch);
    if (!checked.success) return failed(input.intent, fieldErrorsOf(validationErrorFrom(checked.error)));
    const { settings, recompute, overlaps } = await updateProjectSettings(project, user, checked.data, { ip });
    const zoneIntent = input.intent === "zone-save" || input.intent === "zone-delete" || input.intent === "zone-move" || input.intent === "zone-colour";
    const cells = settings.cellCount === null || zoneIntent || input.intent === "emergency" || input.intent === "dive-work" ? "" : ` The grid has ${settings.cellCount.toLocaleString("en-US")} cells.`;
    // A new colour changes no outline: the overlaps were said when the outlines were saved.
    const shared = input.intent === "zone-colour" ? "" : overlaps.map((overlap) => ` "${overlap.second}" overlaps "${overlap.first}" by about ${Math.round(overlap.area).toLocaleString("en-US")} ${unitLabel(settings.lengthUnit, "area")}: the cells they share count in "${overlap.first}", the earlier zone.`).join("");
    const what = input.intent === "zone-delete" ? "Zone deleted." : input.intent === "zone-move" ? "Zone order saved." : input.intent === "zone-colour" ? "Zone colour saved." : "Saved.";
    const recomputing = recompute ? " Every survey's figures are being recomputed: the progress is shown at the top of the page." : "";
    return answered({ intent: input.intent, errors: {}, notice: `${what}${cells}${shared}${recomputing}` });
  } catch (error) {
    if (error instanceof DomainError) return failed(input.intent, fieldErrorsOf(error));
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Project settings · Firmsand" }];
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger";

function Section({ id, title, children }: { id: string; title: string; children: React.ReactNode }) {
  return (
    <section aria-labelledby={id} className="rounded border border-line bg-panel p-4">
      <h2 id={id} className="text-lg font-semibold">{title}</h2>
      <div className="mt-3">{children}</div>
    </section>
  );
}

export default function ProjectSettingsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { settings } = loaderData;
  const unit = unitLabel(settings.lengthUnit);
  const areaUnit = unitLabel(settings.lengthUnit, "area");
  // Each section shows only its own errors and notice.
  const errorsFor = (...intents: string[]): FieldErrors => (actionData && intents.includes(actionData.intent) ? actionData.errors : {});
  const noticeFor = (...intents: string[]) => (actionData && intents.includes(actionData.intent) ? actionData.notice : null);
  const identityErrors = errorsFor("identity");
  const coordinateErrors = errorsFor("coordinates");
  const limitErrors = errorsFor("work-limit-preview", "work-limit-save");
  const gridErrors = errorsFor("grid");
  const toleranceErrors = errorsFor("tolerances");
  const findsErrors = errorsFor("finds");
  const diveWorkErrors = errorsFor("dive-work");
  const emergencyErrors = errorsFor("emergency");
  const emergency = settings.emergency;
  const preview = actionData?.preview ?? null;
  const surveysNote = settings.surveyCount > 0 ? ` This project has ${settings.surveyCount} survey${settings.surveyCount === 1 ? "" : "s"}: saving recomputes every survey's figures in the background, and the page shows what changed.` : "";

  const archived = settings.archivedAt !== null;
  const lengthUnitRef = useRef<HTMLSelectElement>(null);
  // The grid as typed, for the preview (before it is saved).
  const typedFromSaved = (): TypedGrid => ({ cellSize: String(settings.grid.cellSize), rotationDegrees: String(settings.grid.rotationDegrees), originX: String(settings.grid.originX), originY: String(settings.grid.originY), rasterResolution: String(settings.grid.rasterResolution) });
  const [typedGrid, setTypedGrid] = useState<TypedGrid>(typedFromSaved);
  const onGridInput = (form: HTMLFormElement) => {
    const value = (name: string) => String(new FormData(form).get(name) ?? "");
    setTypedGrid({ cellSize: value("cellSize"), rotationDegrees: value("rotationDegrees"), originX: value("originX"), originY: value("originY"), rasterResolution: value("rasterResolution") });
  };
  // Opened from "Set up this project": a way back to the step it came from.
  const [searchParams] = useSearchParams();
  const setupStep = SETUP_STEP_KEYS.find((key) => key === searchParams.get("setup")) ?? null;
  const zoneResult = actionData && (actionData.intent === "zone-save" || actionData.intent === "zone-delete" || actionData.intent === "zone-move" || actionData.intent === "zone-colour") ? actionData : null;

  return (
    <div className="space-y-6">
      {setupStep ? (
        <p className="rounded border border-lagoon bg-panel px-3 py-2 text-sm">
          Setting up this project. <Link className="font-medium text-lagoon underline" to={`/projects/${settings.id}/setup?step=${setupStep}`}>Back to the setup steps</Link>
        </p>
      ) : null}
      <ActionMessages error={actionData?.errors.form} notice={noticeFor("recompute")} />
      {loaderData.recompute ? <RecomputeStatus initial={loaderData.recompute} volumeLabel={unitLabel(settings.lengthUnit, "volume")} canStart={!archived} /> : null}
      {archived ? <p className="rounded border border-line bg-panel px-3 py-2 text-sm">The project is archived: its settings are shown as they were and cannot be changed until a site admin restores it.</p> : null}

      {/* An archived project's forms are shown disabled: the server refuses them anyway (409). */}
      <fieldset disabled={archived} className="mx-0 min-w-0 space-y-6 border-0 p-0">
      <Section id="identity-heading" title="Identity">
        <ActionMessages notice={noticeFor("identity")} />
        <Form method="post" className="grid gap-3 sm:grid-cols-2">
          <TextField label="Project name" name="name" defaultValue={settings.name} required maxLength={200} error={identityErrors.name} />
          <TextField label="Agency or client" name="agency" defaultValue={settings.agency} maxLength={200} error={identityErrors.agency} />
          <TextField label="Permit numbers" name="permitNumbers" defaultValue={settings.permitNumbers} maxLength={500} error={identityErrors.permitNumbers} hint="As the permits write them, separated by commas." />
          <TextField label="Time zone" name="timeZone" defaultValue={settings.timeZone} required error={identityErrors.timeZone} hint="IANA name, e.g. America/New_York: work days are counted in it." />
          <TextField label="Vertical datum" name="verticalDatum" defaultValue={settings.verticalDatum} maxLength={60} error={identityErrors.verticalDatum} hint="For labels, e.g. NAVD88." />
          <div className="sm:col-span-2">
            <label htmlFor="description" className="block text-sm font-medium">Description</label>
            <textarea id="description" name="description" rows={3} maxLength={5000} defaultValue={settings.description} className={inputClass} />
            {identityErrors.description ? <p className="mt-1 text-sm text-danger">{identityErrors.description}</p> : null}
          </div>
          <div className="sm:col-span-2"><SubmitButton intent="identity" pendingLabel="Saving…">Save identity</SubmitButton></div>
        </Form>
      </Section>

      <Section id="coordinates-heading" title="Coordinates">
        <ActionMessages notice={noticeFor("coordinates")} />
        <p className="text-sm">Now: <span className="figures">{settings.crs}</span> — {settings.crsName}</p>
        <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-2">
          <CrsCombobox
            label="Coordinate reference system (EPSG code)" name="crs" defaultValue={settings.crs} error={coordinateErrors.crs}
            hint={settings.surveyCount > 0 ? "Fixed once surveys are stored." : "Type a code or words of the name (e.g. Florida East) and choose; the length unit follows."}
            onPick={(option) => { if (lengthUnitRef.current) lengthUnitRef.current.value = option.lengthUnit; }}
          />
          <div>
            <label htmlFor="length-unit" className="block text-sm font-medium">Length unit</label>
            <select ref={lengthUnitRef} id="length-unit" name="lengthUnit" defaultValue={settings.lengthUnit} className={inputClass} aria-invalid={coordinateErrors.lengthUnit ? true : undefined}>
              <LengthUnitOptions withVolume />
            </select>
            {coordinateErrors.lengthUnit ? <p className="mt-1 text-sm text-danger">{coordinateErrors.lengthUnit}</p> : null}
          </div>
          <div className="sm:col-span-2"><SubmitButton intent="coordinates" pendingLabel="Saving…">Save coordinates</SubmitButton></div>
        </Form>
      </Section>

      <Section id="work-limit-heading" title="Work limit">
        <ActionMessages notice={noticeFor("work-limit-save")} />
        {settings.workLimit ? (
          <>
            <WorkLimitOutline workLimit={settings.workLimit as unknown as LonLatPolygons} zones={settings.zones as unknown as Array<{ name: string; colour: string; geometry: LonLatPolygons }>} title="The saved work limit and its zones" testId="work-limit-outline" />
            <p className="mt-1 text-sm text-muted">Area <span className="figures">{Math.round(settings.workLimitArea ?? 0).toLocaleString("en-US")}</span> {areaUnit}.</p>
          </>
        ) : <p className="text-sm text-muted">No work limit yet.</p>}
        <Form method="post" encType="multipart/form-data" className="mt-3 space-y-2">
          <label htmlFor="work-limit-file" className="block text-sm font-medium">New work limit (GeoJSON, KML, zipped shapefile, DXF or CSV of vertices; in {settings.crs} or lon/lat)</label>
          <input id="work-limit-file" name="file" type="file" accept={WORK_LIMIT_ACCEPT} required className="block w-full text-sm" aria-invalid={limitErrors.workLimit || limitErrors.file ? true : undefined} aria-describedby="work-limit-error" />
          <p id="work-limit-error" className="text-sm text-danger">{limitErrors.workLimit ?? limitErrors.file ?? ""}</p>
          <SubmitButton intent="work-limit-preview" tone="plain" pendingLabel="Reading…">Preview</SubmitButton>
        </Form>
        {preview ? (
          <div className="mt-4 space-y-2" data-testid="work-limit-preview">
            <p className="text-sm">Read {preview.format} as {preview.coordinates === "lon-lat" ? "lon/lat (WGS 84)" : `${settings.crs} coordinates`}; area <span className="figures">{Math.round(preview.area).toLocaleString("en-US")}</span> {areaUnit}; <span className="figures">{preview.cellCount.toLocaleString("en-US")}</span> cells with the present grid.</p>
            {preview.note ? <p className="text-sm text-muted" data-testid="work-limit-note">{preview.note}</p> : null}
            <WorkLimitOutline workLimit={preview.lonLat} title="The new work limit, not yet saved" />
            <Form method="post" onSubmit={(event) => { if (settings.surveyCount > 0 && !window.confirm(`Replace the work limit?${surveysNote}`)) event.preventDefault(); }}>
              <input type="hidden" name="geoJson" value={preview.geoJson} />
              <SubmitButton intent="work-limit-save" pendingLabel="Saving…">Replace the work limit</SubmitButton>
            </Form>
          </div>
        ) : null}
      </Section>

      <Section id="grid-heading" title="Grid">
        <ActionMessages notice={noticeFor("grid")} />
        <p className="text-sm" data-testid="cell-count">{settings.cellCount === null ? "No grid until a work limit is set." : <>The grid has <span className="figures">{settings.cellCount.toLocaleString("en-US")}</span> cells.</>}</p>
        {settings.workLimit ? (
          <div className="mt-3">
            <GridPreview
              projectId={settings.id} lengthUnit={settings.lengthUnit} crsDefinition={loaderData.crsDefinition}
              workLimit={settings.workLimit as unknown as LonLatPolygons} typed={typedGrid} saved={settings.grid}
              title="The grid as typed"
            />
          </div>
        ) : null}
        <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-3" onChange={(event) => onGridInput(event.currentTarget)} onReset={() => setTypedGrid(typedFromSaved())}>
          <TextField label={`Cell size (${unit})`} name="cellSize" type="number" step="any" min="0" defaultValue={settings.grid.cellSize} required error={gridErrors.cellSize} />
          <TextField label="Rotation (degrees counter-clockwise from east)" name="rotationDegrees" type="number" step="any" defaultValue={settings.grid.rotationDegrees} error={gridErrors.rotationDegrees} />
          <TextField label={`Raster resolution (${unit})`} name="rasterResolution" type="number" step="any" min="0" defaultValue={settings.grid.rasterResolution} error={gridErrors.rasterResolution} />
          <TextField label={`Origin easting (${unit})`} name="originX" type="number" step="any" defaultValue={settings.grid.originX} error={gridErrors.originX} />
          <TextField label={`Origin northing (${unit})`} name="originY" type="number" step="any" defaultValue={settings.grid.originY} error={gridErrors.originY} />
          <TextField label={`Longest triangle edge (${unit})`} name="maxEdge" type="number" step="any" min="0" defaultValue={settings.grid.maxEdge} error={gridErrors.maxEdge} />
          {actionData?.intent === "grid" && actionData.largeGrid ? (
            <label className="flex items-center gap-2 text-sm sm:col-span-3">
              <input type="checkbox" name="confirmLargeGrid" value="yes" /> Save the grid of {actionData.largeGrid.toLocaleString("en-US")} cells anyway
            </label>
          ) : null}
          <p className="text-sm text-muted sm:col-span-3">{surveysNote.trim()}</p>
          <div className="sm:col-span-3"><SubmitButton intent="grid" pendingLabel="Saving…">Save grid</SubmitButton></div>
        </Form>
      </Section>

      <Section id="zones-heading" title="Zones">
        <ZoneEditor
          projectId={settings.id} lengthUnit={settings.lengthUnit} disabled={archived}
          workLimit={settings.workLimit as unknown as LonLatPolygons | null}
          zones={settings.zones as unknown as EditableZone[]}
          result={zoneResult}
        />
        <div className="mt-4">
          <ZoneFileUpload
            projectId={settings.id} lengthUnit={settings.lengthUnit} disabled={archived} surveyCount={settings.surveyCount}
            workLimit={settings.workLimit as unknown as LonLatPolygons | null}
            existing={settings.zones.map((zone) => zone.name)}
            result={actionData && (actionData.intent === "zones-file-preview" || actionData.intent === "zones-file-save") ? actionData : null}
          />
        </div>
      </Section>

      <Section id="tolerances-heading" title="Targets and tolerances">
        <ActionMessages notice={noticeFor("tolerances")} />
        <Form method="post" className="grid gap-3 sm:grid-cols-3">
          <TextField label={`Firm-sand tolerance (${unit})`} name="firmSand" type="number" step="any" min="0" defaultValue={settings.tolerances.firmSand} required error={toleranceErrors.firmSand} />
          <TextField label="Share of a cell within tolerance (0–1)" name="firmShare" type="number" step="any" min="0" max="1" defaultValue={settings.tolerances.firmShare} required error={toleranceErrors.firmShare} />
          <TextField label="Minimum surveyed coverage (0–1)" name="minCoverage" type="number" step="any" min="0" max="1" defaultValue={settings.tolerances.minCoverage} required error={toleranceErrors.minCoverage} />
          <TextField
            label={`Over-dredge allowance (${unit})`} name="overDredgeAllowance" type="number" step="any" min="0" defaultValue={settings.tolerances.overDredgeAllowance} required error={toleranceErrors.overDredgeAllowance}
            hint="Pay periods count removal down to firm sand plus this allowance, as the contract states it; below that is over-dredge. 0: down to firm sand."
          />
          <div className="sm:col-span-2">
            <label htmlFor="survey-order" className="block text-sm font-medium">Survey order (IHO S-44)</label>
            <select
              id="survey-order" name="surveyOrder" defaultValue={settings.tolerances.surveyOrder} className={inputClass}
              aria-invalid={toleranceErrors.surveyOrder ? true : undefined} aria-describedby={`survey-order-hint${toleranceErrors.surveyOrder ? " survey-order-error" : ""}`}
            >
              <SurveyOrderOptions />
            </select>
            <p id="survey-order-hint" className="mt-1 text-sm text-muted">
              The order the survey upload offers for each new survey: its QA (spikes, crossing lines) and its part of a pay period's ± band are judged against the allowed vertical uncertainty √(a² + (b·depth)²) ({SURVEY_ORDER_SOURCE}).
              Surveys already imported keep the order they were imported with, so changing it recomputes nothing; the upload form can still name another order for one survey.
              Take it from the survey specification of the contract.
            </p>
            {toleranceErrors.surveyOrder ? <p id="survey-order-error" className="mt-1 text-sm text-danger">{toleranceErrors.surveyOrder}</p> : null}
          </div>
          <p className="text-sm text-muted sm:col-span-3">{surveysNote.trim()}{settings.surveyCount > 0 ? " The over-dredge allowance and the survey order alone recompute nothing." : ""}</p>
          <div className="sm:col-span-3"><SubmitButton intent="tolerances" pendingLabel="Saving…">Save tolerances</SubmitButton></div>
        </Form>
      </Section>

      <Section id="dive-work-heading" title="Dive work">
        <ActionMessages notice={noticeFor("dive-work")} />
        <p className="text-sm text-muted">
          The dive plan flags a team listing fewer people than the minimum. Set it, and the working hours, from the project's dive safety plan and the applicable commercial diving standard; they decide.
          The teams themselves are on the <Link className="underline" to={`/projects/${settings.id}/teams`}>dive teams page</Link>.
        </p>
        <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-3" aria-label="Dive work">
          <TextField label="Minimum team size" name="minTeamSize" type="number" step="1" min="1" max="20" defaultValue={settings.minTeamSize} required error={diveWorkErrors.minTeamSize} hint="3 by default: a diver, a tender and a standby diver (practice)." />
          <TextField label="Work day starts" name="workDayStart" type="time" defaultValue={settings.workDay?.start ?? ""} error={diveWorkErrors.start ?? diveWorkErrors.workDay} hint={`Local time, ${settings.timeZone}.`} />
          <TextField label="Work day ends" name="workDayEnd" type="time" defaultValue={settings.workDay?.end ?? ""} error={diveWorkErrors.end} hint="Both blank: no working hours set." />
          <div className="sm:col-span-3"><SubmitButton intent="dive-work" pendingLabel="Saving…">Save dive work</SubmitButton></div>
        </Form>
      </Section>

      <Section id="finds-heading" title="Finds and stop-work holds">
        <ActionMessages notice={noticeFor("finds")} />
        <Form method="post" className="grid gap-3 sm:grid-cols-3">
          <TextField label="Catalogue prefix" name="cataloguePrefix" maxLength={8} defaultValue={settings.finds.cataloguePrefix} error={findsErrors.cataloguePrefix} hint="Empty: the initials of the project's short name. Numbers already given keep theirs." />
          <TextField label="Hold radius (m)" name="holdRadiusM" type="number" step="any" min="1" max="2000" defaultValue={settings.finds.holdRadiusM} required error={findsErrors.holdRadiusM} hint="Cells within it of a cultural find or human remains are held. Applies to holds placed from now on." />
          <TextField className="sm:col-span-3" label="Source of the hold radius" name="holdRadiusSource" maxLength={500} defaultValue={settings.finds.holdRadiusSource} required error={findsErrors.holdRadiusSource} hint="The permit condition that sets it; the default follows a published condition naming a 100-metre-diameter area." />
          <div className="sm:col-span-3"><SubmitButton intent="finds" pendingLabel="Saving…">Save finds settings</SubmitButton></div>
        </Form>
      </Section>

      <Section id="emergency-heading" title="Emergency information">
        <ActionMessages notice={noticeFor("emergency")} />
        <p className="text-sm text-muted">
          Printed on every day sheet and shown on the dive plans. Check it against the project's safety plan and emergency action plan; they decide.
          A name needs its phone number. Leave every field blank to clear it.
        </p>
        <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-2" aria-label="Emergency information">
          <TextField label="Nearest hospital" name="hospitalName" maxLength={200} defaultValue={emergency?.hospitalName ?? ""} error={emergencyErrors.hospitalName} />
          <TextField label="Hospital phone" name="hospitalPhone" type="tel" maxLength={40} defaultValue={emergency?.hospitalPhone ?? ""} error={emergencyErrors.hospitalPhone} />
          <TextField label="Nearest hyperbaric chamber" name="chamberName" maxLength={200} defaultValue={emergency?.chamberName ?? ""} error={emergencyErrors.chamberName} />
          <TextField label="Hyperbaric chamber phone" name="chamberPhone" type="tel" maxLength={40} defaultValue={emergency?.chamberPhone ?? ""} error={emergencyErrors.chamberPhone} />
          <TextField label="Emergency services number" name="emergencyNumber" type="tel" maxLength={40} defaultValue={emergency?.emergencyNumber ?? ""} error={emergencyErrors.emergencyNumber} />
          <TextField label="Site address" name="siteAddress" maxLength={500} defaultValue={emergency?.siteAddress ?? ""} error={emergencyErrors.siteAddress} hint="Where an ambulance is sent." />
          <TextField className="sm:col-span-2" label="Access point" name="accessPoint" maxLength={500} defaultValue={emergency?.accessPoint ?? ""} error={emergencyErrors.accessPoint} hint="Where responders meet the crew: the gate, ramp or landing." />
          <div className="sm:col-span-2"><SubmitButton intent="emergency" pendingLabel="Saving…">Save emergency information</SubmitButton></div>
        </Form>
      </Section>
      </fieldset>

      <Section id="history-heading" title="Settings history">
        <SettingsHistory versions={loaderData.history} lengthUnit={settings.lengthUnit} />
      </Section>

      {loaderData.canArchive ? (
        <Section id="archive-heading" title="Archive">
          <p className="text-sm">
            When the work is finished and the closeout is signed, archive the project: it becomes read-only for everyone (nothing can be changed, logged or imported),
            stays readable and exportable, and is listed apart on the projects page. Only a site admin can restore it.
          </p>
          <Form method="post" action={`/projects/${settings.id}/archive`} className="mt-3" onSubmit={(event) => { if (!window.confirm(`Archive ${settings.name}? It becomes read-only for everyone until a site admin restores it.`)) event.preventDefault(); }}>
            <button type="submit" className="rounded bg-danger px-4 py-2 font-medium text-white hover:opacity-90 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon">Archive this project</button>
          </Form>
        </Section>
      ) : null}
    </div>
  );
}
