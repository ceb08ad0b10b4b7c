/**
 * Tells, from a file's first bytes, whether it can be a sounding file at all: a text file, or an
 * image, a PDF, a spreadsheet workbook, an archive or other binary a crew member picked by
 * mistake. A file that is not text is refused before anything reads it as rows, with what it
 * seems to be named in plain words. Pure: bytes in, a description out.
 *
 * The signatures are the formats' own published "magic numbers" (PNG spec §5.2, JFIF, GIF89a,
 * PDF 1.7 §7.5.2, ZIP APPNOTE §4.3.7, the Compound File Binary format, RFC 1952 for gzip).
 */
export interface NotText {
  /** A short name of what the file seems to be ("a PNG image", "an Excel workbook (.xlsx)"). */
  what: string;
  /** What the crew can do instead, in their words. */
  advice: string;
}

const EXPORT_CSV = "Export the soundings from the field software (or save the sheet) as CSV, comma-separated text, and choose that file.";

function startsWith(bytes: Uint8Array, signature: ReadonlyArray<number>, offset = 0): boolean {
  if (bytes.length < offset + signature.length) return false;
  for (let index = 0; index < signature.length; index++) if (bytes[offset + index] !== signature[index]) return false;
  return true;
}

const ascii = (text: string) => Array.from(text, (character) => character.charCodeAt(0));

function containsAscii(bytes: Uint8Array, text: string): boolean {
  const wanted = ascii(text);
  outer: for (let start = 0; start + wanted.length <= bytes.length; start++) {
    for (let index = 0; index < wanted.length; index++) if (bytes[start + index] !== wanted[index]) continue outer;
    return true;
  }
  return false;
}

/** What a ZIP container holds, from the names of its first entries (they sit in the local headers, in plain text). */
function zipKind(bytes: Uint8Array): NotText {
  if (containsAscii(bytes, "xl/")) return { what: "an Excel workbook (.xlsx)", advice: `Open it in the spreadsheet program and save the soundings sheet as "CSV (comma delimited)", then choose that file.` };
  if (containsAscii(bytes, "word/")) return { what: "a Word document (.docx)", advice: EXPORT_CSV };
  if (containsAscii(bytes, "ppt/")) return { what: "a PowerPoint file (.pptx)", advice: EXPORT_CSV };
  if (containsAscii(bytes, "application/vnd.oasis.opendocument.spreadsheet")) return { what: "an OpenDocument spreadsheet (.ods)", advice: `Save the soundings sheet as "Text CSV", then choose that file.` };
  if (containsAscii(bytes, "doc.kml")) return { what: "a KMZ map file", advice: EXPORT_CSV };
  return { what: "a ZIP archive", advice: "Unpack it and choose the CSV file inside." };
}

export function describeNonText(bytes: Uint8Array): NotText | null {
  if (bytes.length === 0) return null;
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { what: "a PNG image", advice: EXPORT_CSV };
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return { what: "a JPEG photo", advice: EXPORT_CSV };
  if (startsWith(bytes, ascii("GIF87a")) || startsWith(bytes, ascii("GIF89a"))) return { what: "a GIF image", advice: EXPORT_CSV };
  if (startsWith(bytes, ascii("RIFF")) && startsWith(bytes, ascii("WEBP"), 8)) return { what: "a WebP image", advice: EXPORT_CSV };
  if (startsWith(bytes, [0x49, 0x49, 0x2a, 0x00]) || startsWith(bytes, [0x4d, 0x4d, 0x00, 0x2a])) return { what: "a TIFF image", advice: EXPORT_CSV };
  if (startsWith(bytes, ascii("ftyp"), 4)) return { what: "a photo or video (HEIC/MP4)", advice: EXPORT_CSV };
  if (startsWith(bytes, ascii("%PDF-"))) return { what: "a PDF document", advice: "A PDF cannot be read as soundings. " + EXPORT_CSV };
  if (startsWith(bytes, [0x50, 0x4b, 0x03, 0x04]) || startsWith(bytes, [0x50, 0x4b, 0x05, 0x06])) return zipKind(bytes);
  if (startsWith(bytes, [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1])) return { what: "an older Excel workbook (.xls) or Office document", advice: `Open it in the spreadsheet program and save the soundings sheet as "CSV (comma delimited)", then choose that file.` };
  if (startsWith(bytes, [0x1f, 0x8b])) return { what: "a gzip-compressed file", advice: "Unpack it and choose the CSV file inside." };
  if (startsWith(bytes, ascii("7z")) && startsWith(bytes, [0xbc, 0xaf, 0x27, 0x1c], 2)) return { what: "a 7-Zip archive", advice: "Unpack it and choose the CSV file inside." };
  if (startsWith(bytes, ascii("Rar!"))) return { what: "a RAR archive", advice: "Unpack it and choose the CSV file inside." };
  if (startsWith(bytes, ascii("SQLite format 3"))) return { what: "a SQLite database", advice: EXPORT_CSV };
  if (startsWith(bytes, [0xff, 0xfe]) || startsWith(bytes, [0xfe, 0xff])) {
    return { what: 'text saved as UTF-16 ("Unicode Text")', advice: 'Save it again as "CSV UTF-8 (comma delimited)" and choose that file.' };
  }
  // Any other file: text has no NUL bytes and few control characters besides tab, CR and LF.
  const sample = bytes.subarray(0, 8192);
  let control = 0;
  for (const byte of sample) {
    if (byte === 0) return { what: "a binary file, not text", advice: EXPORT_CSV };
    if (byte < 0x20 && byte !== 0x09 && byte !== 0x0a && byte !== 0x0d && byte !== 0x0c) control++;
  }
  if (control > sample.length / 20) return { what: "a binary file, not text", advice: EXPORT_CSV };
  return null;
}

/** The message a crew member sees when the chosen file is not text. */
export function notTextMessage(fileName: string, kind: NotText): string {
  return `The file you chose, ${fileName}, looks like ${kind.what}, not a CSV text file of soundings. ${kind.advice}`;
}
