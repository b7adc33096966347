"use client";
// The fault-type fields (sense, rake of an oblique fault, inversion), shared by the add-fault form and the workspace's
// fault-type editor.
import { FieldError } from "@/components/ui/FieldError";
import { FAULT_SENSES, type FaultSense } from "@/lib/fault-types";

export interface FaultTypeValues {
  sense: FaultSense;
  /** as typed; sent only for an oblique fault */
  rake: string;
  inversion: boolean;
}

/** The JSON the fault API takes for these values. */
export function faultTypeJson(values: FaultTypeValues) {
  return {
    sense: values.sense,
    inversion: values.inversion,
    ...(values.sense === "oblique" ? { rakeDeg: values.rake.trim() === "" ? null : Number(values.rake) } : { rakeDeg: null }),
  };
}

export function FaultTypeFields({
  idPrefix,
  values,
  onChange,
  fieldErrors,
}: {
  idPrefix: string;
  values: FaultTypeValues;
  onChange: (values: FaultTypeValues) => void;
  fieldErrors?: Record<string, string[]>;
}) {
  return (
    <fieldset>
      <legend className="label">Type</legend>
      <div className="space-y-1.5">
        {FAULT_SENSES.map((option) => (
          <label key={option.value} className="flex items-baseline gap-2 text-sm">
            <input
              type="radio"
              name={`${idPrefix}-sense`}
              value={option.value}
              checked={values.sense === option.value}
              onChange={() => onChange({ ...values, sense: option.value })}
              data-testid={`fault-sense-${option.value}`}
            />
            <span>
              <span className="font-medium">{option.label}</span> <span className="text-slate-500">— {option.hint}</span>
            </span>
          </label>
        ))}
      </div>
      <FieldError errors={fieldErrors?.sense} />
      {values.sense === "oblique" && (
        <div className="mt-2">
          <label className="label" htmlFor={`${idPrefix}-rake`}>
            Rake (degrees from the strike)
          </label>
          <input
            id={`${idPrefix}-rake`}
            className="field w-32"
            inputMode="decimal"
            placeholder="e.g. −45"
            value={values.rake}
            onChange={(event) => onChange({ ...values, rake: event.target.value.replace("−", "-") })}
            data-testid="fault-rake"
          />
          <p className="mt-1 text-xs text-slate-500">
            A <code>rake</code> column in the pick file overrides it pick by pick.
          </p>
          <FieldError errors={fieldErrors?.rakeDeg} />
        </div>
      )}
      <label className="mt-2 flex items-baseline gap-2 text-sm">
        <input
          type="checkbox"
          checked={values.inversion}
          onChange={(event) => onChange({ ...values, inversion: event.target.checked })}
          data-testid="fault-inversion"
        />
        <span>
          <span className="font-medium">Inverted</span>{" "}
          <span className="text-slate-500">— negative throw (offset of the opposite sense) is expected in places</span>
        </span>
      </label>
    </fieldset>
  );
}
