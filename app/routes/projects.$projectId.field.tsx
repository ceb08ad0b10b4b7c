import { isRouteErrorResponse } from "react-router";
import { FieldPage } from "~/components/field/field-page";
import { keptSnapshot } from "~/components/field/store";
import { requireRole } from "~/lib/auth/access.server";
import { fieldSnapshot } from "~/models/field.server";
import type { Route } from "./+types/projects.$projectId.field";

// The field page: dive logs, turbidity readings, finds with photos, their status and custody handovers,
// wildlife sightings, dewatering shift logs, jar tests, haul tickets and tube records entered on a
// phone at the water, with or without signal (app/components/field/). Any member may open it; the
// forms shown are the ones the permission table lets the member use.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  return { snapshot: await fieldSnapshot(access), source: "server" as const };
}

// A navigation inside the app asks the server; with no connection, the copy kept on this device is used.
export async function clientLoader({ serverLoader, params }: Route.ClientLoaderArgs) {
  try {
    return await serverLoader();
  } catch (error) {
    // The server answered (signed out, no access, no such project): that answer stands.
    if (isRouteErrorResponse(error) || error instanceof Response) throw error;
    const kept = Number.isInteger(Number(params.projectId)) ? await keptSnapshot(Number(params.projectId)).catch(() => undefined) : undefined;
    if (!kept) throw new Response("You are offline, and this device has no copy of this project's field page yet: open it once with a connection.", { status: 503 });
    return { snapshot: kept.snapshot, source: "device" as const };
  }
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [
    { title: `Field entry · ${loaderData?.snapshot.project.name ?? "Project"} · Firmsand` },
    { name: "theme-color", content: "#14606e" },
  ];
}

export function links() {
  return [
    { rel: "manifest", href: "/manifest.webmanifest" },
    { rel: "apple-touch-icon", href: "/icons/apple-touch-180.png" },
  ];
}

export default function FieldRoute({ loaderData }: Route.ComponentProps) {
  return <FieldPage snapshot={loaderData.snapshot} source={loaderData.source} />;
}
