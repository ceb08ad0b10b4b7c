import { resolve } from "node:path";
import { z } from "zod";

// Upload settings, parsed once with zod. UPLOAD_DIR is where staged sounding files wait between
// upload and commit (default .data/uploads, git-ignored).
const schema = z.object({
  UPLOAD_DIR: z.string().min(1).default(resolve(process.cwd(), ".data", "uploads")),
  /** Largest sounding file accepted, bytes (200 MB). */
  UPLOAD_MAX_BYTES: z.coerce.number().int().positive().default(200 * 1024 * 1024),
});

let parsed: z.infer<typeof schema> | undefined;

export function uploadSettings() {
  parsed ??= schema.parse(process.env);
  return parsed;
}
