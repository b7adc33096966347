// The kinds of fault a study can hold, as the add-fault form offers them. One list for the form, the API's
// validation and the labels; a new kind is one more entry here plus its fields.
import type { faults } from "@/db/schema";
import { STRIKE_SLIP_LIMIT_DEG, kinematicsProblems } from "@/lib/engine/kinematics";
import type { FaultKinematics } from "@/lib/engine/types";

/** The column's values (db/schema.ts); the list below must offer exactly these. */
export type FaultSense = (typeof faults.sense.enumValues)[number];

export const FAULT_SENSES: { value: FaultSense; label: string; hint: string }[] = [
  { value: "normal", label: "Normal", hint: "hanging wall moved down the dip (extension)" },
  { value: "reverse", label: "Reverse", hint: "hanging wall moved up the dip (shortening)" },
  { value: "oblique", label: "Oblique", hint: `slip at a rake from the strike: negative normal-oblique, positive reverse-oblique (Aki & Richards 1980), at least ${STRIKE_SLIP_LIMIT_DEG}° from strike-slip` },
];

export const FAULT_SENSE_VALUES = ["normal", "reverse", "oblique"] as const satisfies readonly FaultSense[];
// every value of the column is offered (fails to compile when the column gains one the list lacks)
const allOffered: Exclude<FaultSense, (typeof FAULT_SENSE_VALUES)[number]> extends never ? true : never = true;
void allOffered;

export function faultSenseLabel(value: string): string {
  return FAULT_SENSES.find((sense) => sense.value === value)?.label.toLowerCase() ?? value;
}

/** A fault row's type as the engine takes it. */
export function faultKinematics(fault: { sense: string; rakeDeg?: number | null; inversion?: boolean | null }): FaultKinematics {
  const sense = (FAULT_SENSE_VALUES as readonly string[]).includes(fault.sense) ? (fault.sense as FaultSense) : "normal";
  return { sense, ...(sense === "oblique" && fault.rakeDeg !== null && fault.rakeDeg !== undefined ? { rakeDeg: fault.rakeDeg } : {}), inversion: Boolean(fault.inversion) };
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
  if (input.sense !== "oblique" && input.rakeDeg !== undefined && input.rakeDeg !== null) return [{ field: "rakeDeg", message: "Only an oblique fault takes a rake; normal is −90° and reverse +90°." }];
  return kinematicsProblems({ sense: input.sense, rakeDeg: input.rakeDeg ?? undefined }).map((problem) => ({
    field: "rakeDeg",
    message: `${problem.replace(/^rake: /, "").replace(/^./, (c) => c.toUpperCase())}.`,
  }));
}
