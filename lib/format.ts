// Numbers and angles as the screens write them (units, signs, rounding): pure, used by components, the scene and exports.
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
  "walsh-watterson-1987": "tapered profile (Walsh & Watterson 1987)",
  // reports made before engine 2.0 used this name for the same profile
  "walsh-watterson-1989": "tapered profile (Walsh & Watterson 1987)",
  "elliptical-crack": "elliptical crack (Pollard & Segall 1987)",
  linear: "linear taper (Muraoka & Kamata 1983; Dawers et al. 1993)",
  parabolic: "parabolic profile",
  "flat-topped": "flat-topped with steep tips (Nicol et al. 1996)",
  flexible: "flexible profile (1 − r^p)^q",
};

/** A central value with its 5–95 % range, "2,510 m (2,440–2,580 m)"; an open upper end reads as a minimum. */
export function metresWithRange(value: number, range: [number | null, number | null] | undefined, digits?: number): string {
  if (!range) return metres(value, digits);
  if (range[1] === null) return `≥ ${metres(value, digits)} (open end)`;
  const strip = (text: string) => text.replace(/ m$/, "");
  return `${metres(value, digits)} (${strip(metres(range[0], digits))}–${metres(range[1], digits)})`;
}

const SIDE_NAMES: Record<string, string> = { "strike-start": "strike start", "strike-end": "strike end", "up-dip": "up dip", "down-dip": "down dip" };
/** "strike start inferred, strike end open (set by the interpreter), …" */
export function endsSentence(ends: { side: string; status: string; source: string }[]): string {
  return ends.map((end) => `${SIDE_NAMES[end.side] ?? end.side} ${end.status}${end.source === "set" ? " (set)" : ""}`).join(", ");
}
