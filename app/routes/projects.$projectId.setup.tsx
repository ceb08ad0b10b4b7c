import { Link } from "react-router";
import { z } from "zod";
import { requireRole } from "~/lib/auth/access.server";
import { loadSetupProgress } from "~/models/setup-guide.server";
import { getProjectSettings } from "~/models/project-setup.server";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import { GridPreview } from "~/components/grid-preview";
import type { LonLatPolygons } from "~/components/work-limit-outline";
import { SETUP_STEP_KEYS, neighbouringSteps, type SetupStep, type SetupStepKey } from "../../shared/setup-steps";
import type { Route } from "./+types/projects.$projectId.setup";

// "Set up this project": the manager's steps from a new project to its first survey. Each step
// says whether it is done from the project's own data and links to the section that does it
// (the settings page's forms, the teams, members and import pages): there is no second set of forms.

const querySchema = z.object({ step: z.enum(SETUP_STEP_KEYS).optional().catch(undefined) });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "project.configure");
  const { step } = querySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  const progress = await loadSetupProgress(project);
  // Resumed where the work is: the first step not done (the last one once all are).
  const current = step ?? progress.firstOpen ?? SETUP_STEP_KEYS[SETUP_STEP_KEYS.length - 1];
  // The grid step shows the saved grid's cells on the map (the settings page previews changes).
  let grid = null;
  if (current === "grid") {
    const settings = await getProjectSettings(project);
    if (settings.workLimit) {
      grid = { lengthUnit: settings.lengthUnit, workLimit: settings.workLimit as LonLatPolygons, saved: settings.grid, crsDefinition: resolveCrsDefinition(settings.crs).definition };
    }
  }
  return { projectId: project.id, progress, current, grid };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Set up this project · Firmsand" }];
}

interface StepGuide {
  what: string;
  links: Array<{ label: string; to: string }>;
  caution?: string;
}

/** What each step asks for and where it is done. Settings links carry the step, so the settings page leads back here. */
function guideFor(key: SetupStepKey, projectId: number): StepGuide {
  const base = `/projects/${projectId}`;
  const settings = (anchor: string) => `${base}/settings?setup=${key}#${anchor}`;
  switch (key) {
    case "identity":
      return {
        what: "Name the project as the permits do, the agency or client it is for, and the permit numbers; the time zone decides which day \"today\" and \"tomorrow\" are.",
        links: [{ label: "Open Identity in Settings", to: settings("identity-heading") }],
      };
    case "coordinates":
      return {
        what: "The coordinate reference system the surveys come in (search EPSG codes and names) and its length unit; volumes follow the unit. They are fixed once the first survey is stored.",
        links: [{ label: "Open Coordinates in Settings", to: settings("coordinates-heading") }],
      };
    case "work-limit":
      return {
        what: "The permitted work limit as a GeoJSON file, in the project's CRS or in lon/lat. It is previewed before it is saved.",
        links: [{ label: "Open Work limit in Settings", to: settings("work-limit-heading") }],
      };
    case "grid":
      return {
        what: "The cells the work is steered and paid by: cell size, rotation and origin (the work limit's south-west corner by default), raster resolution and longest triangle edge.",
        links: [{ label: "Open Grid in Settings", to: settings("grid-heading") }],
      };
    case "zones":
      return {
        what: "Zones group the cells for progress, quantities and the public map. Draw them on the map, upload a file of outlines, make one of cells selected on the coverage map, or send them through the API; cells in no zone are listed as Unzoned so the rows still add up.",
        links: [{ label: "Open Zones in Settings", to: settings("zones-heading") }],
      };
    case "settings":
      return {
        what: "Check the firm-sand tolerance, coverage and survey order (IHO S-44) against the contract and its survey specification, then set the working hours and the emergency information printed on every day sheet.",
        links: [
          { label: "Open Targets and tolerances", to: settings("tolerances-heading") },
          { label: "Open Dive work", to: settings("dive-work-heading") },
          { label: "Open Emergency information", to: settings("emergency-heading") },
        ],
        caution: "Take the working hours, minimum team size and emergency contacts from the project's dive safety plan and emergency action plan; they decide, not Firmsand.",
      };
    case "teams":
      return {
        what: "The dive teams that will be assigned cells: their members, hoses and pumps with their diameters, and station.",
        links: [{ label: "Open Dive teams", to: `${base}/teams` }],
        caution: "Team sizes and roles follow the dive safety plan and the applicable commercial diving standard.",
      };
    case "members":
      return {
        what: "Invite the surveyor, dive supervisor, dewatering operator, resource monitor and anyone who reads along, each with their role. An invitation waiting counts.",
        links: [{ label: "Open Members", to: `${base}/members` }],
      };
    case "first-survey":
      return {
        what: "Import the baseline survey (with probing to firm sand) so the map shows its cells. The surveyor can do this once invited.",
        links: [{ label: "Import a survey", to: `${base}/surveys/new` }],
      };
  }
}

