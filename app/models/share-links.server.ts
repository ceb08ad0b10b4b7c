import { z } from "zod";
import { Project, ShareLink, Shoreline, User, Zone } from "~/lib/db.server";
import { thinPolygons } from "../../shared/progress/outline-svg";
import { createLinkToken, hashLinkToken } from "~/lib/auth/tokens.server";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import { loadProgress } from "./progress.server";
import { loadReconciliation } from "./reconciliation.server";
import { presentProject, type ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";

/**
 * Public progress share links. A link is a random 256-bit token (only its SHA-256 is stored) that
 * opens a read-only page of zone-level progress. What that page may show is the explicit
 * allow-list in `presentPublicProgress`: nothing else of the project ever reaches it.
 */

export const shareLinkFormSchema = z.object({
  name: z.string().trim().min(1, "give the link a name, such as the web page it is for").max(120, "keep the name under 120 characters"),
  publicText: z.string().trim().max(600, "keep the public text under 600 characters").default(""),
});
export type ShareLinkForm = z.infer<typeof shareLinkFormSchema>;

export interface ShareLinkView {
  id: number;
  name: string;
  publicText: string;
  createdAt: string;
  createdBy: string | null;
  revokedAt: string | null;
}

function presentShareLink(link: ShareLink & { createdBy?: User | null }): ShareLinkView {
  return {
    id: link.id,
    name: link.name,
    publicText: link.publicText,
    createdAt: link.createdAt.toISOString(),
    createdBy: link.createdBy?.name ?? null,
    revokedAt: link.revokedAt ? link.revokedAt.toISOString() : null,
  };
}

export function shareUrl(origin: string, token: string): string {
  return `${origin}/share/${token}`;
}

export async function listShareLinks(project: ProjectView): Promise<ShareLinkView[]> {
  const links = await ShareLink.findAll({
    where: { projectId: project.id },
    include: [{ model: User, as: "createdBy", attributes: ["name"] }],
    order: [["createdAt", "DESC"], ["id", "DESC"]],
  });
  return links.map(presentShareLink);
}

export async function createShareLink(project: ProjectView, user: UserView, form: ShareLinkForm, origin: string, ip: string | null) {
  const { token, tokenHash } = createLinkToken();
  const link = await ShareLink.create({ projectId: project.id, name: form.name, publicText: form.publicText, tokenHash, createdById: user.id, revokedAt: null, revokedById: null });
  await recordAudit({ action: AUDIT_ACTIONS.shareLinkCreated, projectId: project.id, userId: user.id, ip, detail: { shareLinkId: link.id, name: form.name } });
  return { token, url: shareUrl(origin, token), link: presentShareLink(link) };
}

export async function updateShareLink(project: ProjectView, user: UserView, id: number, form: ShareLinkForm, ip: string | null): Promise<boolean> {
  const link = await ShareLink.findOne({ where: { id, projectId: project.id, revokedAt: null } });
  if (!link) return false;
  await link.update({ name: form.name, publicText: form.publicText });
  publicViewCache.delete(link.tokenHash);
  await recordAudit({ action: AUDIT_ACTIONS.shareLinkUpdated, projectId: project.id, userId: user.id, ip, detail: { shareLinkId: link.id, name: form.name } });
  return true;
}

/** Revokes a link of this project, found by its id or by its token; false when there is no such live link. */
export async function revokeShareLink(project: ProjectView, user: UserView, which: { id: number } | { token: string }, ip: string | null): Promise<boolean> {
  const where = "id" in which ? { id: which.id } : { tokenHash: hashLinkToken(which.token) };
  const link = await ShareLink.findOne({ where: { ...where, projectId: project.id, revokedAt: null } });
  if (!link) return false;
  await link.update({ revokedAt: new Date(), revokedById: user.id });
  publicViewCache.delete(link.tokenHash);
  await recordAudit({ action: AUDIT_ACTIONS.shareLinkRevoked, projectId: project.id, userId: user.id, ip, detail: { shareLinkId: link.id, name: link.name } });
  return true;
}

// ——— The public side.

type LonLatRing = Array<[number, number]>;

/** Everything the public page may show. Adding a field here is a decision: keep the walk test in step. */
export interface PublicProgressView {
  projectName: string;
  publicText: string;
  /** Date of the newest survey behind the figures. */
  lastUpdated: string | null;
  /** 0–100, whole percent. */
  percentComplete: number | null;
  /** Whole volume units. */
  removedVolume: number;
  volumeLabel: string;
  /** Nitrogen and phosphorus removed, whole pounds or kilograms: the funders' headline; null before any lab sample. */
  nutrientsRemoved: { nitrogen: number; phosphorus: number; label: string } | null;
  workLimit: LonLatRing[][];
  /** The project's shoreline (the water body's outline, public geography), thinned for a small map; [] when none was uploaded. */
  shoreline: LonLatRing[][];
  /** Every zone, then the Unzoned row (`unzoned`, no outline) when part of the work limit lies in no zone. */
  /** `colour`: the zone's own (shared/zone-colours.ts); null for the Unzoned row. */
  zones: Array<{ name: string; colour: string | null; percentComplete: number | null; polygons: LonLatRing[][]; unzoned: boolean }>;
}

/** Polygon or MultiPolygon GeoJSON → polygons of rings of [lon, lat]; nothing else of the object is read. */
function lonLatPolygons(geoJson: string | null): LonLatRing[][] {
  if (!geoJson) return [];
  const geometry = JSON.parse(geoJson) as { type: string; coordinates: unknown };
  const polygons = (geometry.type === "Polygon" ? [geometry.coordinates] : geometry.type === "MultiPolygon" ? geometry.coordinates : []) as number[][][][];
  return polygons.map((polygon) => polygon.map((ring) => ring.map(([lon, lat]) => [Number(lon), Number(lat)] as [number, number])));
}

/** Vertices the public map's shoreline may carry: a few hundred pixels wide needs no more. */
export const PUBLIC_SHORELINE_VERTICES = 2000;

/** The shoreline's polygons (a FeatureCollection of Polygon and MultiPolygon features), thinned; nothing else of it is read. */
async function publicShoreline(projectId: number): Promise<LonLatRing[][]> {
  const row = await Shoreline.findOne({ where: { projectId }, attributes: ["geoJson"] });
  if (!row) return [];
  const collection = JSON.parse(row.geoJson) as { features?: Array<{ geometry?: unknown }> };
  const polygons = (collection.features ?? []).flatMap((feature) => lonLatPolygons(feature.geometry ? JSON.stringify(feature.geometry) : null));
  return thinPolygons(polygons, PUBLIC_SHORELINE_VERTICES);
}

const wholePercent = (value: number | null) => (value === null ? null : Math.round(value));

export async function presentPublicProgress(projectId: number, link: Pick<ShareLink, "publicText">): Promise<PublicProgressView | null> {
  const project = await Project.findByPk(projectId);
  if (!project) return null;
  const view = presentProject(project);
  const progress = await loadProgress(view);
  const { project: removed } = await loadReconciliation(view, progress);
  const zonePolygons = new Map<number, string>();
  for (const zone of await Zone.findAll({ where: { projectId }, attributes: ["id", "polygonGeoJson"] })) zonePolygons.set(zone.id, zone.polygonGeoJson);
  return {
    projectName: project.name,
    publicText: link.publicText,
    lastUpdated: progress.total.lastSurveyOn,
    percentComplete: wholePercent(progress.total.percentCompleteByVolume),
    removedVolume: Math.round(progress.total.removedVolume),
    volumeLabel: progress.volumeLabel,
    nutrientsRemoved: removed.nitrogenRemoved && removed.phosphorusRemoved
      ? { nitrogen: Math.round(removed.nitrogenRemoved.value), phosphorus: Math.round(removed.phosphorusRemoved.value), label: removed.phosphorusRemoved.label }
      : null,
    workLimit: lonLatPolygons(project.workLimitGeoJson),
    shoreline: await publicShoreline(projectId),
    zones: progress.zones.map((zone) => ({
      name: zone.name,
      colour: zone.colour,
      percentComplete: wholePercent(zone.percentCompleteByVolume),
      polygons: zone.zoneId === null ? [] : lonLatPolygons(zonePolygons.get(zone.zoneId) ?? null),
      unzoned: zone.zoneId === null,
    })),
  };
}

/** Public views by token hash, kept briefly so a busy embed does not recompute on every view. */
export const PUBLIC_CACHE_SECONDS = 60;
const publicViewCache = new Map<string, { view: PublicProgressView; until: number }>();

/** The public view behind a token, or null for an unknown or revoked link. */
export async function publicProgressForToken(token: string, now = Date.now()): Promise<PublicProgressView | null> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return null;
  const tokenHash = hashLinkToken(token);
  const link = await ShareLink.findOne({ where: { tokenHash, revokedAt: null }, attributes: ["id", "projectId", "publicText", "tokenHash"] });
  if (!link) {
    publicViewCache.delete(tokenHash);
    return null;
  }
  const cached = publicViewCache.get(tokenHash);
  if (cached && cached.until > now) return cached.view;
  const view = await presentPublicProgress(link.projectId, link);
  if (view) publicViewCache.set(tokenHash, { view, until: now + PUBLIC_CACHE_SECONDS * 1000 });
  return view;
}

// ——— Rate limit for the public page: a fixed window per client address, in this process. Without
// a trusted proxy every client shares one address (see clientAddress), so the limit is generous.

export const PUBLIC_REQUESTS_PER_MINUTE = 600;
const windows = new Map<string, { start: number; count: number }>();

/** Seconds to wait when the address has used up its window, else null (and the request is counted). */
export function publicRateLimit(address: string, now = Date.now()): number | null {
  const window = windows.get(address);
  if (!window || now - window.start >= 60_000) {
    if (windows.size > 10_000) windows.clear(); // bounded memory under a flood of addresses
    windows.set(address, { start: now, count: 1 });
    return null;
  }
  window.count++;
  if (window.count <= PUBLIC_REQUESTS_PER_MINUTE) return null;
  return Math.max(1, Math.ceil((window.start + 60_000 - now) / 1000));
}
