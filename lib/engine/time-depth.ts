// Depth conversion of two-way time (TWT, ms) for picks and cut-off lines. Depth is measured down from the seismic
// datum (time zero), taken as elevation 0 m; elevation z = −depth.
//
// Linear velocity: the instantaneous velocity grows linearly with depth, v(z) = v0 + k·z. Integrating the one-way
// time τ = ∫ dz / (v0 + k z) gives τ = ln(1 + k z / v0) / k, so with τ = TWT / 2:
//   z = (v0 / k) · (exp(k · TWT / 2) − 1),   and z → v0 · TWT / 2 as k → 0.
// The linear-gradient ("v0 + kz") function and this closed form are textbook seismic practice (Sheriff & Geldart 1995,
// Exploration Seismology, 2nd ed., the linear increase of velocity with depth).
//
// Interval velocities by horizon ("layer cake"): each horizon closes an interval that starts at the horizon above
// it (the first at the datum) and has one velocity; a sample's depth is the sum of each interval's velocity times
// its one-way time thickness at the sample's place along strike.

export interface LinearVelocityModel {
  kind: "linear";
  /** velocity at the datum, m/s */
  v0MPerS: number;
  /** velocity gradient with depth, 1/s (m/s per m) */
  kPerS: number;
}

export interface IntervalVelocityModel {
  kind: "intervals";
  /** shallow to deep: the interval above each horizon (from the horizon before it, or the datum) and its velocity */
  intervals: { horizon: string; velocityMPerS: number }[];
}

export type VelocityModel = LinearVelocityModel | IntervalVelocityModel;

/** Limits shared by every edge that takes a model (forms, the command line). */
export const VELOCITY_LIMITS = { minMPerS: 100, maxMPerS: 10_000, maxGradientPerS: 5 } as const;

/** Depth below the datum (m, positive down) of a two-way time (ms) under v(z) = v0 + k·z. */
export function depthFromTwtLinear(twtMs: number, v0MPerS: number, kPerS: number): number {
  const oneWayS = twtMs / 2000;
  if (Math.abs(kPerS) < 1e-12) return v0MPerS * oneWayS;
  // expm1 keeps full precision when k·τ is small
  return (v0MPerS / kPerS) * Math.expm1(kPerS * oneWayS);
}

/** Two-way time (ms) to a depth below the datum (m) under v(z) = v0 + k·z: TWT = 2 ln(1 + k z / v0) / k. */
export function twtFromDepthLinear(depthM: number, v0MPerS: number, kPerS: number): number {
  if (Math.abs(kPerS) < 1e-12) return (2000 * depthM) / v0MPerS;
  return (2000 * Math.log1p((kPerS * depthM) / v0MPerS)) / kPerS;
}

/** Interval velocity (m/s) between two depths under v(z) = v0 + k·z: thickness over one-way time. */
export function intervalVelocityLinear(topDepthM: number, baseDepthM: number, v0MPerS: number, kPerS: number): number {
  const oneWayS = (twtFromDepthLinear(baseDepthM, v0MPerS, kPerS) - twtFromDepthLinear(topDepthM, v0MPerS, kPerS)) / 2000;
  return (baseDepthM - topDepthM) / oneWayS;
}

/**
 * Depth (m, positive down) of a sample on horizon `horizonTimesMs.length − 1` under interval velocities: `horizonTimesMs`
 * are the two-way times (ms) of the horizons from the shallowest down to the sample's own horizon at the sample's place
 * (the last one is the sample's own time), `velocitiesMPerS` the interval velocity above each. An interval whose base
 * time is above its top (horizons crossing in time) counts as zero thickness; `pinched` tells how many did.
 */
export function depthFromTwtIntervals(horizonTimesMs: ArrayLike<number>, velocitiesMPerS: ArrayLike<number>): { depthM: number; pinched: number } {
  let depthM = 0;
  let topMs = 0;
  let pinched = 0;
  for (let i = 0; i < horizonTimesMs.length; i++) {
    const baseMs = horizonTimesMs[i];
    if (!Number.isFinite(baseMs)) return { depthM: NaN, pinched };
    const thicknessMs = baseMs - topMs;
    if (thicknessMs < 0) pinched++;
    else depthM += (velocitiesMPerS[i] * thicknessMs) / 2000;
    topMs = Math.max(topMs, baseMs);
  }
  return { depthM, pinched };
}

