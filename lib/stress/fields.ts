// Turns the screen's per-node arrays (base64 little-endian Float32 from the result route) into the 3D view's
// colour fields. Pure; runs in the browser.
import type { ScalarField } from "@/lib/contracts/display";

export interface StressFieldPayload {
  segments: { segmentId: string; columns: number; rows: number; slip: string; dilation: string; dp: string }[];
  ranges: { slip: [number, number]; dilation: [number, number]; dp: [number, number] };
}

export const STRESS_FIELD_KEYS = { slip: "stress:slip", dilation: "stress:dilation", dp: "stress:dp" } as const;

export function decodeFloat32(base64: string): Float32Array {
  const binary = atob(base64);
  const bytes = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
  return new Float32Array(bytes.buffer, 0, Math.floor(bytes.length / 4));
}

export function stressFields(payload: StressFieldPayload, friction: { low: number; high: number }): ScalarField[] {
  const bySegment = (key: "slip" | "dilation" | "dp") =>
    Object.fromEntries(payload.segments.map((segment) => [segment.segmentId, decodeFloat32(segment[key])]));
  return [
    { key: STRESS_FIELD_KEYS.slip, label: "Slip tendency τ/σn′", unit: "ratio", bySegment: bySegment("slip"), range: payload.ranges.slip },
    { key: STRESS_FIELD_KEYS.dilation, label: "Dilation tendency", unit: "0–1", bySegment: bySegment("dilation"), range: payload.ranges.dilation },
    {
      key: STRESS_FIELD_KEYS.dp,
      label: `ΔP to failure, more critical of μ ${friction.low}–${friction.high}`,
      unit: "MPa",
      bySegment: bySegment("dp"),
      range: payload.ranges.dp,
      reversed: true,
    },
  ];
}
