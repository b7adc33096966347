// Stress on a plane. Compression positive (geological convention), MPa; coordinates East-North-Up.
// Pure functions over plain numbers and flat arrays; no I/O.
import type { StressParameters } from "@/lib/contracts/stress";

export type Vec3 = [number, number, number];
/** symmetric 3×3 tensor, row-major: [xx, xy, xz, yx, yy, yz, zx, zy, zz] */
export type Tensor = Float64Array;

export interface PrincipalStresses {
  /** vertical stress Sv, MPa */
  verticalMPa: number;
  /** maximum horizontal stress SHmax, MPa */
  maxHorizontalMPa: number;
  /** minimum horizontal stress Shmin, MPa */
  minHorizontalMPa: number;
  porePressureMPa: number;
}

/** Stresses at a depth (m below datum, positive down) from gradients in MPa/km, zero at the datum (common practice). */
export function stressesAtDepth(
  p: Pick<StressParameters, "verticalGradient" | "maxHorizontalGradient" | "minHorizontalGradient" | "porePressureGradient">,
  depthM: number,
): PrincipalStresses {
  const km = depthM / 1000;
  return {
    verticalMPa: p.verticalGradient * km,
    maxHorizontalMPa: p.maxHorizontalGradient * km,
    minHorizontalMPa: p.minHorizontalGradient * km,
    porePressureMPa: p.porePressureGradient * km,
  };
}

/** Unit vectors (ENU) of SHmax, Shmin and Sv for an SHmax azimuth in degrees clockwise from north. */
export function principalDirections(maxHorizontalAzimuthDeg: number): { maxHorizontal: Vec3; minHorizontal: Vec3; vertical: Vec3 } {
  const a = (maxHorizontalAzimuthDeg * Math.PI) / 180;
  return {
    maxHorizontal: [Math.sin(a), Math.cos(a), 0],
    minHorizontal: [Math.cos(a), -Math.sin(a), 0],
    vertical: [0, 0, 1],
  };
}

/** σ = Σ σi ai aiᵀ (the spectral form; avoids Euler-angle conventions). */
export function tensorFromPrincipal(values: readonly number[], directions: readonly Vec3[]): Tensor {
  const tensor = new Float64Array(9);
  for (let k = 0; k < values.length; k++) {
    const v = directions[k];
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) tensor[3 * i + j] += values[k] * v[i] * v[j];
  }
  return tensor;
}

/** The stress tensor (ENU) at a depth with SHmax at the given azimuth. */
export function stressTensorENU(stresses: PrincipalStresses, maxHorizontalAzimuthDeg: number): Tensor {
  const d = principalDirections(maxHorizontalAzimuthDeg);
  return tensorFromPrincipal([stresses.maxHorizontalMPa, stresses.minHorizontalMPa, stresses.verticalMPa], [d.maxHorizontal, d.minHorizontal, d.vertical]);
}

/** σ1 ≥ σ2 ≥ σ3 of Sv, SHmax, Shmin (the tensor's eigenvalues, since the three are its principal values). */
export function orderedPrincipal(stresses: PrincipalStresses): [number, number, number] {
  const sorted = [stresses.verticalMPa, stresses.maxHorizontalMPa, stresses.minHorizontalMPa].sort((a, b) => b - a);
  return [sorted[0], sorted[1], sorted[2]];
}

export interface PlaneStress {
  traction: Vec3;
  normalMPa: number;
  shearMPa: number;
  /** shear traction vector τ_vec = t − σn n */
  shearVector: Vec3;
}

/** Cauchy: t = σ n, σn = n·t, τ = |t − σn n| (worked values: docs/check-values.md M1). `n` must be a unit vector. */
export function stressOnPlane(tensor: ArrayLike<number>, n: readonly number[]): PlaneStress {
  const tx = tensor[0] * n[0] + tensor[1] * n[1] + tensor[2] * n[2];
  const ty = tensor[3] * n[0] + tensor[4] * n[1] + tensor[5] * n[2];
  const tz = tensor[6] * n[0] + tensor[7] * n[1] + tensor[8] * n[2];
  const normalMPa = tx * n[0] + ty * n[1] + tz * n[2];
  const shearVector: Vec3 = [tx - normalMPa * n[0], ty - normalMPa * n[1], tz - normalMPa * n[2]];
  return { traction: [tx, ty, tz], normalMPa, shearMPa: Math.hypot(...shearVector), shearVector };
}

/** Upward unit normal of a plane from strike (right-hand rule) and dip, degrees: (sinθd sinδ, cosθd sinδ, cosδ). */
export function planeNormal(strikeDeg: number, dipDeg: number): Vec3 {
  const dipDirection = ((strikeDeg + 90) * Math.PI) / 180;
  const dip = (dipDeg * Math.PI) / 180;
  return [Math.sin(dipDirection) * Math.sin(dip), Math.cos(dipDirection) * Math.sin(dip), Math.cos(dip)];
}

/** Slip tendency Ts = τ / σn′ (Morris, Ferrill & Henderson 1996), effective normal stress; NaN when σn′ ≤ 0. */
export function slipTendency(shearMPa: number, effectiveNormalMPa: number): number {
  return effectiveNormalMPa > 0 ? shearMPa / effectiveNormalMPa : NaN;
}

/** Dilation tendency Td = (σ1 − σn)/(σ1 − σ3) (Ferrill et al. 1999); NaN for an isotropic state. */
export function dilationTendency(normalMPa: number, sigma1: number, sigma3: number): number {
  return sigma1 > sigma3 ? (sigma1 - normalMPa) / (sigma1 - sigma3) : NaN;
}

/** Pore-pressure increase to Coulomb failure ΔP = σn′ − (τ − C)/μ (common practice); negative: failure predicted. */
export function pressureToFailure(shearMPa: number, effectiveNormalMPa: number, friction: number, cohesionMPa: number): number {
  return effectiveNormalMPa - (shearMPa - cohesionMPa) / friction;
}

/** Coulomb failure function CFF = τ − μ σn′ − C (common practice); ≥ 0: failure predicted. */
export function coulombFailureFunction(shearMPa: number, effectiveNormalMPa: number, friction: number, cohesionMPa: number): number {
  return shearMPa - friction * effectiveNormalMPa - cohesionMPa;
}

/** Largest effective slip tendency any cohesionless plane can reach: (σ1′ − σ3′)/(2√(σ1′σ3′)) (Mohr-circle tangent). */
export function maxSlipTendency(sigma1Effective: number, sigma3Effective: number): number {
  return sigma3Effective > 0 ? (sigma1Effective - sigma3Effective) / (2 * Math.sqrt(sigma1Effective * sigma3Effective)) : NaN;
}
