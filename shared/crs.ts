import proj4, { type Converter } from "proj4";

/**
 * A project's coordinate reference system: projected (or geographic) coordinates in the
 * project's unit on one side, WGS 84 lon/lat (RFC 7946, for the map) on the other.
 * The proj4 converter is built once here and reused for every point.
 */
export interface Crs {
  definition: string;
  isGeographic: boolean;
  toLonLat(easting: number, northing: number): [number, number];
  fromLonLat(lon: number, lat: number): [number, number];
  /** Interleaved [x0, y0, x1, y1, ...] → interleaved [lon0, lat0, ...]. */
  toLonLatArray(xy: Float64Array): Float64Array<ArrayBuffer>;
  /** Interleaved [lon0, lat0, ...] → interleaved [x0, y0, ...]. */
  fromLonLatArray(lonLat: Float64Array): Float64Array<ArrayBuffer>;
}

const LON_LAT = "+proj=longlat +datum=WGS84 +no_defs";

export function createCrs(proj4Definition: string): Crs {
  const definition = proj4Definition.trim();
  if (!definition.startsWith("+") && !/^(PROJCS|GEOGCS|PROJCRS|GEOGCRS)\[/i.test(definition)) {
    throw new Error(`Not a proj4 or WKT definition: "${definition.slice(0, 60)}"`);
  }
  let converter: Converter;
  let projectionName: string | undefined;
  try {
    converter = proj4(LON_LAT, definition);
    // proj4 names every geographic (lon/lat) system "longlat" internally; its types omit the field.
    projectionName = (new proj4.Proj(definition) as unknown as { projName?: string }).projName;
  } catch (error) {
    throw new Error(`The coordinate reference system cannot be read: ${(error as Error).message}`);
  }
  const isGeographic = projectionName === "longlat";
  const forward = converter.forward.bind(converter);
  const inverse = converter.inverse.bind(converter);
  const point: [number, number] = [0, 0];

  function toLonLat(easting: number, northing: number): [number, number] {
    point[0] = easting;
    point[1] = northing;
    const result = inverse(point) as number[];
    return [result[0], result[1]];
  }

  function fromLonLat(lon: number, lat: number): [number, number] {
    point[0] = lon;
    point[1] = lat;
    const result = forward(point) as number[];
    return [result[0], result[1]];
  }

  function mapArray(input: Float64Array, convert: (p: number[]) => unknown): Float64Array<ArrayBuffer> {
    if (input.length % 2 !== 0) throw new Error("Coordinate array must hold x,y pairs");
    const output = new Float64Array(input.length);
    const scratch = [0, 0];
    for (let i = 0; i < input.length; i += 2) {
      scratch[0] = input[i];
      scratch[1] = input[i + 1];
      const result = convert(scratch) as number[];
      output[i] = result[0];
      output[i + 1] = result[1];
    }
    return output;
  }

  return {
    definition,
    isGeographic,
    toLonLat,
    fromLonLat,
    toLonLatArray: (xy) => mapArray(xy, inverse),
    fromLonLatArray: (lonLat) => mapArray(lonLat, forward),
  };
}
