// The coordinate reference as text and its input shape, apart from lib/crs.ts so the command line reads --crs without
// loading the projection library unless it is given.

/** What an owner or the command line gives: EPSG codes, or a vertical datum in words. */
export interface CoordinateReferenceInput {
  epsg: number;
  verticalEpsg?: number | null;
  verticalDatum?: string;
}

/** "EPSG:32631+5714", "EPSG:32631" or "32631" as the command line takes it; null when it is not that shape. */
export function parseCrsText(text: string): CoordinateReferenceInput | null {
  const match = /^(?:EPSG:)?(\d+)(?:\+(?:EPSG:)?(\d+))?$/i.exec(text.trim());
  if (!match) return null;
  return { epsg: Number(match[1]), ...(match[2] ? { verticalEpsg: Number(match[2]) } : {}) };
}
