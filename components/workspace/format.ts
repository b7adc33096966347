import { formatAzimuth } from "@/lib/engine/plane";
/** A value that rounds to zero at `places` decimals loses its sign: "0.00", never "-0.00". */
function unsignedZero(value: number, places: number): number {
  return Math.abs(value) < 0.5 * 10 ** -places ? 0 : value;
}

export function metres(value: number | null | undefined, digits?: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const places = digits ?? (Math.abs(value) >= 100 ? 0 : Math.abs(value) >= 10 ? 1 : 2);
  return `${unsignedZero(value, places).toLocaleString("en", { minimumFractionDigits: places, maximumFractionDigits: places })} m`;
}


/** An angle such as a dip, one decimal. */
export function degrees(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return `${unsignedZero(value, 1).toFixed(1)}°`;
}

/** A compass direction (strike, dip direction, SHmax) in [0, 360): due north prints 0.0°, never 360.0°. */
export function azimuth(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return `${formatAzimuth(value, digits)}°`;
}

export function plain(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return unsignedZero(value, digits).toFixed(digits);
}

/**
 * A label as it reads inside a sentence or a menu: the first letter lower-cased unless the first word is a symbol or
 * an abbreviation ("ΔP to failure", "Dmax", "SHmax" keep their capitals; "Slip tendency" becomes "slip tendency").
 */
export function inSentence(label: string): string {
  const firstWord = label.split(/\s/, 1)[0];
  const keepsCapitals = !/^[A-Za-z]/.test(firstWord) || /^.[A-Z]/.test(firstWord) || /^Dmax/.test(firstWord) || firstWord.length === 1;
  return keepsCapitals ? label : label.charAt(0).toLowerCase() + label.slice(1);
}

export function ratio(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return value < 0.01 ? value.toExponential(2) : value.toFixed(3);
}

export const MODEL_NAMES: Record<string, string> = {
  "walsh-watterson-1989": "Walsh & Watterson (1989) profile",
  "elliptical-crack": "Elliptical crack (Pollard & Segall 1987)",
  linear: "Linear taper",
};
