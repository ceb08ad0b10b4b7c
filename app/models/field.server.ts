import { massUnitsFor, unitLabel } from "../../shared/units";
import type { ProjectAccess } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { listDiveTeams } from "./assignments.server";
import { dewateringSettings, listTubes } from "./dewatering.server";
import { listHaulSites } from "./hauls.server";
import { cellLabelsInside, fieldFinds } from "./finds.server";
import { heldCellLabels } from "./holds.server";
import type { FieldSnapshot } from "./field-snapshot";
import { currentStoppages } from "./stoppages.server";
import { getWaterQualitySettings, listStations } from "./water-quality.server";

/** The field page's data for this member (see FieldSnapshot). */
export async function fieldSnapshot(access: ProjectAccess): Promise<FieldSnapshot> {
  const { project } = access;
  const may = {
    dives: can(access, "dives.log"),
    readings: can(access, "water-quality.record"),
    finds: can(access, "finds.log"),
    sightings: can(access, "wildlife.record"),
    tubes: can(access, "dewatering.log"),
  };
  const [teams, stations, cells, heldCells, settings, stoppages, register, dewatering, haulSites, finds] = await Promise.all([
    may.dives ? listDiveTeams(project) : Promise.resolve([]),
    may.readings ? listStations(project) : Promise.resolve([]),
    may.dives || may.finds ? cellLabelsInside(project) : Promise.resolve([]),
    // Held cells are shown beside the find and dive forms; only roles that see finds may know them.
    can(access, "finds.read") ? heldCellLabels(project.id) : Promise.resolve([]),
    may.sightings ? getWaterQualitySettings(project) : Promise.resolve(null),
    currentStoppages(project),
    may.tubes ? listTubes(project) : Promise.resolve(null),
    may.tubes ? dewateringSettings(project) : Promise.resolve(null),
    may.tubes ? listHaulSites(project) : Promise.resolve([]),
    may.finds ? fieldFinds(project) : Promise.resolve([]),
  ]);
  return {
    user: { id: access.user.id, name: access.user.name },
    project: { id: project.id, name: project.name, timeZone: project.timeZone, lengthUnit: project.lengthUnit, lengthLabel: unitLabel(project.lengthUnit) },
    may,
    teams: teams.map((team) => ({ id: team.id, name: team.name, divers: team.members.map((member) => member.name) })),
    stations: stations.map((station) => ({ id: station.id, name: station.name, kind: station.kind })),
    tubes: (register?.tubes ?? []).map((tube) => ({ id: tube.id, name: tube.name, status: tube.status, version: tube.version, fillLevel: tube.fillLevel })),
    massLabel: register?.massLabel ?? "",
    dewatering: dewatering
      ? { solidsSpecificGravity: dewatering.solidsSpecificGravity, cakeSolidsByWeight: dewatering.cakeSolidsByWeight, flowUnit: massUnitsFor(project.lengthUnit).flow, haulSites: haulSites.map((site) => ({ id: site.id, name: site.name, kind: site.kind })) }
      : null,
    finds,
    cells,
    heldCells,
    species: settings?.species ?? [],
    stoppages,
    takenAt: new Date().toISOString(),
  };
}
