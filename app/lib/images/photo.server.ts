import { extname } from "node:path";
import exifReader from "exif-reader";
import sharp, { type Metadata } from "sharp";
import { ValidationError } from "~/lib/errors";

/**
 * A field photo made ready to keep: its format read from its bytes (never from its name), turned
 * upright, re-encoded without any metadata (no EXIF, so no GPS position, in what is stored), and a
 * thumbnail. What the camera wrote (position, time, camera) comes back separately for the record,
 * where only roles that may see locations read it. Any feature that keeps photos uses this.
 */

/** The largest photo accepted, bytes: a full-resolution phone photo is 3–12 MB. */
export const PHOTO_MAX_BYTES = 20 * 1024 * 1024;
/** The thumbnail's longer side, pixels. */
export const THUMBNAIL_PX = 320;
/** Larger images than this (pixels) are refused before decoding: a decompression bomb guard. */
const MAX_INPUT_PIXELS = 100_000_000;

const FORMATS = {
  jpeg: { extensions: [".jpg", ".jpeg"], contentType: "image/jpeg", extension: "jpg", name: "JPEG" },
  png: { extensions: [".png"], contentType: "image/png", extension: "png", name: "PNG" },
  webp: { extensions: [".webp"], contentType: "image/webp", extension: "webp", name: "WebP" },
} as const;
type PhotoFormat = keyof typeof FORMATS;
const ACCEPTED = "a JPEG, PNG or WebP photo";

export interface CameraData {
  latitude: number | null;
  longitude: number | null;
  takenAt: string | null;
  camera: string | null;
}

export interface PreparedPhoto {
  bytes: Buffer;
  contentType: string;
  /** The stored file's extension, from its format. */
  extension: string;
  widthPx: number;
  heightPx: number;
  thumbnail: Buffer;
  camera: CameraData | null;
}

function refuse(message: string): never {
  throw new ValidationError({ field: "file", message });
}

/** Degrees from EXIF's [degrees, minutes, seconds] and its N/S/E/W reference. */
function degrees(parts: unknown, reference: unknown): number | null {
  if (!Array.isArray(parts) || parts.length !== 3 || !parts.every((part) => typeof part === "number" && Number.isFinite(part))) return null;
  const [whole, minutes, seconds] = parts as number[];
  const value = whole + minutes / 60 + seconds / 3600;
  return reference === "S" || reference === "W" ? -value : value;
}

export function readCameraData(exif: Buffer | undefined): CameraData | null {
  if (!exif) return null;
  let tags: ReturnType<typeof exifReader>;
  try {
    tags = exifReader(exif);
  } catch {
    return null;
  }
  const latitude = degrees(tags.GPSInfo?.GPSLatitude, tags.GPSInfo?.GPSLatitudeRef);
  const longitude = degrees(tags.GPSInfo?.GPSLongitude, tags.GPSInfo?.GPSLongitudeRef);
  const taken = tags.Photo?.DateTimeOriginal ?? tags.Image?.DateTime;
  const camera = [tags.Image?.Make, tags.Image?.Model].filter((part) => typeof part === "string" && part.trim()).join(" ").trim();
  const data: CameraData = {
    latitude: latitude !== null && Math.abs(latitude) <= 90 ? latitude : null,
    longitude: longitude !== null && Math.abs(longitude) <= 180 ? longitude : null,
    // exif-reader reads the camera's local time as if it were UTC: keep it as the camera wrote it, without a zone.
    takenAt: taken instanceof Date && !Number.isNaN(taken.getTime()) ? taken.toISOString().slice(0, 19) : null,
    camera: camera ? camera.slice(0, 120) : null,
  };
  return Object.values(data).some((value) => value !== null) ? data : null;
}

/**
 * Reads, checks and re-encodes a photo. Refuses (ValidationError on `file`) a file that is not an
 * image of an accepted format, or whose name's extension says another format than its bytes.
 */
export async function preparePhoto(input: Buffer, fileName: string): Promise<PreparedPhoto> {
  let metadata: Metadata;
  try {
    metadata = await sharp(input, { limitInputPixels: MAX_INPUT_PIXELS }).metadata();
  } catch {
    refuse(`"${fileName}" is not an image Firmsand can read; send ${ACCEPTED}.`);
  }
  const format = metadata.format as string | undefined;
  if (!format || !(format in FORMATS)) refuse(`"${fileName}" is ${format ? `a ${format.toUpperCase()} image` : "not an image Firmsand can read"}; send ${ACCEPTED}.`);
  const kind = FORMATS[format as PhotoFormat];
  const extension = extname(fileName).toLowerCase();
  if (!(kind.extensions as readonly string[]).includes(extension)) {
    refuse(`"${fileName}" holds a ${kind.name} image, but its name ends in "${extension || "(nothing)"}"; rename it to ${kind.extensions[0]} and send it again.`);
  }
  try {
    // rotate() turns the image upright from the EXIF orientation before the metadata goes; without
    // withMetadata() sharp writes none, so the stored copy carries no position.
    const upright = sharp(input, { limitInputPixels: MAX_INPUT_PIXELS }).rotate();
    const encoded = format === "jpeg" ? upright.jpeg({ quality: 90, mozjpeg: true }) : format === "png" ? upright.png() : upright.webp({ quality: 90 });
    const { data: bytes, info } = await encoded.toBuffer({ resolveWithObject: true });
    const thumbnail = await sharp(bytes).resize(THUMBNAIL_PX, THUMBNAIL_PX, { fit: "inside", withoutEnlargement: true }).jpeg({ quality: 80 }).toBuffer();
    return { bytes, contentType: kind.contentType, extension: kind.extension, widthPx: info.width, heightPx: info.height, thumbnail, camera: readCameraData(metadata.exif) };
  } catch {
    refuse(`"${fileName}" could not be decoded to its end; it may be damaged. Send ${ACCEPTED}.`);
  }
}
