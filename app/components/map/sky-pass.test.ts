import { describe, expect, it, vi } from "vitest";
import { SKY_FROM_PITCH, skipSkyWhileFlat } from "./sky-pass";

function fakeMap(pitch: number) {
  const sky = vi.fn((..._args: unknown[]) => "drawn");
  const map = { pitch, getPitch: () => map.pitch, painter: { drawFunctions: { sky, fill: vi.fn() } } };
  return { map, sky };
}

describe("skipSkyWhileFlat", () => {
  it("leaves the sky pass out while the map is seen from above, and draws it tilted", () => {
    const { map, sky } = fakeMap(0);
    expect(skipSkyWhileFlat(map)).toBe(true);
    expect(map.painter.drawFunctions.sky("mesh", "frame")).toBeUndefined();
    map.pitch = SKY_FROM_PITCH - 0.1;
    map.painter.drawFunctions.sky("mesh", "frame");
    expect(sky).not.toHaveBeenCalled();
    map.pitch = SKY_FROM_PITCH;
    expect(map.painter.drawFunctions.sky("mesh", "frame")).toBe("drawn");
    expect(sky).toHaveBeenCalledWith("mesh", "frame");
  });

  it("touches no other pass", () => {
    const { map } = fakeMap(0);
    const fill = map.painter.drawFunctions.fill;
    skipSkyWhileFlat(map);
    expect(map.painter.drawFunctions.fill).toBe(fill);
  });

  it("changes nothing when the painter has no sky function (another MapLibre release)", () => {
    const renamed = { getPitch: () => 0, painter: { draw: { sky: vi.fn() } } };
    expect(skipSkyWhileFlat(renamed)).toBe(false);
    expect(skipSkyWhileFlat({ getPitch: () => 0 })).toBe(false);
    expect(renamed.painter.draw.sky).not.toHaveBeenCalled();
  });
});
