export function metres(value: number | null | undefined, digits?: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const places = digits ?? (Math.abs(value) >= 100 ? 0 : Math.abs(value) >= 10 ? 1 : 2);
  return `${value.toLocaleString("en", { minimumFractionDigits: places, maximumFractionDigits: places })} m`;
}

export function degrees(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return `${value.toFixed(1)}°`;
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
