"use client";
import { useState } from "react";
import { ApiRequestError } from "@/lib/api/client";
import { REGIME_LABELS, stressParametersSchema, type StressParameters, type StressRegime } from "@/lib/contracts/stress";
import { applyPreset } from "@/lib/stress/parameters";

type NumericKey = Exclude<keyof StressParameters, "regime">;

const FIELDS: { key: NumericKey; label: string; unit: string; step: string; hint?: string }[] = [
  { key: "verticalGradient", label: "Vertical stress Sv", unit: "MPa/km", step: "0.1", hint: "overburden" },
  { key: "maxHorizontalGradient", label: "Max. horizontal SHmax", unit: "MPa/km", step: "0.1" },
  { key: "minHorizontalGradient", label: "Min. horizontal Shmin", unit: "MPa/km", step: "0.1" },
  { key: "maxHorizontalAzimuthDeg", label: "SHmax azimuth", unit: "° from N", step: "1" },
  { key: "porePressureGradient", label: "Pore pressure Pp", unit: "MPa/km", step: "0.1", hint: "≈ 10 hydrostatic" },
  { key: "frictionLow", label: "Friction μ, low", unit: "–", step: "0.01" },
  { key: "frictionHigh", label: "Friction μ, high", unit: "–", step: "0.01" },
  { key: "cohesionMPa", label: "Cohesion C", unit: "MPa", step: "0.1" },
  { key: "referenceDepthM", label: "Reference depth", unit: "m", step: "10", hint: "for the Mohr circles" },
];

export interface StressFormValue {
  parameters: StressParameters;
  source: string;
  studyWide: boolean;
}

/** The stress-state form: regime presets the user can edit, units on every field, zod errors under each field. */
export function StressForm(props: {
  initial: StressFormValue;
  saving: boolean;
  serverError: unknown;
  onSubmit: (value: StressFormValue) => void;
  onCancel?: () => void;
}) {
  const [parameters, setParameters] = useState<Record<keyof StressParameters, string>>(() => toText(props.initial.parameters));
  const [source, setSource] = useState(props.initial.source);
  const [studyWide, setStudyWide] = useState(props.initial.studyWide);
  const [errors, setErrors] = useState<Record<string, string[]>>({});

  function choose(regime: StressRegime) {
    // a preset replaces the gradients only; azimuth, friction, cohesion and depth keep what the user typed
    setParameters((current) => {
      if (regime === "custom") return { ...current, regime };
      const preset = applyPreset(
        {
          regime,
          verticalGradient: 0,
          maxHorizontalGradient: 0,
          minHorizontalGradient: 0,
          porePressureGradient: 0,
          maxHorizontalAzimuthDeg: 0,
          frictionLow: 0,
          frictionHigh: 0,
          cohesionMPa: 0,
          referenceDepthM: 0,
        },
        regime,
      );
      return {
        ...current,
        regime,
        verticalGradient: String(preset.verticalGradient),
        maxHorizontalGradient: String(preset.maxHorizontalGradient),
        minHorizontalGradient: String(preset.minHorizontalGradient),
        porePressureGradient: String(preset.porePressureGradient),
      };
    });
  }

  function submit(event: React.FormEvent) {
    event.preventDefault();
    const result = stressParametersSchema.safeParse(fromText(parameters));
    if (!result.success) {
      const next: Record<string, string[]> = {};
      for (const issue of result.error.issues) {
        const key = String(issue.path[0] ?? "form");
        (next[key] ??= []).push(issue.message);
      }
      setErrors(next);
      return;
    }
    setErrors({});
    props.onSubmit({ parameters: result.data, source, studyWide });
  }

  const server = props.serverError instanceof ApiRequestError ? props.serverError : null;
  const serverMessages = server?.details?.fieldErrors ? Object.values(server.details.fieldErrors).flat() : [];

  return (
    <form onSubmit={submit} noValidate className="space-y-3" data-testid="stress-form">
      <label className="block text-xs font-medium">
        Regime (Andersonian preset, editable)
        <select className="field mt-1" value={parameters.regime} onChange={(e) => choose(e.target.value as StressRegime)} data-testid="stress-regime">
          {(Object.keys(REGIME_LABELS) as StressRegime[]).map((regime) => (
            <option key={regime} value={regime}>
              {REGIME_LABELS[regime]}
            </option>
          ))}
        </select>
        {errors.regime?.map((m) => (
          <span key={m} className="field-error block">
            {m}
          </span>
        ))}
      </label>
      <div className="grid grid-cols-2 gap-x-3 gap-y-2">
        {FIELDS.map((field) => (
          <label key={field.key} className="block text-xs font-medium">
            {field.label} <span className="font-normal text-slate-500">({field.unit})</span>
            <input
              className="field mt-1 font-mono"
              inputMode="decimal"
              step={field.step}
              value={parameters[field.key]}
              aria-invalid={Boolean(errors[field.key])}
              onChange={(e) => setParameters((p) => ({ ...p, [field.key]: e.target.value }))}
              data-testid={`stress-${field.key}`}
            />
            {field.hint && !errors[field.key] && <span className="block font-normal text-slate-500">{field.hint}</span>}
            {errors[field.key]?.map((m) => (
              <span key={m} className="field-error block">
                {m}
              </span>
            ))}
          </label>
        ))}
      </div>
      <label className="block text-xs font-medium">
        Source of the numbers
        <textarea
          className="field mt-1"
          rows={2}
          maxLength={2000}
          placeholder="e.g. leak-off tests and image logs, well QG-A"
          value={source}
          onChange={(e) => setSource(e.target.value)}
          data-testid="stress-source"
        />
      </label>
      <label className="flex items-center gap-2 text-xs">
        <input type="checkbox" checked={studyWide} onChange={(e) => setStudyWide(e.target.checked)} data-testid="stress-study-wide" />
        Save as the study-wide default (faults without their own state use it)
      </label>
      {server && (
        <div className="field-error" role="alert">
          {server.message}
          {serverMessages.map((m) => (
            <span key={m} className="block">
              {m}
            </span>
          ))}
        </div>
      )}
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={props.saving} data-testid="stress-save">
          {props.saving ? "Saving…" : "Save stress state"}
        </button>
        {props.onCancel && (
          <button type="button" className="btn-quiet" onClick={props.onCancel}>
            Cancel
          </button>
        )}
      </div>
    </form>
  );
}

function toText(p: StressParameters): Record<keyof StressParameters, string> {
  const out = { regime: p.regime } as Record<keyof StressParameters, string>;
  for (const { key } of FIELDS) out[key] = String(p[key]);
  return out;
}

function fromText(text: Record<keyof StressParameters, string>): Record<string, unknown> {
  const out: Record<string, unknown> = { regime: text.regime };
  for (const { key } of FIELDS) out[key] = text[key].trim() === "" ? undefined : Number(text[key].replace(",", "."));
  return out;
}
