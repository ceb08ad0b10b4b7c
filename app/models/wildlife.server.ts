import { z } from "zod";
import { localDayOf } from "../../shared/local-time";
import { effectOfSighting, standDownActiveAt } from "../../shared/water-quality/stand-down";
import { getSequelize, Project, WildlifeSighting, WildlifeStandDown } from "~/lib/db.server";
import { ValidationError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { getWaterQualitySettings } from "./water-quality.server";
import { sightingInputSchema } from "~/lib/field-records/inputs";
export { sightingInputSchema } from "~/lib/field-records/inputs";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";
import { sightingNotices } from "../../shared/field-notices";

/**
 * Wildlife sightings and the stand-downs they start: a protected animal within the project's
 * shutdown distance stops in-water work until it has left on its own and the wait has passed.
 * A later sighting of the same species beyond the distance, or marked gone, records its leaving.
 */

export type SightingInput = z.infer<typeof sightingInputSchema>;

export interface StandDownView {
  id: number;
  species: string;
  startedAt: string;
  departedAt: string | null;
  /** When it ends (left + wait); null while the animal is near. */
  until: string | null;
  waitMinutes: number;
  shutdownDistance: number;
  active: boolean;
  /** Hours of in-water work lost, to the end or to now while active. */
  durationHours: number;
}

export interface SightingView {
  id: number;
  species: string;
  seenAt: string;
  localDay: string;
  distance: number | null;
  gone: boolean;
  position: { x: number; y: number } | null;
  observer: string;
  note: string;
  standDownId: number | null;
}

export interface SightingRecorded {
  id: number;
  standDown?: { id: number; until: string | null };
  /** Safety notices in plain sentences (the stand-down that applies); empty when none. */
  notices: string[];
}

function presentStandDown(standDown: WildlifeStandDown, nowMs: number): StandDownView {
  const state = { startedAtMs: standDown.startedAt.getTime(), departedAtMs: standDown.departedAt?.getTime() ?? null };
  const endMs = Math.min(standDown.endsAt?.getTime() ?? nowMs, nowMs);
  return {
    id: standDown.id, species: standDown.species, startedAt: standDown.startedAt.toISOString(), departedAt: standDown.departedAt?.toISOString() ?? null,
    until: standDown.endsAt?.toISOString() ?? null, waitMinutes: standDown.waitMinutes, shutdownDistance: standDown.shutdownDistance,
    active: standDownActiveAt(state, nowMs, standDown.waitMinutes), durationHours: Math.max(0, Math.round(((endMs - state.startedAtMs) / 3_600_000) * 100) / 100),
  };
}

function presentSighting(sighting: WildlifeSighting): SightingView {
  return {
    id: sighting.id, species: sighting.species, seenAt: sighting.seenAt.toISOString(), localDay: sighting.localDay, distance: sighting.distance, gone: sighting.gone,
    position: sighting.positionX !== null && sighting.positionY !== null ? { x: sighting.positionX, y: sighting.positionY } : null,
    observer: sighting.observer, note: sighting.note, standDownId: sighting.standDownId ?? null,
  };
}

/** Records a sighting and what it does to the species' stand-down (starts, renews or ends one). */
export async function recordSighting(project: ProjectView, user: UserView, input: SightingInput, ip: string | null = null): Promise<SightingRecorded> {
  const seenAt = new Date(input.seenAt);
  if (seenAt.getTime() > Date.now() + 5 * 60_000) throw new ValidationError({ field: "seenAt", message: "The sighting time is in the future." });
  const settings = await getWaterQualitySettings(project);
  const species = settings.species.find((name) => name.toLowerCase() === input.species.toLowerCase());
  if (!species) throw new ValidationError({ field: "species", message: `"${input.species}" is not on the project's species list (${settings.species.join(", ")}); the manager keeps the list.` });
  if (input.idempotencyKey) {
    const earlier = await WildlifeSighting.findOne({ where: { projectId: project.id, idempotencyKey: input.idempotencyKey } });
    if (earlier) return replayOf(earlier);
  }
  return getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    // The project row's lock before the stand-down's: an assignment for today waits on it before
    // looking for stand-downs in force (assignments.server.ts), and takes them in that order too.
    await Project.findByPk(project.id, { attributes: ["id"], lock: transaction.LOCK.UPDATE, transaction });
    const latest = await WildlifeStandDown.findOne({ where: { projectId: project.id, species }, order: [["startedAt", "DESC"], ["id", "DESC"]], transaction, lock: transaction.LOCK.UPDATE });
    const effect = effectOfSighting(
      latest ? { startedAtMs: latest.startedAt.getTime(), departedAtMs: latest.departedAt?.getTime() ?? null } : null,
      { seenAtMs: seenAt.getTime(), distance: input.distance ?? null, gone: input.gone },
      // A stand-down keeps the wait it started with; the distance is today's setting.
      { shutdownDistance: settings.shutdownDistance, waitMinutes: latest?.waitMinutes ?? settings.standDownWaitMinutes },
    );
    let standDown: WildlifeStandDown | null = null;
    if (effect.kind === "start") {
      standDown = await WildlifeStandDown.create({ projectId: project.id, species, startedAt: seenAt, departedAt: null, endsAt: null, waitMinutes: settings.standDownWaitMinutes, shutdownDistance: settings.shutdownDistance }, { transaction });
    } else if (effect.kind === "renew") {
      standDown = await latest!.update({ departedAt: null, endsAt: null }, { transaction });
    } else if (effect.kind === "depart") {
      standDown = await latest!.update({ departedAt: seenAt, endsAt: new Date(effect.untilMs) }, { transaction });
    }
    const sighting = await WildlifeSighting.create(
      {
        projectId: project.id, species, seenAt, localDay: localDayOf(seenAt.getTime(), project.timeZone), distance: input.distance ?? null, gone: input.gone,
        positionX: input.position?.x ?? null, positionY: input.position?.y ?? null, observer: input.observer, note: input.note ?? "",
        standDownId: standDown?.id ?? null, idempotencyKey: input.idempotencyKey ?? null, recordedById: user.id,
      },
      { transaction },
    );
    await idempotency.created(sighting.id);
    await recordAudit({ action: AUDIT_ACTIONS.wildlifeSightingRecorded, projectId: project.id, userId: user.id, ip, detail: { id: sighting.id, species, seenAt: input.seenAt, distance: input.distance ?? null, gone: input.gone, effect: effect.kind } }, transaction);
    const ref = standDown ? { id: standDown.id, until: standDown.endsAt?.toISOString() ?? null } : undefined;
    return { id: sighting.id, ...(ref ? { standDown: ref } : {}), notices: sightingNotices(species, ref) };
  });
}

async function replayOf(sighting: WildlifeSighting): Promise<SightingRecorded> {
  const standDown = sighting.standDownId ? await WildlifeStandDown.findByPk(sighting.standDownId) : null;
  const ref = standDown ? { id: standDown.id, until: standDown.endsAt?.toISOString() ?? null } : undefined;
  return { id: sighting.id, ...(ref ? { standDown: ref } : {}), notices: sightingNotices(sighting.species, ref) };
}

export async function listSightings(project: ProjectView): Promise<SightingView[]> {
  const sightings = await WildlifeSighting.findAll({ where: { projectId: project.id }, order: [["seenAt", "DESC"], ["id", "DESC"]], limit: 500 });
  return sightings.map(presentSighting);
}

export async function listStandDowns(project: ProjectView, options: { activeOnly?: boolean } = {}, nowMs = Date.now()): Promise<StandDownView[]> {
  const standDowns = await WildlifeStandDown.findAll({ where: { projectId: project.id }, order: [["startedAt", "DESC"], ["id", "DESC"]], limit: 500 });
  const views = standDowns.map((standDown) => presentStandDown(standDown, nowMs));
  return options.activeOnly ? views.filter((view) => view.active) : views;
}