/** Done or not, in words (not colour alone); `onDark` on the current step's filled row. */
function DoneMark({ done, onDark = false }: { done: boolean; onDark?: boolean }) {
  const tone = onDark ? "border-white text-white" : done ? "border-ok text-ok" : "border-line text-muted";
  return (
    <span className={`inline-flex shrink-0 items-center gap-1 rounded border px-2 py-0.5 text-xs font-medium ${tone}`}>
      {done ? <><span aria-hidden="true">✓</span> Done</> : "Not done"}
    </span>
  );
}

const stepLinkClass = (current: boolean) =>
  `flex items-center justify-between gap-2 rounded px-3 py-2 text-sm focus-visible:outline-2 focus-visible:outline-lagoon ${current ? "bg-lagoon text-white" : "hover:bg-paper"}`;

function StepList({ steps, current }: { steps: SetupStep[]; current: SetupStepKey }) {
  return (
    <nav aria-label="Setup steps">
      <ol className="space-y-1">
        {steps.map((step) => (
          <li key={step.key}>
            <Link to={`?step=${step.key}`} className={stepLinkClass(step.key === current)} aria-current={step.key === current ? "step" : undefined} preventScrollReset>
              <span><span className="figures">{step.number}.</span> {step.title}</span>
              <DoneMark done={step.done} onDark={step.key === current} />
            </Link>
          </li>
        ))}
      </ol>
    </nav>
  );
}

const buttonClass = "inline-block rounded px-4 py-2 font-medium focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon";

export default function ProjectSetupPage({ loaderData }: Route.ComponentProps) {
  const { progress, current, projectId } = loaderData;
  const step = progress.steps.find((s) => s.key === current)!;
  const guide = guideFor(step.key, projectId);
  const { previous, next } = neighbouringSteps(step.key);
  const titleOf = (key: SetupStepKey) => progress.steps.find((s) => s.key === key)!.title;
  return (
    <section aria-labelledby="setup-heading" className="space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="setup-heading" className="text-xl font-semibold">Set up this project</h2>
        <p className="text-sm" data-testid="setup-count">
          <span className="figures">{progress.doneCount}</span> of <span className="figures">{progress.total}</span> steps done
        </p>
      </div>
      <progress className="h-2 w-full accent-lagoon" max={progress.total} value={progress.doneCount} aria-label={`Setup: ${progress.doneCount} of ${progress.total} steps done`} />
      {progress.complete ? (
        <p role="status" className="rounded border border-ok bg-panel px-3 py-2 text-sm text-ok">
          Every step is done. <Link className="underline" to={`/projects/${projectId}/map`}>Open the map</Link> to see the cells.
        </p>
      ) : (
        <p className="text-sm text-muted">Each step is done when the project holds what it asks for; leave at any time and come back from the overview.</p>
      )}
      <div className="grid gap-4 md:grid-cols-[18rem_1fr]">
        <StepList steps={progress.steps} current={current} />
        <article aria-labelledby="step-heading" className="self-start rounded border border-line bg-panel p-4" data-testid="setup-step">
          <p className="text-sm text-muted">Step <span className="figures">{step.number}</span> of <span className="figures">{progress.total}</span></p>
          <div className="mt-1 flex flex-wrap items-center justify-between gap-2">
            <h3 id="step-heading" className="text-lg font-semibold">{step.title}</h3>
            <DoneMark done={step.done} />
          </div>
          <p className="mt-2 text-sm" data-testid="step-state">{step.state}</p>
          <p className="mt-2 text-sm">{guide.what}</p>
          {guide.caution ? <p className="mt-2 rounded border border-line bg-paper px-3 py-2 text-sm">{guide.caution}</p> : null}
          {step.key === "grid" && loaderData.grid ? (
            <div className="mt-4">
              <GridPreview
                projectId={projectId} lengthUnit={loaderData.grid.lengthUnit} crsDefinition={loaderData.grid.crsDefinition} workLimit={loaderData.grid.workLimit}
                saved={loaderData.grid.saved} title="The saved grid"
                typed={{ cellSize: String(loaderData.grid.saved.cellSize), rotationDegrees: String(loaderData.grid.saved.rotationDegrees), originX: String(loaderData.grid.saved.originX), originY: String(loaderData.grid.saved.originY), rasterResolution: String(loaderData.grid.saved.rasterResolution) }}
              />
            </div>
          ) : null}
          <ul className="mt-4 flex flex-wrap gap-2">
            {guide.links.map((link) => (
              <li key={link.to}>
                <Link to={link.to} className={`${buttonClass} bg-lagoon text-white hover:opacity-90`}>{link.label}</Link>
              </li>
            ))}
          </ul>
          <div className="mt-6 flex flex-wrap justify-between gap-2 border-t border-line pt-4">
            {previous ? (
              <Link to={`?step=${previous}`} className={`${buttonClass} border border-line hover:bg-paper`} preventScrollReset aria-label={`Back: ${titleOf(previous)}`}>← Back</Link>
            ) : <span />}
            {next ? (
              <Link to={`?step=${next}`} className={`${buttonClass} border border-line hover:bg-paper`} preventScrollReset aria-label={`Next: ${titleOf(next)}`}>Next →</Link>
            ) : (
              <Link to={`/projects/${projectId}`} className={`${buttonClass} border border-line hover:bg-paper`}>To the overview</Link>
            )}
          </div>
        </article>
      </div>
    </section>
  );
}