/** A model in words and symbols, with its source, as the fault sheet and the command line state it. */
export function describeVelocityModel(model: VelocityModel): string {
  if (model.kind === "linear") {
    return `linear velocity v(z) = v0 + k·z with v0 = ${round(model.v0MPerS)} m/s and k = ${round(model.kPerS)} 1/s (closed-form time–depth relation; Sheriff & Geldart 1995)`;
  }
  return `interval velocities by horizon: ${model.intervals.map((interval) => `${round(interval.velocityMPerS)} m/s above ${interval.horizon}`).join(", ")}`;
}

const round = (value: number) => Number(value.toPrecision(6)).toString();

/** Problems of a model's numbers, in words naming the value; empty when it can be used. */
export function velocityModelProblems(model: VelocityModel): string[] {
  const problems: string[] = [];
  const velocity = (what: string, value: number) => {
    if (!Number.isFinite(value) || value < VELOCITY_LIMITS.minMPerS || value > VELOCITY_LIMITS.maxMPerS) {
      problems.push(`${what} must be between ${VELOCITY_LIMITS.minMPerS} and ${VELOCITY_LIMITS.maxMPerS.toLocaleString("en")} m/s (got ${value})`);
    }
  };
  if (model.kind === "linear") {
    velocity("v0", model.v0MPerS);
    if (!Number.isFinite(model.kPerS) || Math.abs(model.kPerS) > VELOCITY_LIMITS.maxGradientPerS)
      problems.push(`k must be between −${VELOCITY_LIMITS.maxGradientPerS} and ${VELOCITY_LIMITS.maxGradientPerS} 1/s (got ${model.kPerS})`);
    return problems;
  }
  if (model.intervals.length === 0) problems.push("give at least one horizon with its interval velocity");
  const seen = new Set<string>();
  for (const interval of model.intervals) {
    if (!interval.horizon.trim()) problems.push("every interval needs the name of the horizon at its base");
    if (seen.has(interval.horizon)) problems.push(`horizon "${interval.horizon}" is listed twice`);
    seen.add(interval.horizon);
    velocity(`the velocity above ${interval.horizon}`, interval.velocityMPerS);
  }
  return problems;
}

/**
 * Reads the command line's `--velocity` text: "v0=1800,k=0.6" (linear) or "H1=2000,H2=2400,…" (interval velocities,
 * shallow to deep, each the velocity above that horizon). Throws an Error naming what is wrong.
 */
export function parseVelocityText(text: string): VelocityModel {
  const pairs = text
    .split(",")
    .map((part) => part.trim())
    .filter(Boolean)
    .map((part) => {
      const at = part.lastIndexOf("=");
      if (at <= 0) throw new Error(`"${part}" is not NAME=VALUE`);
      const value = Number(part.slice(at + 1).trim());
      if (!Number.isFinite(value)) throw new Error(`"${part}" does not end in a number`);
      return [part.slice(0, at).trim(), value] as const;
    });
  if (pairs.length === 0) throw new Error('give "v0=…,k=…" or interval velocities "HORIZON=…,…"');
  const keys = pairs.map(([key]) => key.toLowerCase());
  let model: VelocityModel;
  if (keys.includes("v0") || keys.includes("k")) {
    const v0 = pairs.find(([key]) => key.toLowerCase() === "v0");
    const k = pairs.find(([key]) => key.toLowerCase() === "k");
    if (!v0 || !k || pairs.length !== 2) throw new Error('a linear velocity model is "v0=<m/s>,k=<1/s>", both and nothing else');
    model = { kind: "linear", v0MPerS: v0[1], kPerS: k[1] };
  } else model = { kind: "intervals", intervals: pairs.map(([horizon, velocityMPerS]) => ({ horizon, velocityMPerS })) };
  const problems = velocityModelProblems(model);
  if (problems.length) throw new Error(problems.join("; "));
  return model;
}

/** The depth-conversion caution shown wherever throws come from times. */
export const DEPTH_CONVERSION_CAUTION =
  "Depth conversion is a major uncertainty in throw: the velocity model sets every depth, velocities often differ across the fault, and a few per cent of velocity error moves a cut-off by tens of metres at reservoir depth. Throws, heaves and dips here are in depth, converted with the model stated; check them against well ties.";
