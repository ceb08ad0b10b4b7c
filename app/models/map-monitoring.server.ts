import { Op } from "sequelize";
import { createCrs } from "../../shared/crs";
import { standDownActiveAt } from "../../shared/water-quality/stand-down";
import { MonitoringStation, WaterQualityReading, WildlifeSighting, WildlifeStandDown } from "~/lib/db.server";
import { resolveCrsDefinition } from "~/lib/geo/epsg.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { findProject } from "~/lib/auth/project-view.server";
import type { MapMonitoring } from "~/components/map/monitoring";
import { SIGHTINGS_READ_HOURS, clockOf } from "~/components/map/monitoring";

/**
 * What the coverage map shows of water quality and wildlife: the monitoring stations (their kind,
 * depth rule and latest reading) and the sightings of the last few days, each at its position in
 * lon/lat. A station or sighting without a position is still listed, with no point. Every member
 * reads them (the dive supervisor must see where an animal was seen).
 */
export async function mapMonitoring(project: ProjectView, nowMs = Date.now()): Promise<MapMonitoring> {
  const since = new Date(nowMs - SIGHTINGS_READ_HOURS * 3_600_000);
  const [row, stations, sightings] = await Promise.all([
    findProject(project.id),
    MonitoringStation.findAll({ where: { projectId: project.id }, order: [["kind", "ASC"], ["name", "ASC"]] }),
    WildlifeSighting.findAll({
      where: { projectId: project.id, seenAt: { [Op.gte]: since, [Op.lte]: new Date(nowMs) } },
      include: [{ model: WildlifeStandDown, as: "standDown", required: false }],
      order: [["seenAt", "DESC"], ["id", "DESC"]],
      limit: 200,
    }),
  ]);
  const latest = await Promise.all(
    stations.map((station) => WaterQualityReading.findOne({ where: { projectId: project.id, stationId: station.id }, order: [["takenAt", "DESC"], ["id", "DESC"]] })),
  );
  const anyPosition = stations.some((station) => station.positionX !== null) || sightings.some((sighting) => sighting.positionX !== null);
  const crs = anyPosition && row ? createCrs(resolveCrsDefinition(row.crs).definition) : null;
  const lonLatOf = (x: number | null, y: number | null): [number, number] | null => (crs && x !== null && y !== null ? crs.toLonLat(x, y) : null);
  return {
    nowMs,
    stations: stations.map((station, index) => {
      const reading = latest[index];
      const takenAt = reading?.takenAt.toISOString();
      return {
        id: station.id, name: station.name, kind: station.kind, depth: station.depthRule, lonLat: lonLatOf(station.positionX, station.positionY),
        latest: reading && takenAt ? { value: reading.value, unit: reading.unit, takenAt, takenClock: clockOf(takenAt, project.timeZone), exceeds: reading.exceeds } : null,
      };
    }),
    sightings: sightings.map((sighting) => {
      const standDown = sighting.standDown;
      const inForce = standDown
        ? standDownActiveAt({ startedAtMs: standDown.startedAt.getTime(), departedAtMs: standDown.departedAt?.getTime() ?? null }, nowMs, standDown.waitMinutes)
        : false;
      const seenAt = sighting.seenAt.toISOString();
      return {
        id: sighting.id, species: sighting.species, seenAt, seenClock: clockOf(seenAt, project.timeZone), distance: sighting.distance, gone: sighting.gone,
        observer: sighting.observer, note: sighting.note, lonLat: lonLatOf(sighting.positionX, sighting.positionY), standDownInForce: inForce,
      };
    }),
  };
}
