// The kinds of fault a study can hold, as the add-fault form offers them, with their words. The values themselves are
// the contract's (lib/contracts/roles.ts: the form, the API's check and the database column share them); a new kind
// (e.g. oblique, with its rake) is one more value there and one more entry here.
import type { FaultSense } from "@/lib/contracts/roles";

/** Every value offered, in order (a Record keyed by FaultSense fails to compile when a value lacks its words). */
const SENSE_WORDS: Record<FaultSense, { label: string; hint: string }> = {
  normal: { label: "Normal", hint: "hanging wall moved down the dip (extension)" },
  reverse: { label: "Reverse", hint: "hanging wall moved up the dip (shortening)" },
};

export const FAULT_SENSES = (Object.keys(SENSE_WORDS) as FaultSense[]).map((value) => ({ value, ...SENSE_WORDS[value] }));

export function faultSenseLabel(value: string): string {
  return FAULT_SENSES.find((sense) => sense.value === value)?.label.toLowerCase() ?? value;
}
