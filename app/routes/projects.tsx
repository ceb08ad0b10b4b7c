import { Link } from "react-router";
import { Page } from "~/components/page";
import { requireUser } from "~/lib/auth/access.server";
import { ROLE_LABELS } from "~/lib/auth/roles";
import { listProjectsForUser } from "~/models/project.server";
import type { Route } from "./+types/projects";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const projects = await listProjectsForUser(user);
  return {
    projects: projects.map((project) => ({
      id: project.id,
      name: project.name,
      description: project.description,
      role: project.role ? ROLE_LABELS[project.role] : "Site administrator",
    })),
  };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Projects · Firmsand" }];
}

export default function Projects({ loaderData }: Route.ComponentProps) {
  return (
    <Page title="Your projects" wide>
      {loaderData.projects.length === 0 ? (
        <p className="rounded border border-dashed border-line bg-panel p-6 text-muted">
          You are not a member of any project yet. A project manager can invite you by e-mail.
        </p>
      ) : (
        <ul className="space-y-3">
          {loaderData.projects.map((project) => (
            <li key={project.id} className="rounded border border-line bg-panel p-4">
              <Link to={`/projects/${project.id}`} className="text-lg font-medium text-lagoon underline-offset-2 hover:underline focus-visible:outline-2 focus-visible:outline-lagoon">
                {project.name}
              </Link>
              <p className="mt-1 text-sm text-muted">{project.description}</p>
              <p className="mt-1 text-sm">Your role: {project.role}</p>
            </li>
          ))}
        </ul>
      )}
    </Page>
  );
}
