// The kinds of fault a study can hold, as the add-fault form offers them. One list for the form, the API's
// validation and the labels; a new kind (e.g. oblique, with its rake) is one more entry here plus its fields.
import type { faults } from "@/db/schema";

/** The column's values (db/schema.ts); the list below must offer exactly these. */
export type FaultSense = (typeof faults.sense.enumValues)[number];

export const FAULT_SENSES: { value: FaultSense; label: string; hint: string }[] = [
  { value: "normal", label: "Normal", hint: "hanging wall moved down the dip (extension)" },
  { value: "reverse", label: "Reverse", hint: "hanging wall moved up the dip (shortening)" },
];

export const FAULT_SENSE_VALUES = ["normal", "reverse"] as const satisfies readonly FaultSense[];
// every value of the column is offered (fails to compile when the column gains one the list lacks)
const allOffered: Exclude<FaultSense, (typeof FAULT_SENSE_VALUES)[number]> extends never ? true : never = true;
void allOffered;

export function faultSenseLabel(value: string): string {
  return FAULT_SENSES.find((sense) => sense.value === value)?.label.toLowerCase() ?? value;
}
