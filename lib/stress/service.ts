import "server-only";
// Stress states (versioned, per fault or study-wide) and the reactivation screen of a fault's latest analysis.
import { and, desc, eq, isNull, max } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, analysisOutputs, base64Bytes, pickSets, stressStates, users } from "@/db/schema";
import { ApiError } from "@/lib/api/errors";
import { recordAudit } from "@/lib/audit";
import { latestAnalysisForFault } from "@/lib/analysis/reports";
import { decodeFaultDisplay } from "@/lib/display/payload";
import type { AnalysisReport } from "@/lib/engine/types";
import { screenFaultOffThread } from "@/lib/analysis/worker-pool";
import type { GridSpec } from "@/lib/display/grid-sampler";
import type { StressStateInput, StressStateView } from "@/lib/contracts/stress";
import type { FaultScreenResult } from "./screen-compute";
import type { TriangleScreen } from "./surface";
import { evenSubsample, summarizeScreen } from "./summary";
import type { OrientationBasis, ScreenSummary } from "@/lib/contracts/stress";

async function listStates(studyId: string, faultId: string | null): Promise<StressStateView[]> {
  const db = await getDb();
  const rows = await db
    .select({ state: stressStates, userName: users.name, userEmail: users.email })
    .from(stressStates)
    .leftJoin(users, eq(users.id, stressStates.setBy))
    .where(and(eq(stressStates.studyId, studyId), faultId ? eq(stressStates.faultId, faultId) : isNull(stressStates.faultId)))
    .orderBy(desc(stressStates.version));
  return rows.map(({ state, userName, userEmail }) => ({
    id: state.id,
    version: state.version,
    scope: state.faultId ? "fault" : "study",
    parameters: state.parameters,
    source: state.source,
    setBy: state.setBy ? { id: state.setBy, name: userName ?? "", email: userEmail ?? "" } : null,
    createdAt: state.createdAt.toISOString(),
  }));
}

/** The state that applies to a fault (its own latest version, else the study default) and both version lists. */
export async function stressStateForFault(studyId: string, faultId: string) {
  const [faultVersions, studyVersions] = await Promise.all([listStates(studyId, faultId), listStates(studyId, null)]);
  const current = faultVersions[0] ?? studyVersions[0] ?? null;
  return { current, faultVersions, studyVersions };
}

/** Saves a new version (never overwrites) for the fault, or for the whole study when `studyWide`. */
export async function saveStressState(access: { studyId: string; faultId: string; userId: string }, input: StressStateInput) {
  const db = await getDb();
  const faultId = input.studyWide ? null : access.faultId;
  const saved = await db.transaction(async (tx) => {
    const [{ latest }] = await tx
      .select({ latest: max(stressStates.version) })
      .from(stressStates)
      .where(and(eq(stressStates.studyId, access.studyId), faultId ? eq(stressStates.faultId, faultId) : isNull(stressStates.faultId)));
    const [row] = await tx
      .insert(stressStates)
      .values({ studyId: access.studyId, faultId, version: (latest ?? 0) + 1, parameters: input.parameters, source: input.source, setBy: access.userId })
      .returning();
    return row;
  });
  await recordAudit({
    studyId: access.studyId,
    userId: access.userId,
    action: "stress.set",
    target: faultId ?? `study:${access.studyId}`,
    details: { version: saved.version, regime: input.parameters.regime },
  });
  return saved;
}

export interface FaultScreen extends FaultScreenResult {
  analysisId: string;
  pickSetVersion: number;
  state: StressStateView;
}

/**
 * Screens the fault surface of the latest finished analysis under the stress state that applies to it: every
 * triangle of the picks is an area element whose orientation and depth come from the surface smoothed at
 * `lengthScaleM` (default from the pick spacing; lib/stress/surface.ts). The triangles are the analysis' own, stored
 * with it (analysis_outputs); the screen itself runs in the worker pool, off the web server's thread.
 */
