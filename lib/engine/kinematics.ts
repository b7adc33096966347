// The fault's type (normal, reverse or oblique with a rake) and what it means for each pick: the rake used to turn
// throw into displacement, and which rows cannot be used. Rake follows Aki & Richards (1980): measured in the fault
// surface from the strike direction, negative for normal slip (hanging wall down), positive for reverse (hanging wall
// up); −90 pure normal, +90 pure reverse, 0 and ±180 pure strike-slip. Throw is a magnitude in the fault's own sense:
// negative throw is offset of the opposite sense, which only an inverted fault is expected to have.
import type { FaultKinematics, FaultSense, KinematicsSummary, PickColumns, RejectedRow } from "./types";

const RAD = Math.PI / 180;

/**
 * Rakes closer than this to pure strike-slip are refused: displacement = throw / (sin dip · |sin rake|) multiplies throw
 * errors by 1/|sin rake|, about 2.9 at 20° (the same bound as the warning on dips under 20°; common practice, no source).
 */
export const STRIKE_SLIP_LIMIT_DEG = 20;

export const FAULT_SENSE_WORDS: Record<FaultSense, string> = { normal: "normal", reverse: "reverse", oblique: "oblique" };

/** The rake a pick without its own takes: the fault's, or pure dip-slip of the fault's sense. */
export function faultRakeDeg(kinematics: FaultKinematics): number {
  if (kinematics.sense === "oblique") return kinematics.rakeDeg ?? NaN;
  if (kinematics.rakeDeg !== undefined && Number.isFinite(kinematics.rakeDeg)) return kinematics.rakeDeg;
  return kinematics.sense === "reverse" ? 90 : -90;
}

/** Why a rake cannot be used (outside −180…180, or too close to strike-slip for throw to constrain slip), or null. */
export function rakeProblem(rakeDeg: number): string | null {
  if (!Number.isFinite(rakeDeg)) return "the rake must be a number of degrees";
  if (rakeDeg < -180 || rakeDeg > 180) return `rake ${rakeDeg}° is outside −180° to 180°`;
  if (Math.abs(Math.sin(rakeDeg * RAD)) < Math.sin(STRIKE_SLIP_LIMIT_DEG * RAD)) {
    return `rake ${rakeDeg}° is within ${STRIKE_SLIP_LIMIT_DEG}° of pure strike-slip: throw cannot constrain the slip there (displacement = throw / (sin dip · |sin rake|) would magnify throw errors more than ${(1 / Math.sin(STRIKE_SLIP_LIMIT_DEG * RAD)).toFixed(1)} times)`;
  }
  return null;
}

/** The sense a rake means: negative normal (hanging wall down), positive reverse (hanging wall up). */
export function senseOfRake(rakeDeg: number): "normal" | "reverse" {
  return rakeDeg < 0 ? "normal" : "reverse";
}

/** Problems of the fault type itself (the oblique rake), as messages naming the field; empty when it can be used. */
export function kinematicsProblems(kinematics: FaultKinematics): string[] {
  if (kinematics.sense !== "oblique") {
    if (kinematics.rakeDeg === undefined) return [];
    const problem = rakeProblem(kinematics.rakeDeg);
    if (problem) return [`rake: ${problem}`];
    return senseOfRake(kinematics.rakeDeg) === kinematics.sense
      ? []
      : [`rake: ${kinematics.rakeDeg}° is ${senseOfRake(kinematics.rakeDeg)} slip, not ${kinematics.sense}`];
  }
  if (kinematics.rakeDeg === undefined || !Number.isFinite(kinematics.rakeDeg))
    return ["rake: an oblique fault needs its rake (degrees from the strike, negative for normal-oblique, positive for reverse-oblique slip)"];
  const problem = rakeProblem(kinematics.rakeDeg);
  return problem ? [`rake: ${problem}`] : [];
}

/**
 * Rows whose throw or rake the fault type cannot use: negative throw unless the fault is inverted; a pick's rake that
 * is out of range, too close to strike-slip, or of the other sense than the fault (offset of the opposite sense is
 * given as negative throw, with the rake of the fault's own sense).
 */
