"use client";
import { useRef, useState } from "react";
import { ApiRequestError } from "@/lib/api/client";
import { QUALITY_USE } from "@/lib/engine/quality";
import { describeVelocityModel, DEPTH_CONVERSION_CAUTION, type VelocityModel } from "@/lib/engine/time-depth";
import { metres } from "@/lib/format";
import type { UploadPreview, UploadSaved } from "@/lib/contracts/analysis";
import type { RejectedRow } from "@/lib/contracts/report";

/** The velocity model as typed in the form: a linear function, or interval velocities by horizon. */
interface VelocityForm {
  kind: "linear" | "intervals";
  v0: string;
  k: string;
  intervals: { horizon: string; velocity: string }[];
}

/** The form's model, or a message naming what is missing. */
function velocityModelOf(form: VelocityForm): VelocityModel | string {
  if (form.kind === "linear") {
    const v0 = Number(form.v0),
      k = Number(form.k);
    if (form.v0.trim() === "" || !Number.isFinite(v0)) return "Give v0, the velocity at the datum (m/s).";
    if (form.k.trim() === "" || !Number.isFinite(k)) return "Give k, the velocity gradient (1/s); 0 for a constant velocity.";
    return { kind: "linear", v0MPerS: v0, kPerS: k };
  }
  const intervals = form.intervals.filter((row) => row.horizon.trim() || row.velocity.trim());
  if (intervals.length === 0) return "Give at least one horizon with the interval velocity above it.";
  const bad = intervals.find((row) => !row.horizon.trim() || !Number.isFinite(Number(row.velocity)) || row.velocity.trim() === "");
  if (bad) return `Give a horizon and a velocity (m/s) on every row${bad.horizon ? ` (${bad.horizon})` : ""}.`;
  return { kind: "intervals", intervals: intervals.map((row) => ({ horizon: row.horizon.trim(), velocityMPerS: Number(row.velocity) })) };
}

/** POST a multipart form with upload progress (fetch cannot report it). */
function postForm<T>(url: string, form: FormData, onProgress: (fraction: number) => void): Promise<T> {
  return new Promise((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("POST", url);
    request.upload.onprogress = (event) => event.lengthComputable && onProgress(event.loaded / event.total);
    request.onload = () => {
      let body: { error?: string; details?: Record<string, unknown> } = {};
      try {
        body = JSON.parse(request.responseText);
      } catch {}
      if (request.status >= 200 && request.status < 300) resolve(body as T);
      else reject(new ApiRequestError(request.status, body.error ?? `Upload failed (${request.status}).`, body.details));
    };
    request.onerror = () => reject(new ApiRequestError(0, "The upload did not reach the server. Check the connection and try again."));
    request.send(form);
  });
}

/** The demo study's files (public/demo), offered on an empty fault to try the upload with. */
const EXAMPLE_FILES: { file: string; about: string; velocity?: VelocityForm }[] = [
  { file: "qg-1-throw-picks.csv", about: "two overlapping segments with a relay, 3,338 picks" },
  { file: "qg-4-throw-picks.csv", about: "one blind fault with an elliptical tip line, 2,205 picks" },
  {
    file: "qg-1-cutoff-lines.csv",
    about: "cut-off lines of four horizons on both walls, in two-way time (v0 = 1800 m/s, k = 0.6 1/s)",
    velocity: { kind: "linear", v0: "1800", k: "0.6", intervals: [] },
  },
];

