import { formatAzimuth } from "@/lib/engine/plane";

export function metres(value: number | null | undefined, digits?: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const places = digits ?? (Math.abs(value) >= 100 ? 0 : Math.abs(value) >= 10 ? 1 : 2);
  return `${value.toLocaleString("en", { minimumFractionDigits: places, maximumFractionDigits: places })} m`;
}


/** An angle such as a dip, one decimal. */
export function degrees(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return `${value.toFixed(1)}°`;
}

/** A compass direction (strike, dip direction, SHmax) in [0, 360): due north prints 0.0°, never 360.0°. */
export function azimuth(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return `${formatAzimuth(value, digits)}°`;
}

export function plain(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return value.toFixed(digits);
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
