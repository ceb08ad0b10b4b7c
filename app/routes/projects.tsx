import { useRef } from "react";
import { Form, Link, data, redirect } from "react-router";
import { CrsCombobox } from "~/components/crs-combobox";
import { z } from "zod";
import { defaultsFor, lengthUnitSchema } from "../../shared/units";
import { ActionMessages } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { LengthUnitOptions } from "~/components/length-unit-options";
import { requireUser } from "~/lib/auth/access.server";
import { canCreateProjects } from "~/lib/auth/permissions";
import { roleLabel } from "~/lib/auth/roles";
import { DomainError, validationErrorFrom } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fileTooLargeMessage } from "~/lib/http/upload-size.server";
import { readFileForm } from "~/lib/http/body.server";
import { fieldErrorsFrom, parseForm, type FieldErrors } from "~/lib/http/form";
import { listProjectsForUser } from "~/models/project.server";
import { assertMayCreateProjects, createProject, newProjectSchema } from "~/models/project-setup.server";
import { WORK_LIMIT_ACCEPT, WORK_LIMIT_MAX_BYTES } from "../../shared/grid/work-limit-geojson";
import { readWorkLimitFile } from "~/lib/geo/work-limit-files.server";
import type { Route } from "./+types/projects";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const projects = await listProjectsForUser(user);
  return {
    projects: projects.map((project) => ({
      id: project.id,
      name: project.name,
      description: project.description,
      role: roleLabel(project.role),
      archivedAt: project.archivedAt,
    })),
    canCreate: canCreateProjects(user),
  };
}

// The new-project form: the least a project needs to show its grid (the rest is on its settings page).
const newProjectFormSchema = z.object({
  name: z.string(),
  crs: z.string(),
  lengthUnit: z.enum(lengthUnitSchema.options, { error: "Choose a length unit" }),
  timeZone: z.string(),
  manager: z.string().trim().transform((value) => value || undefined),
  file: z.instanceof(File, { error: "Choose the work limit's file" }).refine((file) => file.size > 0, "Choose the work limit's file"),
});

