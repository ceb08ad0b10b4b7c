/** A project's offline map style (app/routes/projects.$projectId.map.style[.]json.ts), absolute as MapLibre wants it. */
export function mapStyleUrl(origin: string, projectId: number | string) {
  return `${origin}/projects/${projectId}/map/style.json`;
}

/** A project's cells for the maps: the grid definition and per-cell arrays (app/routes/api.projects.$projectId.cells.ts). */
export function mapCellsUrl(projectId: number | string) {
  return `/api/projects/${projectId}/cells`;
}
