// The kinds of fault a study can hold, as the add-fault form offers them, with their words. The values themselves are
// the contract's (lib/contracts/roles.ts: the form, the API's check and the database column share them); a new kind is
// one more value there and one more entry here.
import type { FaultSense } from "@/lib/contracts/roles";
export type { FaultSense };
import { FAULT_SENSE_VALUES } from "@/lib/contracts/roles";
import { STRIKE_SLIP_LIMIT_DEG, kinematicsProblems } from "@/lib/engine/kinematics";
import type { FaultKinematics } from "@/lib/engine/types";

/** Every value offered, in order (a Record keyed by FaultSense fails to compile when a value lacks its words). */
const SENSE_WORDS: Record<FaultSense, { label: string; hint: string }> = {
  normal: { label: "Normal", hint: "hanging wall moved down the dip (extension)" },
  reverse: { label: "Reverse", hint: "hanging wall moved up the dip (shortening)" },
  oblique: {
    label: "Oblique",
    hint: `slip at a rake from the strike: negative normal-oblique, positive reverse-oblique (Aki & Richards 1980), at least ${STRIKE_SLIP_LIMIT_DEG}° from strike-slip`,
  },
};

export const FAULT_SENSES = (Object.keys(SENSE_WORDS) as FaultSense[]).map((value) => ({ value, ...SENSE_WORDS[value] }));

export function faultSenseLabel(value: string): string {
  return FAULT_SENSES.find((sense) => sense.value === value)?.label.toLowerCase() ?? value;
}

/** A fault row's type as the engine takes it. */
export function faultKinematics(fault: { sense: string; rakeDeg?: number | null; inversion?: boolean | null }): FaultKinematics {
  const sense = (FAULT_SENSE_VALUES as readonly string[]).includes(fault.sense) ? (fault.sense as FaultSense) : "normal";
  return {
    sense,
    ...(sense === "oblique" && fault.rakeDeg !== null && fault.rakeDeg !== undefined ? { rakeDeg: fault.rakeDeg } : {}),
    inversion: Boolean(fault.inversion),
  };
}

/** The fault type in a few words: "normal", "oblique, rake −45°", "reverse, inversion expected". */
export function describeFaultType(fault: { sense: string; rakeDeg?: number | null; inversion?: boolean | null }): string {
  const words = [faultSenseLabel(fault.sense)];
  if (fault.sense === "oblique" && fault.rakeDeg !== null && fault.rakeDeg !== undefined) words.push(`rake ${fault.rakeDeg > 0 ? "+" : ""}${fault.rakeDeg}°`);
  if (fault.inversion) words.push("inversion expected");
  return words.join(", ");
}

/** Messages for the fault-type fields (sense, rakeDeg), keyed by field; empty when the type can be used. */
export function faultTypeFieldErrors(input: { sense: FaultSense; rakeDeg?: number | null }): { field: "rakeDeg"; message: string }[] {
  if (input.sense !== "oblique" && input.rakeDeg !== undefined && input.rakeDeg !== null)
    return [{ field: "rakeDeg", message: "Only an oblique fault takes a rake; normal is −90° and reverse +90°." }];
  return kinematicsProblems({ sense: input.sense, rakeDeg: input.rakeDeg ?? undefined }).map((problem) => ({
    field: "rakeDeg",
    message: `${problem.replace(/^rake: /, "").replace(/^./, (c) => c.toUpperCase())}.`,
  }));
}
