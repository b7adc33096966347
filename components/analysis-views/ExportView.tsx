"use client";
import { useState } from "react";
import { downloadDataUrl, REPORT_PICTURE_KEY, sceneDataUrl } from "./download";

const EXPORTS = [
  { kind: "grid.csv", label: "Grid CSV", detail: "segment, s, t, x, y, z, displacement, throw — every node with data, full resolution (recomputed on the server)" },
  { kind: "picks.csv", label: "Picks CSV", detail: "each pick with s, t, displacement, the surface value there and the residual" },
  { kind: "profiles.csv?mode=centre-line", label: "Strike profiles CSV (centre line)", detail: "full-resolution row through each segment's Dmax" },
  { kind: "profiles.csv?mode=column-max", label: "Strike profiles CSV (column maximum)", detail: "maximum displacement in each grid column" },
  { kind: "contours.geojson", label: "GeoJSON", detail: "contours, inferred tip lines and mapped limits as 3D lines [x, y, z] in map metres, with level, kind and units" },
];

export function ExportView({ studyId, faultId, stem, analysisId }: { studyId: string; faultId: string; stem: string; analysisId: string }) {
  const [message, setMessage] = useState<string | null>(null);
  const withAnalysis = (kind: string) => `/api/faults/${faultId}/export/${kind}${kind.includes("?") ? "&" : "?"}analysis=${encodeURIComponent(analysisId)}`;

  function scenePng() {
    const url = sceneDataUrl();
    if (!url) return setMessage("The 3D view is not on the page (it needs WebGL); use the chart PNG buttons instead.");
    downloadDataUrl(url, `${stem}-3d-view.png`);
    setMessage(null);
  }

  function openReport() {
    const url = sceneDataUrl();
    try {
      if (url) localStorage.setItem(REPORT_PICTURE_KEY(faultId), url);
      else localStorage.removeItem(REPORT_PICTURE_KEY(faultId));
    } catch {
      // storage full or disabled: the report draws a 2D contour map instead
    }
    window.open(`/studies/${studyId}/faults/${faultId}/report?analysis=${encodeURIComponent(analysisId)}`, "_blank", "noopener=no");
  }

  return (
    <div className="space-y-4" data-testid="export-view">
      <ul className="space-y-2 text-sm">
        {EXPORTS.map((item) => (
          <li key={item.kind} className="flex flex-wrap items-baseline gap-2">
            <a className="btn-quiet px-2 py-1 text-sm" href={withAnalysis(item.kind)} download data-testid={`export-${item.kind.replace(/[?=]/g, "-")}`}>{item.label}</a>
            <span className="text-xs text-slate-500">{item.detail}</span>
          </li>
        ))}
        <li className="flex flex-wrap items-baseline gap-2">
          <button type="button" className="btn-quiet px-2 py-1 text-sm" onClick={scenePng} data-testid="export-3d-png">3D view PNG</button>
          <span className="text-xs text-slate-500">the 3D view exactly as it is on screen now</span>
        </li>
        <li className="flex flex-wrap items-baseline gap-2">
          <button type="button" className="btn-primary px-2 py-1 text-sm" onClick={openReport} data-testid="open-report">Printable fault report</button>
          <span className="text-xs text-slate-500">one page: fault sheet, current 3D picture, strike profile, scaling chart, relays, pins, caution and data provenance</span>
        </li>
      </ul>
      {message && <p className="text-sm text-amber-800 dark:text-amber-200">{message}</p>}
      <p className="text-xs text-slate-500">Every chart has its own PNG button; profiles also have a CSV button for the values as plotted.</p>
    </div>
  );
}
