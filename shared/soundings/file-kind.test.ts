import { describe, expect, it } from "vitest";
import { describeNonText, notTextMessage } from "./file-kind";

// Signatures from the formats' own specifications (published): PNG §5.2, JFIF, PDF 1.7 §7.5.2,
// ZIP APPNOTE §4.3.7, Compound File Binary, RFC 1952.
const bytes = (...values: number[]) => Uint8Array.from(values);
const text = (value: string) => new TextEncoder().encode(value);

describe("describeNonText", () => {
  it("names images, PDFs, workbooks and archives by their first bytes", () => {
    expect(describeNonText(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0))?.what).toBe("a PNG image");
    expect(describeNonText(bytes(0xff, 0xd8, 0xff, 0xe0))?.what).toBe("a JPEG photo");
    expect(describeNonText(text("%PDF-1.7\n"))?.what).toBe("a PDF document");
    expect(describeNonText(Uint8Array.from([...text("PK\u0003\u0004"), ...new Uint8Array(26), ...text("xl/workbook.xml")]))?.what).toBe("an Excel workbook (.xlsx)");
    expect(describeNonText(Uint8Array.from([...text("PK\u0003\u0004"), ...new Uint8Array(26), ...text("data/soundings.csv")]))?.what).toBe("a ZIP archive");
    expect(describeNonText(bytes(0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1))?.what).toMatch(/older Excel workbook/);
    expect(describeNonText(bytes(0x1f, 0x8b, 8, 0))?.what).toBe("a gzip-compressed file");
    expect(describeNonText(bytes(0xff, 0xfe, 0x65, 0))?.what).toMatch(/UTF-16/);
  });

  it("refuses other bytes with NULs or many control characters, and takes text of any encoding", () => {
    expect(describeNonText(bytes(1, 2, 3, 0, 5))?.what).toBe("a binary file, not text");
    expect(describeNonText(Uint8Array.from({ length: 200 }, (_, index) => (index % 4 === 0 ? 7 : 65)))?.what).toBe("a binary file, not text");
    expect(describeNonText(text("point_id,easting,northing,depth\r\nA,1,2,3\r\n"))).toBeNull();
    expect(describeNonText(Uint8Array.from([...text("note\n"), 0xb0, 0x0a]))).toBeNull(); // Latin-1 "°": text, not binary
    expect(describeNonText(new Uint8Array(0))).toBeNull(); // empty: said elsewhere
  });

  it("says what the file seems to be and what to do, in the crew's words", () => {
    expect(notTextMessage("photo.png", describeNonText(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a))!)).toBe(
      "The file you chose, photo.png, looks like a PNG image, not a CSV text file of soundings. Export the soundings from the field software (or save the sheet) as CSV, comma-separated text, and choose that file.",
    );
  });
});