export async function screenFault(studyId: string, faultId: string, lengthScaleM: number | null = null): Promise<FaultScreen> {
  const { current } = await stressStateForFault(studyId, faultId);
  if (!current) throw new ApiError(404, "No stress state is set for this fault or its study yet.");
  const latest = await latestAnalysisForFault(faultId);
  if (!latest) throw new ApiError(404, "This fault has no analysis yet; upload picks first.");
  if (latest.status !== "done") throw new ApiError(409, `The latest analysis is ${latest.status}; the screen runs once it is done.`);
  const db = await getDb();
  const [row] = await db
    .select({ picks: base64Bytes(pickSets.picks), display: base64Bytes(analyses.display), outputs: base64Bytes(analysisOutputs.body) })
    .from(analyses)
    .innerJoin(pickSets, eq(pickSets.id, analyses.pickSetId))
    .leftJoin(analysisOutputs, eq(analysisOutputs.analysisId, analyses.id))
    .where(eq(analyses.id, latest.id));
  if (!row?.display) throw new ApiError(404, "No display data for the latest analysis yet.");
  const report = latest.result as AnalysisReport;
  const display = decodeFaultDisplay(row.display);
  const grids: Record<string, GridSpec> = {};
  for (const { id, grid } of display.segments) grids[id] = { s0: grid.s0, t0: grid.t0, cellM: grid.cellM, columns: grid.columns, rows: grid.rows };
  const screen = await screenFaultOffThread({
    output: "stress",
    picks: row.picks,
    outputs: row.outputs ?? null,
    segments: report.segments.map(({ id, plane }) => ({ id, plane })),
    grids,
    parameters: current.parameters,
    lengthScaleM,
  });
  return { analysisId: latest.id, pickSetVersion: latest.version, state: current, ...screen };
}

const base64 = (array: Float32Array) => Buffer.from(array.buffer, array.byteOffset, array.byteLength).toString("base64");
const MOHR_POINTS = 20_000;

export interface StressResultPayload {
  analysisId: string;
  pickSetVersion: number;
  state: StressStateView;
  orientation: OrientationBasis;
  summary: ScreenSummary;
  skipped: { degenerate: number; aboveDatum: number };
  /** per segment, base64 little-endian Float32 arrays, one value per display-grid node (NaN: no triangle) */
  segments: { segmentId: string; columns: number; rows: number; slip: string; dilation: string; dp: string }[];
  ranges: { slip: [number, number]; dilation: [number, number]; dp: [number, number] };
  /** deterministic subsample of the triangles for the Mohr plot */
  mohr: { total: number; effectiveNormalMPa: number[]; shearMPa: number[]; depthM: number[] };
}

export async function stressResult(
  studyId: string,
  faultId: string,
  thresholdsMPa: number[],
  lengthScaleM: number | null = null,
): Promise<StressResultPayload> {
  const result = await screenFault(studyId, faultId, lengthScaleM);
  const { combined } = result;
  const summary = summarizeScreen(combined, result.state.parameters, thresholdsMPa);
  const pick = evenSubsample(combined.count, MOHR_POINTS);
  const round = (x: number) => (Number.isFinite(x) ? Math.round(x * 1000) / 1000 : null);
  return {
    analysisId: result.analysisId,
    pickSetVersion: result.pickSetVersion,
    state: result.state,
    orientation: result.orientation,
    summary,
    skipped: { degenerate: combined.skippedDegenerate, aboveDatum: combined.skippedAboveDatum },
    segments: result.segments.map(({ segmentId, nodes }) => ({
      segmentId,
      columns: nodes.columns,
      rows: nodes.rows,
      slip: base64(nodes.slip),
      dilation: base64(nodes.dilation),
      dp: base64(nodes.dp),
    })),
    ranges: {
      slip: [0, Math.max(result.state.parameters.frictionHigh, finiteMax(combined.slipTendency))],
      dilation: [0, 1],
      dp: [Math.min(0, finiteMin(combined.pressureToFailureCriticalMPa)), Math.max(1, finiteMax(combined.pressureToFailureCriticalMPa))],
    },
    mohr: {
      total: combined.count,
      effectiveNormalMPa: Array.from(pick, (i) => round(combined.effectiveNormalMPa[i]) ?? 0),
      shearMPa: Array.from(pick, (i) => round(combined.shearMPa[i]) ?? 0),
      depthM: Array.from(pick, (i) => Math.round(combined.depthM[i])),
    },
  };
}

function finiteMax(values: ArrayLike<number>) {
  let m = -Infinity;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i]) && values[i] > m) m = values[i];
  return Number.isFinite(m) ? m : 0;
}
function finiteMin(values: ArrayLike<number>) {
  let m = Infinity;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i]) && values[i] < m) m = values[i];
  return Number.isFinite(m) ? m : 0;
}

export const EXPORT_COLUMNS = [
  "segment",
  "centroid_x_m",
  "centroid_y_m",
  "centroid_z_m",
  "normal_x",
  "normal_y",
  "normal_z",
  "area_m2",
  "depth_m",
  "sigma_n_mpa",
  "tau_mpa",
  "pore_pressure_mpa",
  "sigma_n_eff_mpa",
  "slip_tendency",
  "dilation_tendency",
  "dp_failure_mu_low_mpa",
  "dp_failure_mu_high_mpa",
  "dp_failure_critical_mpa",
  "dp_failure_critical_min_mpa",
  "dp_failure_critical_max_mpa",
  "orientation_uncertainty_deg",
] as const;

