import { cubicToVolumeUnit, unitLabel } from "../../shared/units";
import { BoundedCache } from "~/lib/cache/bounded-cache";
import { getEngineState, projectRecomputeStamp } from "~/lib/engine/engine-state.server";
import type { ProjectView } from "~/lib/auth/project-view.server";

/**
 * The end-area cross-check of the removed volume for a project, as the progress page shows it:
 * the check itself is part of the project's engine state (sections across the work limit over
 * the same surfaces as the figures, shared/progress/end-area-check), worded and put in the
 * project's units here. Kept per project and stamp, so only the first view after an import pays.
 */
export interface EndAreaCrossCheck {
  /** Project volume unit. */
  surfaceRemovedVolume: number;
  endAreaRemovedVolume: number;
  differencePercent: number | null;
  sections: number;
  /** Project length unit. */
  sectionSpacing: number;
  method: string;
}

// A few numbers each: many projects' worth, so a check outlives the rasters it came from.
const cache = new BoundedCache<EndAreaCrossCheck | null>(64);

export async function loadEndAreaCrossCheck(project: ProjectView): Promise<EndAreaCrossCheck | null> {
  const stamp = await projectRecomputeStamp(project.id);
  const key = `${project.id}:${stamp}`;
  if (!cache.has(key)) cache.dropPrefix(`${project.id}:`);
  return cache.getOrCompute(key, async () => {
    const state = await getEngineState(project.id, stamp);
    if (!state) return null;
    const check = state.endArea;
    const volume = (cubic: number) => cubicToVolumeUnit(cubic, project.lengthUnit);
    return {
      surfaceRemovedVolume: volume(check.surfaceVolumeCubicLength),
      endAreaRemovedVolume: volume(check.endAreaVolumeCubicLength),
      differencePercent: check.differencePercent,
      sections: check.sections,
      sectionSpacing: check.sectionSpacing,
      method:
        `Average end area (USACE EM 1110-2-1003, ch. 15) of ${check.sections} sections ${Number(check.sectionSpacing.toFixed(2))} ${unitLabel(project.lengthUnit)} apart, square to the work limit's long axis, ` +
        "each integrated across the limit from the baseline muck top down to the latest bottom.",
    };
  });
}
