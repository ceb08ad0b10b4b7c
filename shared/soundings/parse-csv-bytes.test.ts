import { describe, expect, it } from "vitest";
import { createSoundingCsvParser, parseSoundingsCsv, parseSoundingsCsvBytes, type ParsedSoundings, type SoundingCsvOptions } from "./parse-csv";

// computed: the byte reader must give exactly what the text reader gives (which the tests of
// parse-csv.test.ts hold to practice): every column value bit for bit (Object.is: −0 and NaN
// included), the same rows, row numbers and error messages, whole or in pieces cut anywhere.

const encoder = new TextEncoder();

function comparable(parsed: ParsedSoundings) {
  const bits = (column: Float64Array | null) => (column === null ? null : Array.from(column, (value) => (Object.is(value, -0) ? "-0" : Number.isNaN(value) ? "NaN" : value)));
  return {
    easting: bits(parsed.easting),
    northing: bits(parsed.northing),
    depth: bits(parsed.depth),
    probe: bits(parsed.probe),
    elevation: bits(parsed.elevation),
    time: parsed.time,
    id: parsed.id,
    sourceRow: Array.from(parsed.sourceRow),
    errors: parsed.errors,
    rowCount: parsed.rowCount,
    delimiter: parsed.delimiter,
  };
}

function inPieces(bytes: Uint8Array, cuts: number[], options?: SoundingCsvOptions) {
  const parser = createSoundingCsvParser(options);
  let from = 0;
  for (const cut of [...cuts, bytes.length]) {
    parser.pushBytes(bytes.subarray(from, cut));
    from = cut;
  }
  return parser.end();
}

const files: Array<[string, string, SoundingCsvOptions?]> = [
  ["plain, with an empty probe", "Easting,NORTHING,Depth,Probe_Depth\n100.5,200,3.2,5.1\n101,201,3.4,\n"],
  ["semicolons with decimal commas, CRLF and a byte-order mark", "\uFEFFx;y;water_depth\r\n1,5;2,25;3,75\r\n-0,0;+2;4\r\n"],
  ["tabs", "x\ty\tdepth\n1\t2\t3\n"],
  ["a sep= line", "sep=;\nx;y;depth\n1;2;3\n"],
  ["no final line break", "easting,northing,depth\n1,2,3\n4,5,6"],
  ["blank lines and lines of delimiters", "easting,northing,depth\n\n1,2,3\n,,\n\r\n4,5,6\n"],
  ["errors of every rule", "easting,northing,depth,probe\nabc,2,3,4\n1,,3,4\n1,2,-3,4\n1,2,3,-4\n1,2,5,4\n1,2\n1;2;3;4\n1,2,3,4,extra\n"],
  ["spaces, exponents, long numbers and odd forms", "easting,northing,depth\n 1 ,2,3\n1e3,2E-2,3\n12345678901234567,0.1234567890123456789,3\n.5,5.,+.25\n.,1,2\n+,1,2\n1.2.3,1,2\n-0,-0.000,0\n"],
  ["quotes part-way (a quoted delimiter and a quoted line break)", "easting,northing,depth,id\n1,2,3,a\n\"4\",5,6,\"b,c\"\n7,8,9,\"d\ne\"\n10,11,12,f\n"],
  ["a quoted header", "\"easting\",\"northing\",\"depth\"\n1,2,3\n"],
  ["time and id columns with UTF-8", "time,easting,northing,depth,id,elevation\n08:00, 1,2,3,Südufer – 1,\n08:01,4,5,,Ω2,-2.5\n08:02,7,8,,,\n"],
  ["elevation only", "easting,northing,elevation\n1,2,-3.5\n4,5,\n"],
  ["a mapping", "E,N,D,P\n1,2,3,4\n5,6,7,x\n", { columns: { easting: "E", northing: "N", depth: "D", probe: "P" } }],
  ["a missing mapped column", "E,N,D\n1,2,3\n", { columns: { easting: "E", northing: "N", depth: "X" } }],
  ["missing columns", "a,b,c\n1,2,3\n"],
  ["empty", ""],
  ["header only", "easting,northing,depth"],
  ["a forced delimiter", "easting|northing|depth\n1|2|3,5\n", { delimiter: "|" }],
];

describe("parseSoundingsCsvBytes", () => {
  for (const [name, text, options] of files) {
    it(`reads ${name} as the text reader does, whole and cut anywhere`, () => {
      const expected = comparable(parseSoundingsCsv(text, options));
      const bytes = encoder.encode(text);
      expect(comparable(parseSoundingsCsvBytes(bytes, options))).toEqual(expected);
      for (let cut = 1; cut < bytes.length; cut++) expect(comparable(inPieces(bytes, [cut], options))).toEqual(expected);
      expect(comparable(inPieces(bytes, Array.from({ length: bytes.length }, (_, index) => index), options))).toEqual(expected);
    });
  }

  it("reads each line of a file with mixed line ends (the text reader's result depends on where its pieces fall)", () => {
    const parsed = parseSoundingsCsvBytes(encoder.encode("easting,northing,depth\r\n1,2,3\n4,5,6\r\n"));
    expect(parsed.errors).toEqual([]);
    expect(Array.from(parsed.depth)).toEqual([3, 6]);
    expect(Array.from(parsed.sourceRow)).toEqual([2, 3]);
  });

  it("reads seeded random numbers bit for bit as Number() does", () => {
    let state = 20310402;
    const random = () => {
      state = (Math.imul(state, 1103515245) + 12345) >>> 0;
      return state / 2 ** 32;
    };
    const rows = ["easting,northing,depth,probe"];
    for (let row = 0; row < 20_000; row++) {
      const scale = 10 ** Math.floor(random() * 12 - 3);
      const decimals = Math.floor(random() * 9);
      const cell = () => (random() * scale * (random() < 0.1 ? -1 : 1)).toFixed(decimals);
      const depth = (random() * 20).toFixed(decimals);
      // Every 97th probe is shallower than its depth: the message path is exercised too.
      const probe = Number(depth) + (row % 97 === 0 ? -1 : random() * 5);
      rows.push(`${cell()},${cell()},${depth},${probe.toFixed(decimals)}`);
    }
    const text = rows.join("\n") + "\n";
    const expected = comparable(parseSoundingsCsv(text));
    expect(expected.errors.length).toBeGreaterThan(100);
    expect(comparable(parseSoundingsCsvBytes(encoder.encode(text)))).toEqual(expected);
    expect(comparable(inPieces(encoder.encode(text), [7, 65_536, 100_003]))).toEqual(expected);
  });
});