export function kinematicRowProblems(
  picks: Pick<PickColumns, "throwM" | "rakeDeg" | "sourceRow">,
  kinematics: FaultKinematics,
  limit = Infinity,
): RejectedRow[] {
  const problems: RejectedRow[] = [];
  const sense = kinematics.sense === "oblique" ? senseOfRake(faultRakeDeg(kinematics)) : kinematics.sense;
  const fault = kinematics.sense === "oblique" ? `${sense}-oblique` : sense;
  for (let i = 0; i < picks.throwM.length && problems.length < limit; i++) {
    const row = picks.sourceRow[i];
    if (picks.throwM[i] < 0 && !kinematics.inversion) {
      problems.push({
        row,
        column: "throw",
        reason: `throw must be ≥ 0 (got ${picks.throwM[i]}): negative throw is offset opposite to the fault's ${fault} sense; if the fault was inverted, set its type to expect inversion`,
      });
    }
    const rake = picks.rakeDeg?.[i];
    if (rake === undefined || Number.isNaN(rake)) continue;
    const problem = rakeProblem(rake);
    if (problem) problems.push({ row, column: "rake", reason: problem });
    else if (senseOfRake(rake) !== sense) {
      problems.push({
        row,
        column: "rake",
        reason: `rake ${rake}° is ${senseOfRake(rake)} slip (${senseOfRake(rake) === "normal" ? "negative" : "positive"} rake, Aki & Richards 1980) on a ${fault} fault; give the rake of the fault's own sense (${sense === "normal" ? "negative" : "positive"}), and offset of the opposite sense as negative throw`,
      });
    }
  }
  return problems;
}

/** Per pick (of `indices`): the rake used, the pick's own where it has one, else the fault's. */
export function rakeColumn(picks: Pick<PickColumns, "rakeDeg">, indices: ArrayLike<number>, kinematics: FaultKinematics): Float64Array {
  const fallback = faultRakeDeg(kinematics);
  const out = new Float64Array(indices.length);
  for (let k = 0; k < indices.length; k++) {
    const own = picks.rakeDeg?.[indices[k]];
    out[k] = own !== undefined && Number.isFinite(own) ? own : fallback;
  }
  return out;
}

/** What the report says about the fault type and how throw became displacement. */
export function kinematicsSummary(kinematics: FaultKinematics, picks: Pick<PickColumns, "throwM" | "rakeDeg">): KinematicsSummary {
  const rakeDeg = faultRakeDeg(kinematics);
  let picksWithRake = 0,
    oppositeSensePicks = 0;
  for (let i = 0; i < picks.throwM.length; i++) {
    if (picks.rakeDeg && Number.isFinite(picks.rakeDeg[i])) picksWithRake++;
    if (picks.throwM[i] < 0) oppositeSensePicks++;
  }
  const hangingWall = senseOfRake(rakeDeg) === "normal" ? "down" : "up";
  const kind =
    kinematics.sense === "oblique"
      ? `Oblique fault, ${senseOfRake(rakeDeg)}-oblique slip at rake ${rakeDeg}° (hanging wall ${hangingWall}; rake from the strike in the fault surface, negative normal, positive reverse: Aki & Richards 1980)`
      : `${kinematics.sense === "normal" ? "Normal" : "Reverse"} fault: the hanging wall moved ${hangingWall} the dip (rake ${rakeDeg > 0 ? "+" : ""}${rakeDeg}°)`;
  const own =
    picksWithRake > 0 ? ` ${picksWithRake.toLocaleString("en")} ${picksWithRake === 1 ? "pick gives its own rake" : "picks give their own rake"}.` : "";
  const conversion =
    kinematics.sense === "oblique" || picksWithRake > 0
      ? " Displacement is the net slip: throw / (sin(local dip) · |sin(rake)|), the dip-slip part from throw and heave where heave is given (Groshong 2006)."
      : " Displacement = throw / sin(local dip), or the vector sum of throw and heave where heave is given (Groshong 2006).";
  const inversion = kinematics.inversion
    ? oppositeSensePicks > 0
      ? ` The fault's type expects inversion: ${oppositeSensePicks.toLocaleString("en")} ${oppositeSensePicks === 1 ? "pick has" : "picks have"} negative throw, offset opposite to the fault's sense, kept as negative displacement.`
      : " The fault's type expects inversion, but no pick has negative throw."
    : "";
  return {
    sense: kinematics.sense,
    rakeDeg,
    inversion: Boolean(kinematics.inversion),
    hangingWall,
    picksWithRake,
    oppositeSensePicks,
    note: `${kind}.${own}${conversion}${inversion}`,
  };
}