/** The pick CSV format in brief, with the example files to download or to try at once. */
function ExampleFiles({ onUse, busy }: { onUse: (file: File, velocity?: VelocityForm) => void; busy: boolean }) {
  const [error, setError] = useState<string | null>(null);
  async function use(name: string) {
    setError(null);
    try {
      const response = await fetch(`/demo/${name}`);
      if (!response.ok) throw new Error(`The example file could not be fetched (${response.status}).`);
      onUse(new File([await response.blob()], name, { type: "text/csv" }), EXAMPLE_FILES.find((example) => example.file === name)?.velocity);
    } catch (caught) {
      setError(caught instanceof Error ? caught.message : String(caught));
    }
  }
  return (
    <div className="grid gap-4 text-left text-sm md:grid-cols-2" data-testid="upload-help">
      <div>
        <h3 className="font-semibold">The pick file</h3>
        <p className="mt-1 text-xs text-slate-600 dark:text-slate-300">
          A CSV with a header row; names in any order and case. Required: <code className="font-mono">x</code>, <code className="font-mono">y</code> (map
          coordinates, m), <code className="font-mono">z</code> (elevation, m, positive up; or <code className="font-mono">depth</code>, positive down),{" "}
          <code className="font-mono">throw</code> (m, ≥ 0). Optional: <code className="font-mono">segment</code>, <code className="font-mono">horizon</code>,{" "}
          <code className="font-mono">heave</code>, <code className="font-mono">quality</code> (0–1), <code className="font-mono">hw_thickness</code>,{" "}
          <code className="font-mono">fw_thickness</code>. Feet are converted when you choose them.
        </p>
        <pre className="mt-2 overflow-x-auto rounded bg-slate-50 p-2 font-mono text-[11px] leading-snug text-slate-700 dark:bg-slate-950 dark:text-slate-300">
          {"x,y,z,throw,segment\n461880.3,6733605.6,-1527.8,11.6,north\n461910.0,6733550.7,-1527.1,11.0,north"}
        </pre>
        <h3 className="mt-3 font-semibold">Or cut-off lines</h3>
        <p className="mt-1 text-xs text-slate-600 dark:text-slate-300" data-testid="cutoff-help">
          For each horizon, the line where it meets the fault on each wall: <code className="font-mono">x</code>, <code className="font-mono">y</code>,{" "}
          <code className="font-mono">z</code> (or <code className="font-mono">depth</code>, or <code className="font-mono">twt</code> in ms),{" "}
          <code className="font-mono">horizon</code>, <code className="font-mono">wall</code> (<code className="font-mono">hw</code> or{" "}
          <code className="font-mono">fw</code>), optional <code className="font-mono">line</code> (pieces of one cut-off) and{" "}
          <code className="font-mono">segment</code>; vertices in order along each line. Slipfield pairs the walls at stations along strike and derives the
          throw picks. Picks or cut-offs in two-way time need a velocity model.
        </p>
      </div>
      <div>
        <h3 className="font-semibold">No file at hand? Try an example</h3>
        <p className="mt-1 text-xs text-slate-600 dark:text-slate-300">
          The invented Quillon Graben demo picks: use one here to see the whole analysis, or download it to look inside.
        </p>
        <ul className="mt-2 space-y-2" data-testid="example-files">
          {EXAMPLE_FILES.map((example) => (
            <li key={example.file} className="flex flex-wrap items-center gap-2">
              <button
                type="button"
                className="btn-quiet px-2 py-1 text-xs"
                disabled={busy}
                onClick={() => void use(example.file)}
                data-testid={`use-example-${example.file}`}
              >
                Use {example.file}
              </button>
              <a className="text-xs text-slip-700 underline dark:text-slip-300" href={`/demo/${example.file}`} download>
                download
              </a>
              <span className="basis-full text-xs text-slate-500">{example.about}</span>
            </li>
          ))}
        </ul>
        {error && <p className="field-error text-xs">{error}</p>}
      </div>
    </div>
  );
}

