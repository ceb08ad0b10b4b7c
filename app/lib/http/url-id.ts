import { z } from "zod";

/**
 * A record id as a URL carries it: decimal digits only, no sign, point, space, leading zero or
 * `0x` (Number() would read `0x1`, `1.0` and ` 1` as 1, so one record would answer at many URLs).
 */
export const urlIdSchema = z.union([
  z.number().int().positive().max(Number.MAX_SAFE_INTEGER),
  z.string().regex(/^[1-9][0-9]{0,14}$/).transform(Number),
]);