function rowValues(screen: TriangleScreen, i: number): number[] {
  return [
    screen.centroidX[i],
    screen.centroidY[i],
    screen.centroidZ[i],
    screen.normalX[i],
    screen.normalY[i],
    screen.normalZ[i],
    screen.areaM2[i],
    screen.depthM[i],
    screen.normalMPa[i],
    screen.shearMPa[i],
    screen.porePressureMPa[i],
    screen.effectiveNormalMPa[i],
    screen.slipTendency[i],
    screen.dilationTendency[i],
    screen.pressureToFailureLowMPa[i],
    screen.pressureToFailureHighMPa[i],
    screen.pressureToFailureCriticalMPa[i],
    screen.pressureToFailureMinMPa[i],
    screen.pressureToFailureMaxMPa[i],
    screen.orientationUncertaintyDeg[i],
  ];
}

const cell = (x: number, digits: number) => (Number.isFinite(x) ? x.toFixed(digits) : "");
const DIGITS = [3, 3, 3, 6, 6, 6, 1, 1, 4, 4, 4, 4, 5, 5, 4, 4, 4, 4, 4, 3];
const csvText = (text: string) => (/[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text);

export async function stressExport(
  studyId: string,
  faultId: string,
  format: "csv" | "geojson",
  lengthScaleM: number | null = null,
): Promise<{ body: string; contentType: string; fileName: string }> {
  const result = await screenFault(studyId, faultId, lengthScaleM);
  const p = result.state.parameters;
  const stem = `reactivation-screen-v${result.state.version}`;
  if (format === "csv") {
    const comment = `# Screening only, not a site-specific assessment. Stress state ${result.state.scope} v${result.state.version} (${p.regime}; Sv ${p.verticalGradient}, SHmax ${p.maxHorizontalGradient} at ${p.maxHorizontalAzimuthDeg} deg, Shmin ${p.minHorizontalGradient}, Pp ${p.porePressureGradient} MPa/km; mu ${p.frictionLow}-${p.frictionHigh}; C ${p.cohesionMPa} MPa); pick set v${result.pickSetVersion}; orientation from the surface smoothed at ${result.orientation.lengthScaleM} m, ranges over +-${result.orientation.rangeStandardErrors} standard errors of it`;
    const lines = [comment, EXPORT_COLUMNS.join(",")];
    for (const { segmentId, screen } of result.segments) {
      for (let i = 0; i < screen.count; i++) lines.push([csvText(segmentId), ...rowValues(screen, i).map((v, k) => cell(v, DIGITS[k]))].join(","));
    }
    return { body: lines.join("\n") + "\n", contentType: "text/csv; charset=utf-8", fileName: `${stem}.csv` };
  }
  const { x, y, z } = result.vertices;
  const corner = (v: number) => [round3(x[v]), round3(y[v]), round3(z[v])];
  const features = result.segments.flatMap(({ segmentId, screen, triangleVertices }) =>
    Array.from({ length: screen.count }, (_, i) => {
      const [pa, pb, pc] = [corner(triangleVertices[3 * i]), corner(triangleVertices[3 * i + 1]), corner(triangleVertices[3 * i + 2])];
      // RFC 7946: exterior rings counter-clockwise as seen from above
      const ccw = (pb[0] - pa[0]) * (pc[1] - pa[1]) - (pb[1] - pa[1]) * (pc[0] - pa[0]) >= 0;
      const values = rowValues(screen, i);
      const properties: Record<string, string | number | null> = { segment: segmentId };
      EXPORT_COLUMNS.slice(1).forEach((name, k) => {
        properties[name] = Number.isFinite(values[k]) ? Number(values[k].toFixed(DIGITS[k])) : null;
      });
      return { type: "Feature", geometry: { type: "Polygon", coordinates: [ccw ? [pa, pb, pc, pa] : [pa, pc, pb, pa]] }, properties };
    }),
  );
  return {
    body: JSON.stringify({
      type: "FeatureCollection",
      screening: {
        caution: "Screening only: not a site-specific engineering, safety or regulatory assessment.",
        stressStateVersion: result.state.version,
        parameters: p,
        orientation: result.orientation,
      },
      features,
    }),
    contentType: "application/geo+json",
    fileName: `${stem}.geojson`,
  };
}

const round3 = (x: number) => Math.round(x * 1000) / 1000;
