"use client";
import { useRef, useState } from "react";
import { ApiRequestError } from "@/lib/api/client";
import { QUALITY_USE } from "@/lib/engine/quality";
import { metres } from "./format";
import type { UploadPreview, UploadSaved } from "@/lib/contracts/analysis";
import type { RejectedRow } from "@/lib/contracts/report";


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

/** The demo study's pick files (public/demo), offered on an empty fault to try the upload with. */
const EXAMPLE_FILES = [
  { file: "qg-1-throw-picks.csv", about: "two overlapping segments with a relay, 3,338 picks" },
  { file: "qg-4-throw-picks.csv", about: "one blind fault with an elliptical tip line, 2,205 picks" },
];

/** The pick CSV format in brief, with the example files to download or to try at once. */
function ExampleFiles({ onUse, busy }: { onUse: (file: File) => void; busy: boolean }) {
  const [error, setError] = useState<string | null>(null);
  async function use(name: string) {
    setError(null);
    try {
      const response = await fetch(`/demo/${name}`);
      if (!response.ok) throw new Error(`The example file could not be fetched (${response.status}).`);
      onUse(new File([await response.blob()], name, { type: "text/csv" }));
    } catch (caught) {
      setError(caught instanceof Error ? caught.message : String(caught));
    }
  }
  return (
    <div className="grid gap-4 text-left text-sm md:grid-cols-2" data-testid="upload-help">
      <div>
        <h3 className="font-semibold">The pick file</h3>
        <p className="mt-1 text-xs text-slate-600 dark:text-slate-300">
          A CSV with a header row; names in any order and case. Required: <code className="font-mono">x</code>, <code className="font-mono">y</code> (map coordinates, m),{" "}
          <code className="font-mono">z</code> (elevation, m, positive up; or <code className="font-mono">depth</code>, positive down), <code className="font-mono">throw</code> (m, ≥ 0).
          Optional: <code className="font-mono">segment</code>, <code className="font-mono">horizon</code>, <code className="font-mono">heave</code>, <code className="font-mono">quality</code> (0–1),{" "}
          <code className="font-mono">hw_thickness</code>, <code className="font-mono">fw_thickness</code>. Feet are converted when you choose them.
        </p>
        <pre className="mt-2 overflow-x-auto rounded bg-slate-50 p-2 font-mono text-[11px] leading-snug text-slate-700 dark:bg-slate-950 dark:text-slate-300">{"x,y,z,throw,segment\n461880.3,6733605.6,-1527.8,11.6,north\n461910.0,6733550.7,-1527.1,11.0,north"}</pre>
      </div>
      <div>
        <h3 className="font-semibold">No file at hand? Try an example</h3>
        <p className="mt-1 text-xs text-slate-600 dark:text-slate-300">The invented Quillon Graben demo picks: use one here to see the whole analysis, or download it to look inside.</p>
        <ul className="mt-2 space-y-2" data-testid="example-files">
          {EXAMPLE_FILES.map((example) => (
            <li key={example.file} className="flex flex-wrap items-center gap-2">
              <button type="button" className="btn-quiet px-2 py-1 text-xs" disabled={busy} onClick={() => void use(example.file)} data-testid={`use-example-${example.file}`}>Use {example.file}</button>
              <a className="text-xs text-slip-700 underline dark:text-slip-300" href={`/demo/${example.file}`} download>download</a>
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
  const [units, setUnits] = useState<"m" | "ft">("m");
  const [dropBadRows, setDropBadRows] = useState(false);
  const [preview, setPreview] = useState<UploadPreview | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [errorRows, setErrorRows] = useState<RejectedRow[]>([]);
  const [busy, setBusy] = useState<null | "preview" | "confirm">(null);
  const [uploadFraction, setUploadFraction] = useState(0);
  const [dragging, setDragging] = useState(false);
  const inputRef = useRef<HTMLInputElement>(null);

  function formFor(selected: File, page = 0, drop = dropBadRows, unit = units) {
    const form = new FormData();
    form.set("file", selected);
    form.set("units", unit);
    form.set("dropBadRows", String(drop));
    form.set("problemPage", String(page));
    return form;
  }

  async function runPreview(selected: File, page = 0, unit = units) {
    setBusy("preview");
    setError(null);
    setErrorRows([]);
    setUploadFraction(0);
    try {
      setPreview(await postForm<UploadPreview>(`/api/faults/${faultId}/pick-sets?step=preview`, formFor(selected, page, dropBadRows, unit), setUploadFraction));
    } catch (caught) {
      setPreview(null);
      setError(caught instanceof Error ? caught.message : String(caught));
      if (caught instanceof ApiRequestError && Array.isArray(caught.details?.rejected)) setErrorRows(caught.details.rejected as RejectedRow[]);
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

  function choose(selected: File | undefined) {
    if (!selected) return;
    setFile(selected);
    void runPreview(selected);
  }

  const problemPages = preview ? Math.ceil(preview.problemCount / preview.problemPageSize) : 0;
  const canConfirm = preview && preview.accepted > 0 && (preview.problemCount === 0 || dropBadRows);

  return (
    <div className="space-y-4" data-testid="upload-panel">
      <div
        className={`flex flex-col items-center justify-center gap-2 rounded-xl border-2 border-dashed px-4 py-6 text-center text-sm transition ${dragging ? "border-slip-500 bg-slip-50 dark:bg-slip-950" : "border-slate-300 dark:border-slate-700"}`}
        onDragOver={(event) => { event.preventDefault(); setDragging(true); }}
        onDragLeave={() => setDragging(false)}
        onDrop={(event) => { event.preventDefault(); setDragging(false); choose(event.dataTransfer.files[0]); }}
      >
        <p className="font-medium">Drop a pick CSV here</p>
        <p className="text-xs text-slate-500">Columns x, y, z (or depth), throw; optional segment, horizon, heave, quality. Up to 2,000,000 rows, 100 MB.</p>
        <p className="max-w-md text-xs text-slate-500" data-testid="quality-use">{QUALITY_USE}</p>
        <div className="mt-1 flex items-center gap-2">
          <button type="button" className="btn-quiet py-1.5" onClick={() => inputRef.current?.click()}>Choose file</button>
          <label className="flex items-center gap-1.5 text-xs">
            Units
            <select className="field w-auto py-1 text-xs" value={units} aria-label="Units of the file" onChange={(event) => { const unit = event.target.value as "m" | "ft"; setUnits(unit); if (file) void runPreview(file, 0, unit); }}>
              <option value="m">metres</option>
              <option value="ft">feet</option>
            </select>
          </label>
        </div>
        <input ref={inputRef} type="file" accept=".csv,text/csv" className="sr-only" data-testid="pick-file" onChange={(event) => choose(event.target.files?.[0])} />
      </div>

      {withExamples && !preview && <ExampleFiles onUse={choose} busy={busy !== null} />}

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
        <div className="rounded-lg border border-red-200 bg-red-50 p-3 text-sm text-red-800 dark:border-red-900 dark:bg-red-950 dark:text-red-200" data-testid="upload-error">
          <p>{error}</p>
          {errorRows.length > 0 && (
            <ul className="mt-2 max-h-40 list-disc overflow-auto pl-5 text-xs">
              {errorRows.map((problem) => <li key={`${problem.row}-${problem.column}`}>Row {problem.row}, {problem.column}: {problem.reason}</li>)}
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
          {preview.duplicateOfVersion !== null && (
            <p className="rounded-lg bg-amber-50 px-3 py-2 text-xs text-amber-900 dark:bg-amber-950/40 dark:text-amber-100" data-testid="duplicate-note">
              This exact file was already uploaded as version {preview.duplicateOfVersion}. Saving it again makes a new version with the same picks.
            </p>
          )}
          {preview.warnings.map((warning) => <p key={warning} className="text-xs text-amber-700 dark:text-amber-300">{warning}</p>)}
          <div className="max-h-48 overflow-auto rounded-lg border border-slate-200 dark:border-slate-800">
            <table className="w-full text-xs">
              <thead className="sticky top-0 bg-slate-50 text-left text-slate-500 dark:bg-slate-950">
                <tr>{["Row", "x", "y", "z", "Throw", "Segment"].map((heading) => <th key={heading} className="px-2 py-1 font-medium">{heading}</th>)}</tr>
              </thead>
              <tbody className="num">
                {preview.sample.map((pick) => (
                  <tr key={pick.row} className="border-t border-slate-100 dark:border-slate-800">
                    <td className="px-2 py-0.5">{pick.row}</td>
                    <td className="px-2 py-0.5">{pick.x.toFixed(1)}</td>
                    <td className="px-2 py-0.5">{pick.y.toFixed(1)}</td>
                    <td className="px-2 py-0.5">{pick.z.toFixed(1)}</td>
                    <td className="px-2 py-0.5">{metres(pick.throwM)}</td>
                    <td className="px-2 py-0.5">{pick.segment}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {preview.problemCount > 0 && (
            <div className="rounded-lg border border-red-200 dark:border-red-900" data-testid="problem-rows">
              <p className="border-b border-red-200 bg-red-50 px-3 py-1.5 text-xs font-medium text-red-800 dark:border-red-900 dark:bg-red-950 dark:text-red-200">
                {preview.problemCount.toLocaleString("en")}{preview.problemsTruncated ? "+" : ""} rows with problems
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
                  <button className="btn-quiet px-2 py-0.5" disabled={preview.problemPage === 0} onClick={() => runPreview(file, preview.problemPage - 1)}>Previous</button>
                  <span className="num">{preview.problemPage + 1} / {problemPages}</span>
                  <button className="btn-quiet px-2 py-0.5" disabled={preview.problemPage + 1 >= problemPages} onClick={() => runPreview(file, preview.problemPage + 1)}>Next</button>
                </div>
              )}
              <label className="flex items-center gap-2 border-t border-slate-100 px-3 py-2 text-xs dark:border-slate-800">
                <input type="checkbox" checked={dropBadRows} onChange={(event) => setDropBadRows(event.target.checked)} data-testid="drop-bad-rows" />
                Drop these rows and keep the {preview.accepted.toLocaleString("en")} good ones
              </label>
            </div>
          )}
          <div className="flex gap-2">
            <button className="btn-primary" disabled={!canConfirm || busy !== null} onClick={confirm} data-testid="confirm-upload">Save pick set and analyse</button>
            <button className="btn-quiet" onClick={() => { setPreview(null); setFile(null); }}>Discard</button>
          </div>
        </div>
      )}
    </div>
  );
}