/** A service refusal's details as the form's field errors (the detail's first path segment is the input's name; the work limit is the file input). */
const fieldErrorsOf = (error: DomainError) => fieldErrorsFrom(error.details, (field) => (field === "workLimit" ? "file" : field.split(".")[0]));

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  try {
    assertMayCreateProjects(user);
  } catch (error) {
    throw new Response((error as Error).message, { status: 403, statusText: "Forbidden" });
  }
  // Read within a work limit's size (a small file); a larger body is refused as it arrives.
  const form = await readFileForm(request, WORK_LIMIT_MAX_BYTES);
  if (!form) return data({ errors: { file: fileTooLargeMessage(WORK_LIMIT_MAX_BYTES, "simplify the outline first") } as FieldErrors }, { status: 413 });
  const parsed = parseForm(form, newProjectFormSchema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 400 });
  const { file, ...fields } = parsed.data;
  try {
    const { geoJson: workLimit } = await readWorkLimitFile(file.name, new Uint8Array(await file.arrayBuffer()));
    // The grid starts from the unit's usual cell size; the settings page changes it.
    const input = newProjectSchema.safeParse({ ...fields, workLimit, grid: { cellSize: defaultsFor(fields.lengthUnit).cellSize } });
    if (!input.success) throw validationErrorFrom(input.error);
    const { id } = await createProject(user, input.data, { ip: clientAddress(request) });
    // The creator (or the manager named) goes on with the steps that set the project up.
    return redirect(`/projects/${id}/setup`);
  } catch (error) {
    if (error instanceof DomainError) return data({ errors: fieldErrorsOf(error) }, { status: 400 });
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Projects · Firmsand" }];
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger";

function NewProjectForm({ errors }: { errors: FieldErrors }) {
  const lengthUnitRef = useRef<HTMLSelectElement>(null);
  return (
    <section aria-labelledby="new-project" className="mt-8 rounded border border-line bg-panel p-4">
      <h2 id="new-project" className="text-lg font-semibold">New project</h2>
      <p className="mt-1 text-sm text-muted">The work limit decides the grid; the rest (zones, tolerances, description) is on the project's settings page.</p>
      <ActionMessages error={errors.form} />
      <Form method="post" encType="multipart/form-data" className="mt-3 grid gap-3 sm:grid-cols-2">
        <TextField label="Project name" name="name" required maxLength={200} error={errors.name} />
        <CrsCombobox
          label="Coordinate reference system (EPSG code)" name="crs" error={errors.crs}
          hint="Type a code or words of the name (e.g. Florida East) and choose; the length unit follows."
          onPick={(option) => { if (lengthUnitRef.current) lengthUnitRef.current.value = option.lengthUnit; }}
        />
        <div>
          <label htmlFor="new-length-unit" className="block text-sm font-medium">Length unit</label>
          <select ref={lengthUnitRef} id="new-length-unit" name="lengthUnit" className={inputClass} aria-invalid={errors.lengthUnit ? true : undefined}>
            <LengthUnitOptions />
          </select>
          {errors.lengthUnit ? <p className="mt-1 text-sm text-danger">{errors.lengthUnit}</p> : null}
        </div>
        <TextField label="Time zone" name="timeZone" required defaultValue="America/New_York" error={errors.timeZone} hint="IANA name: work days are counted in it." />
        <TextField label="First manager's e-mail" name="manager" type="email" error={errors.manager} hint="An existing account; leave empty to manage it yourself." />
        <div>
          <label htmlFor="new-work-limit" className="block text-sm font-medium">Work limit (GeoJSON, KML, zipped shapefile, DXF or CSV of vertices; in the CRS or lon/lat)</label>
          <input id="new-work-limit" name="file" type="file" required accept={WORK_LIMIT_ACCEPT} className="mt-1 block w-full text-sm" aria-invalid={errors.file ? true : undefined} aria-describedby="new-work-limit-error" />
          <p id="new-work-limit-error" className="mt-1 text-sm text-danger">{errors.file ?? ""}</p>
        </div>
        <div className="sm:col-span-2"><SubmitButton pendingLabel="Creating…">Create project</SubmitButton></div>
      </Form>
    </section>
  );
}

type ProjectRow = Route.ComponentProps["loaderData"]["projects"][number];

function ProjectList({ projects }: { projects: ProjectRow[] }) {
  return (
    <ul className="space-y-3">
      {projects.map((project) => (
        <li key={project.id} className="rounded border border-line bg-panel p-4">
          <Link to={`/projects/${project.id}`} className="text-lg font-medium text-lagoon underline-offset-2 hover:underline focus-visible:outline-2 focus-visible:outline-lagoon">
            {project.name}
          </Link>
          <p className="mt-1 text-sm text-muted">{project.description}</p>
          <p className="mt-1 text-sm">
            Your role: {project.role}
            {project.archivedAt ? <> · archived <time className="figures whitespace-nowrap" dateTime={project.archivedAt}>{project.archivedAt.slice(0, 10)}</time>, read-only</> : null}
          </p>
        </li>
      ))}
    </ul>
  );
}

export default function Projects({ loaderData, actionData }: Route.ComponentProps) {
  const open = loaderData.projects.filter((project) => project.archivedAt === null);
  const archived = loaderData.projects.filter((project) => project.archivedAt !== null);
  return (
    <Page title="Your projects" wide>
      {loaderData.projects.length === 0 ? (
        <p className="rounded border border-dashed border-line bg-panel p-6 text-muted">
          You are not a member of any project yet. A project manager can invite you by e-mail.
        </p>
      ) : open.length === 0 ? (
        <p className="rounded border border-dashed border-line bg-panel p-6 text-muted">No open projects: every project you belong to is archived.</p>
      ) : (
        <ProjectList projects={open} />
      )}
      {archived.length > 0 ? (
        <section aria-labelledby="archived-projects" className="mt-8">
          <h2 id="archived-projects" className="text-lg font-semibold">Archived</h2>
          <p className="mt-1 text-sm text-muted">Finished projects: read-only, still readable and exportable.</p>
          <div className="mt-3"><ProjectList projects={archived} /></div>
        </section>
      ) : null}
      {loaderData.canCreate ? <NewProjectForm errors={actionData?.errors ?? {}} /> : null}
    </Page>
  );
}