export function UploadPanel({ faultId, onSaved, withExamples = false }: { faultId: string; onSaved: (analysisId: string) => void; withExamples?: boolean }) {
  const [file, setFile] = useState<File | null>(null);
  // a file in two-way time: the velocity model (shown once the server says the file is in time)
  const [velocity, setVelocity] = useState<VelocityForm | null>(null);
  const [fileHorizons, setFileHorizons] = useState<string[]>([]);
  // a cut-off file: how the walls are paired
  const [spacing, setSpacing] = useState("");
  const [rake, setRake] = useState("");
  const [orderAlongStrike, setOrderAlongStrike] = useState(false);
  const [units, setUnits] = useState<"m" | "ft">("m");
  const [dropBadRows, setDropBadRows] = useState(false);
  const [preview, setPreview] = useState<UploadPreview | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [errorRows, setErrorRows] = useState<RejectedRow[]>([]);
  const [busy, setBusy] = useState<null | "preview" | "confirm">(null);
  const [uploadFraction, setUploadFraction] = useState(0);
  const [dragging, setDragging] = useState(false);
  const inputRef = useRef<HTMLInputElement>(null);

  const model = velocity ? velocityModelOf(velocity) : null;

  function formFor(selected: File, page = 0, drop = dropBadRows, unit = units, velocityForm = velocity) {
    const form = new FormData();
    form.set("file", selected);
    form.set("units", unit);
    form.set("dropBadRows", String(drop));
    form.set("problemPage", String(page));
    const given = velocityForm ? velocityModelOf(velocityForm) : null;
    if (given && typeof given !== "string") form.set("velocityModel", JSON.stringify(given));
    if (spacing.trim()) form.set("stationSpacingM", spacing.trim());
    if (rake.trim()) form.set("rakeDeg", rake.trim());
    form.set("orderAlongStrike", String(orderAlongStrike));
    return form;
  }

  async function runPreview(selected: File, page = 0, unit = units, velocityForm = velocity) {
    setBusy("preview");
    setError(null);
    setErrorRows([]);
    setUploadFraction(0);
    try {
      setPreview(
        await postForm<UploadPreview>(
          `/api/faults/${faultId}/pick-sets?step=preview`,
          formFor(selected, page, dropBadRows, unit, velocityForm),
          setUploadFraction,
        ),
      );
    } catch (caught) {
      setPreview(null);
      setError(caught instanceof Error ? caught.message : String(caught));
      if (caught instanceof ApiRequestError && Array.isArray(caught.details?.rejected)) setErrorRows(caught.details.rejected as RejectedRow[]);
      if (caught instanceof ApiRequestError && caught.details?.needsVelocityModel) {
        const horizons = Array.isArray(caught.details.horizons) ? (caught.details.horizons as string[]) : [];
        setFileHorizons(horizons);
        setVelocity((current) => current ?? { kind: "linear", v0: "", k: "", intervals: horizons.map((horizon) => ({ horizon, velocity: "" })) });
      }
    } finally {
      setBusy(null);
    }
  }

  async function confirm() {
    if (!file) return;
    setBusy("confirm");
    setError(null);
    try {
      const saved = await postForm<UploadSaved>(`/api/faults/${faultId}/pick-sets?step=confirm`, formFor(file), setUploadFraction);
      setPreview(null);
      setFile(null);
      onSaved(saved.analysisId);
    } catch (caught) {
      setError(caught instanceof Error ? caught.message : String(caught));
    } finally {
      setBusy(null);
    }
  }

  function choose(selected: File | undefined, velocityForm?: VelocityForm) {
    if (!selected) return;
    setFile(selected);
    setVelocity(velocityForm ?? null);
    setFileHorizons([]);
    void runPreview(selected, 0, units, velocityForm ?? null);
  }

  const problemPages = preview ? Math.ceil(preview.problemCount / preview.problemPageSize) : 0;
  const canConfirm = preview && preview.accepted > 0 && (preview.problemCount === 0 || dropBadRows);
  const cutoffs = preview?.kind === "cutoffs" ? preview.cutoffs : null;

  return (
    <div className="space-y-4" data-testid="upload-panel">
      <div
        className={`flex flex-col items-center justify-center gap-2 rounded-xl border-2 border-dashed px-4 py-6 text-center text-sm transition ${dragging ? "border-slip-500 bg-slip-50 dark:bg-slip-950" : "border-slate-300 dark:border-slate-700"}`}
        onDragOver={(event) => {
          event.preventDefault();
          setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={(event) => {
          event.preventDefault();
          setDragging(false);
          choose(event.dataTransfer.files[0]);
        }}
      >
        <p className="font-medium">Drop a pick CSV or a cut-off line file here</p>
        <p className="text-xs text-slate-500">
          Picks: x, y, z (or depth, or twt), throw; optional segment, horizon, heave, quality. Cut-off lines: x, y, z (or depth, or twt), horizon, wall. Up to
          2,000,000 rows, 100 MB.
        </p>
        <p className="max-w-md text-xs text-slate-500" data-testid="quality-use">
          {QUALITY_USE}
        </p>
        <div className="mt-1 flex items-center gap-2">
          <button type="button" className="btn-quiet py-1.5" onClick={() => inputRef.current?.click()}>
            Choose file
          </button>
          <label className="flex items-center gap-1.5 text-xs">
            Units
            <select
              className="field w-auto py-1 text-xs"
              value={units}
              aria-label="Units of the file"
              onChange={(event) => {
                const unit = event.target.value as "m" | "ft";
                setUnits(unit);
                if (file) void runPreview(file, 0, unit);
              }}
            >
              <option value="m">metres</option>
              <option value="ft">feet</option>
            </select>
          </label>
        </div>
        <input
          ref={inputRef}
          type="file"
          accept=".csv,text/csv"
          className="sr-only"
          data-testid="pick-file"
          onChange={(event) => choose(event.target.files?.[0])}
        />
      </div>

      {withExamples && !preview && <ExampleFiles onUse={choose} busy={busy !== null} />}

      {velocity && file && (
        <VelocityFields
          value={velocity}
          horizons={fileHorizons}
          problem={typeof model === "string" ? model : null}
          busy={busy !== null}
          onChange={setVelocity}
          onApply={() => void runPreview(file)}
        />
      )}

      {busy && (
        <div className="space-y-1" data-testid="upload-progress">
          <div className="flex justify-between text-xs text-slate-500">
            <span>{busy === "preview" ? "Checking picks…" : "Saving pick set…"}</span>
            <span className="num">{Math.round(uploadFraction * 100)}% sent</span>
          </div>
          <div className="h-1.5 overflow-hidden rounded bg-slate-200 dark:bg-slate-800">
            <div className="h-full bg-slip-500 transition-all" style={{ width: `${Math.max(4, uploadFraction * 100)}%` }} />
          </div>
        </div>
      )}

      {error && (
        <div
          className="rounded-lg border border-red-200 bg-red-50 p-3 text-sm text-red-800 dark:border-red-900 dark:bg-red-950 dark:text-red-200"
          data-testid="upload-error"
        >
          <p>{error}</p>
          {errorRows.length > 0 && (
            <ul className="mt-2 max-h-40 list-disc overflow-auto pl-5 text-xs">
              {errorRows.map((problem) => (
                <li key={`${problem.row}-${problem.column}`}>
                  Row {problem.row}, {problem.column}: {problem.reason}
                </li>
              ))}
            </ul>
          )}
        </div>
      )}

      {preview && (
        <div className="space-y-3" data-testid="upload-preview">
          <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            <span className="font-medium">{preview.fileName}</span>
            <span className="num text-slate-500">{(preview.sizeBytes / 1024).toFixed(0)} KB</span>
            <span className="num text-slate-500">{preview.rows.toLocaleString("en")} rows</span>
            <span className="num text-slate-500">{preview.accepted.toLocaleString("en")} usable</span>
            <span className="text-slate-500">segments: {preview.segments.join(", ") || "—"}</span>
          </div>
          {preview.domain === "time" && preview.velocityModel && (
            <div
              className="space-y-1 rounded-lg bg-slate-50 px-3 py-2 text-xs text-slate-700 dark:bg-slate-950 dark:text-slate-300"
              data-testid="upload-depth-conversion"
            >
              <p>
                Two-way time converted to depth with {describeVelocityModel(preview.velocityModel)}; the original times are kept with the{" "}
                {preview.kind === "cutoffs" ? "cut-offs" : "picks"}.
              </p>
              <p className="text-amber-800 dark:text-amber-200">{DEPTH_CONVERSION_CAUTION}</p>
            </div>
          )}
          {cutoffs && (
            <CutoffSummaryBox
              cutoffs={cutoffs}
              picks={preview.accepted}
              spacing={spacing}
              rake={rake}
              orderAlongStrike={orderAlongStrike}
              busy={busy !== null}
              onSpacing={setSpacing}
              onRake={setRake}
              onOrder={setOrderAlongStrike}
              onApply={() => file && void runPreview(file)}
            />
          )}
          {preview.duplicateOfVersion !== null && (
            <p className="rounded-lg bg-amber-50 px-3 py-2 text-xs text-amber-900 dark:bg-amber-950/40 dark:text-amber-100" data-testid="duplicate-note">
              This exact file was already uploaded as version {preview.duplicateOfVersion}. Saving it again makes a new version with the same picks.
            </p>
          )}
          {preview.warnings.map((warning) => (
            <p key={warning} className="text-xs text-amber-700 dark:text-amber-300">
              {warning}
            </p>
          ))}
          <div className="max-h-48 overflow-auto rounded-lg border border-slate-200 dark:border-slate-800">
            <table className="w-full text-xs">
              <thead className="sticky top-0 bg-slate-50 text-left text-slate-500 dark:bg-slate-950">
                <tr>
                  {["Row", "x", "y", "z", "Throw", "Segment", ...(preview.horizons.length ? ["Horizon"] : [])].map((heading) => (
                    <th key={heading} className="px-2 py-1 font-medium">
                      {heading}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody className="num">
                {preview.sample.map((pick, index) => (
                  <tr key={`${pick.row}-${index}`} className="border-t border-slate-100 dark:border-slate-800">
                    <td className="px-2 py-0.5">{pick.row}</td>
                    <td className="px-2 py-0.5">{pick.x.toFixed(1)}</td>
                    <td className="px-2 py-0.5">{pick.y.toFixed(1)}</td>
                    <td className="px-2 py-0.5">{pick.z.toFixed(1)}</td>
                    <td className="px-2 py-0.5">{metres(pick.throwM)}</td>
                    <td className="px-2 py-0.5">{pick.segment}</td>
                    {preview.horizons.length > 0 && <td className="px-2 py-0.5">{pick.horizon ?? ""}</td>}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {preview.problemCount > 0 && (
            <div className="rounded-lg border border-red-200 dark:border-red-900" data-testid="problem-rows">
              <p className="border-b border-red-200 bg-red-50 px-3 py-1.5 text-xs font-medium text-red-800 dark:border-red-900 dark:bg-red-950 dark:text-red-200">
                {preview.problemCount.toLocaleString("en")}
                {preview.problemsTruncated ? "+" : ""} rows with problems
              </p>
              <ul className="max-h-40 divide-y divide-slate-100 overflow-auto text-xs dark:divide-slate-800">
                {preview.problems.map((problem) => (
                  <li key={`${problem.row}-${problem.column}`} className="px-3 py-1" data-testid="problem-row">
                    <span className="num font-medium">Row {problem.row}</span> · <span className="font-mono">{problem.column}</span>: {problem.reason}
                  </li>
                ))}
              </ul>
              {problemPages > 1 && file && (
                <div className="flex items-center justify-end gap-2 border-t border-slate-100 px-3 py-1 text-xs dark:border-slate-800">
                  <button className="btn-quiet px-2 py-0.5" disabled={preview.problemPage === 0} onClick={() => runPreview(file, preview.problemPage - 1)}>
                    Previous
                  </button>
                  <span className="num">
                    {preview.problemPage + 1} / {problemPages}
                  </span>
                  <button
                    className="btn-quiet px-2 py-0.5"
                    disabled={preview.problemPage + 1 >= problemPages}
                    onClick={() => runPreview(file, preview.problemPage + 1)}
                  >
                    Next
                  </button>
                </div>
              )}
              <label className="flex items-center gap-2 border-t border-slate-100 px-3 py-2 text-xs dark:border-slate-800">
                <input type="checkbox" checked={dropBadRows} onChange={(event) => setDropBadRows(event.target.checked)} data-testid="drop-bad-rows" />
                Drop these rows and keep the {preview.accepted.toLocaleString("en")} good ones
              </label>
            </div>
          )}
          <div className="flex gap-2">
            <button className="btn-primary" disabled={!canConfirm || busy !== null} onClick={confirm} data-testid="confirm-upload">
              {cutoffs ? "Save the derived pick set and analyse" : "Save pick set and analyse"}
            </button>
            <button
              className="btn-quiet"
              onClick={() => {
                setPreview(null);
                setFile(null);
                setVelocity(null);
              }}
            >
              Discard
            </button>
          </div>
        </div>
      )}
    </div>
  );
}

/** The velocity model of a file in two-way time: v(z) = v0 + k·z, or interval velocities by horizon. */
function VelocityFields(props: {
  value: VelocityForm;
  horizons: string[];
  problem: string | null;
  busy: boolean;
  onChange: (value: VelocityForm) => void;
  onApply: () => void;
}) {
  const { value, onChange } = props;
  const rows = value.intervals.length ? value.intervals : [{ horizon: "", velocity: "" }];
  return (
    <fieldset className="space-y-2 rounded-lg border border-slate-200 p-3 text-xs dark:border-slate-800" data-testid="velocity-fields">
      <legend className="px-1 font-semibold">Velocity model (the file is in two-way time)</legend>
      <p className="text-slate-600 dark:text-slate-300">
        Each wall is converted to depth on its own; throws, heaves and every metric are then in depth. The model is stored with the pick set and shown on the
        fault sheet.
      </p>
      <div className="flex gap-4">
        <label className="flex items-center gap-1">
          <input type="radio" checked={value.kind === "linear"} onChange={() => onChange({ ...value, kind: "linear" })} data-testid="velocity-kind-linear" />{" "}
          linear, v(z) = v0 + k·z
        </label>
        <label className="flex items-center gap-1">
          <input
            type="radio"
            checked={value.kind === "intervals"}
            onChange={() => onChange({ ...value, kind: "intervals" })}
            data-testid="velocity-kind-intervals"
          />{" "}
          interval velocities by horizon
        </label>
      </div>
      {value.kind === "linear" ? (
        <div className="flex flex-wrap gap-3">
          <label className="flex items-center gap-1.5">
            v0 (m/s){" "}
            <input
              className="field w-24 py-0.5 text-xs"
              inputMode="decimal"
              value={value.v0}
              onChange={(event) => onChange({ ...value, v0: event.target.value })}
              data-testid="velocity-v0"
            />
          </label>
          <label className="flex items-center gap-1.5">
            k (1/s){" "}
            <input
              className="field w-20 py-0.5 text-xs"
              inputMode="decimal"
              value={value.k}
              onChange={(event) => onChange({ ...value, k: event.target.value })}
              data-testid="velocity-k"
            />
          </label>
        </div>
      ) : (
        <div className="space-y-1">
          <p className="text-slate-500">Shallow to deep: the velocity of the interval above each horizon (from the horizon before it, or from time zero).</p>
          {rows.map((row, index) => (
            <div key={index} className="flex gap-2">
              <input
                className="field w-40 py-0.5 text-xs"
                aria-label={`Horizon ${index + 1}`}
                list="velocity-horizons"
                value={row.horizon}
                onChange={(event) => onChange({ ...value, intervals: rows.map((r, i) => (i === index ? { ...r, horizon: event.target.value } : r)) })}
              />
              <input
                className="field w-24 py-0.5 text-xs"
                aria-label={`Velocity above horizon ${index + 1} (m/s)`}
                inputMode="decimal"
                placeholder="m/s"
                value={row.velocity}
                onChange={(event) => onChange({ ...value, intervals: rows.map((r, i) => (i === index ? { ...r, velocity: event.target.value } : r)) })}
              />
            </div>
          ))}
          <datalist id="velocity-horizons">
            {props.horizons.map((horizon) => (
              <option key={horizon} value={horizon} />
            ))}
          </datalist>
          <button
            type="button"
            className="btn-quiet px-2 py-0.5 text-xs"
            onClick={() => onChange({ ...value, intervals: [...rows, { horizon: "", velocity: "" }] })}
          >
            Add a horizon
          </button>
        </div>
      )}
      {props.problem && <p className="text-amber-700 dark:text-amber-300">{props.problem}</p>}
      <button
        type="button"
        className="btn-quiet px-2 py-1 text-xs"
        disabled={props.busy || props.problem !== null}
        onClick={props.onApply}
        data-testid="velocity-apply"
      >
        Convert and check
      </button>
    </fieldset>
  );
}

/** What pairing the cut-offs gave, per horizon, with the settings that can be changed before saving. */
function CutoffSummaryBox(props: {
  cutoffs: NonNullable<UploadPreview["cutoffs"]>;
  picks: number;
  spacing: string;
  rake: string;
  orderAlongStrike: boolean;
  busy: boolean;
  onSpacing: (value: string) => void;
  onRake: (value: string) => void;
  onOrder: (value: boolean) => void;
  onApply: () => void;
}) {
  const { cutoffs } = props;
  return (
    <div className="space-y-2 rounded-lg border border-slate-200 p-3 text-xs dark:border-slate-800" data-testid="cutoff-preview">
      <p>
        <span className="font-medium">Cut-off lines:</span> {cutoffs.vertexCount.toLocaleString("en")} vertices; the walls paired every{" "}
        {metres(cutoffs.stationSpacingM, 0)} along strike ({cutoffs.stationSpacingSource === "set" ? "as set" : "from the vertex spacing"}) give{" "}
        <span className="font-medium" data-testid="cutoff-derived-count">
          {props.picks.toLocaleString("en")} throw picks
        </span>
        .
      </p>
      <table className="w-full" data-testid="cutoff-horizons">
        <thead className="text-left text-slate-500">
          <tr>
            <th className="py-0.5 font-medium">Horizon</th>
            <th className="py-0.5 text-right font-medium">Stations</th>
            <th className="py-0.5 text-right font-medium">Max throw</th>
            <th className="py-0.5 text-right font-medium">Mean throw</th>
            <th className="py-0.5 text-right font-medium">One wall only</th>
          </tr>
        </thead>
        <tbody className="num">
          {cutoffs.horizons.map((horizon) => (
            <tr key={horizon.name} className="border-t border-slate-100 dark:border-slate-800">
              <td className="py-0.5">{horizon.name}</td>
              <td className="py-0.5 text-right">{horizon.stations}</td>
              <td className="py-0.5 text-right">{metres(horizon.maxThrowM)}</td>
              <td className="py-0.5 text-right">{metres(horizon.meanThrowM)}</td>
              <td className="py-0.5 text-right">{horizon.missingStations}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {cutoffs.missingStations > 0 && (
        <p className="text-amber-700 dark:text-amber-300" data-testid="cutoff-missing">
          {cutoffs.missingStations} station{cutoffs.missingStations === 1 ? "" : "s"} with a cut-off on one wall only (reported, not filled in), e.g.{" "}
          {cutoffs.missing
            .slice(0, 3)
            .map((m) => `${m.horizon} at s = ${metres(m.s, 0)} (${m.present === "hw" ? "hanging wall" : "footwall"} only)`)
            .join("; ")}
          .
        </p>
      )}
      <div className="flex flex-wrap items-end gap-3">
        <label className="flex flex-col gap-0.5">
          <span className="text-slate-500">Station spacing (m)</span>
          <input
            className="field w-24 py-0.5 text-xs"
            inputMode="decimal"
            placeholder={String(cutoffs.stationSpacingM)}
            value={props.spacing}
            onChange={(event) => props.onSpacing(event.target.value)}
            data-testid="cutoff-spacing"
          />
        </label>
        <label className="flex flex-col gap-0.5" title="Angle in the fault plane from the strike direction to the slip; 90° is pure dip slip">
          <span className="text-slate-500">Rake (°)</span>
          <input
            className="field w-20 py-0.5 text-xs"
            inputMode="decimal"
            placeholder="90"
            value={props.rake}
            onChange={(event) => props.onRake(event.target.value)}
            data-testid="cutoff-rake"
          />
        </label>
        <label className="flex items-center gap-1.5">
          <input type="checkbox" checked={props.orderAlongStrike} onChange={(event) => props.onOrder(event.target.checked)} data-testid="cutoff-order" />
          order each line&apos;s vertices along strike
        </label>
        <button type="button" className="btn-quiet px-2 py-1 text-xs" disabled={props.busy} onClick={props.onApply} data-testid="cutoff-apply">
          Pair again
        </button>
      </div>
    </div>
  );
}
