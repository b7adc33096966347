"use client";
import { useState } from "react";
import { composeScenePicture } from "@/components/workspace/scenePicture";
import { downloadDataUrl, REPORT_PICTURE_KEY } from "./download";

const EXPORTS = [
  {
    kind: "grid.csv",
    label: "Grid CSV",
    detail:
      "segment, s, t, x, y, z (on the fault surface), displacement, throw, offset from the plane, local dip and strike — every node with data, full resolution (recomputed on the server); the study's coordinate reference in a comment line",
  },
  { kind: "picks.csv", label: "Picks CSV", detail: "each pick with s, t, displacement, the surface value there and the residual" },
  { kind: "profiles.csv?mode=centre-line", label: "Strike profiles CSV (centre line)", detail: "full-resolution row through each segment's Dmax" },
  { kind: "profiles.csv?mode=column-max", label: "Strike profiles CSV (column maximum)", detail: "maximum displacement in each grid column" },
  {
    kind: "contours.geojson",
    label: "GeoJSON",
    detail:
      "contours, inferred tip lines and mapped limits as 3D lines [x, y, z] on the fault surface in map metres, with level, kind, units and the study's coordinate reference",
  },
  {
    kind: "surface.glb",
    label: "3D model (glTF)",
    detail:
      "the displacement surface with viridis vertex colours and the tip lines, glTF 2.0 binary in world coordinates (origin, axes and coordinate reference in its extras)",
  },
];

/** The 3D view with its labels, legend, title and scale bar, or null when the viewer is not on the page. */
async function scenePicture(faultName: string): Promise<string | null> {
  const frame = document.querySelector<HTMLElement>("[data-scene-frame]");
  return frame ? composeScenePicture(frame, `${faultName}: displacement surface`) : null;
}

export function ExportView({
  studyId,
  faultId,
  faultName,
  stem,
  analysisId,
}: {
  studyId: string;
  faultId: string;
  faultName: string;
  stem: string;
  analysisId: string;
}) {
  const [message, setMessage] = useState<string | null>(null);
  const withAnalysis = (kind: string) => `/api/faults/${faultId}/export/${kind}${kind.includes("?") ? "&" : "?"}analysis=${encodeURIComponent(analysisId)}`;

  async function scenePng() {
    const url = await scenePicture(faultName);
    if (!url) return setMessage("The 3D view is not on the page (it needs WebGL, and the 3D surface view); use the chart PNG buttons instead.");
    downloadDataUrl(url, `${stem}-3d-view.png`);
    setMessage(null);
  }

  async function openReport() {
    // open the tab at once (a popup opened after an await can be blocked), then hand it the picture through storage
    const reportTab = window.open("about:blank", "_blank");
    const url = await scenePicture(faultName);
    try {
      if (url) localStorage.setItem(REPORT_PICTURE_KEY(faultId, analysisId), url);
      else localStorage.removeItem(REPORT_PICTURE_KEY(faultId, analysisId));
    } catch {
      // storage full or disabled: the report shows its 2D figures only
    }
    const address = `/studies/${studyId}/faults/${faultId}/report?analysis=${encodeURIComponent(analysisId)}`;
    if (reportTab) reportTab.location.href = address;
    else window.location.href = address;
  }

  return (
    <div className="space-y-4" data-testid="export-view">
      <ul className="space-y-2 text-sm">
        {EXPORTS.map((item) => (
          <li key={item.kind} className="flex flex-wrap items-baseline gap-2">
            <a className="btn-quiet px-2 py-1 text-sm" href={withAnalysis(item.kind)} download data-testid={`export-${item.kind.replace(/[?=]/g, "-")}`}>
              {item.label}
            </a>
            <span className="text-xs text-slate-500">{item.detail}</span>
          </li>
        ))}
        <li className="flex flex-wrap items-baseline gap-2">
          <button type="button" className="btn-quiet px-2 py-1 text-sm" onClick={() => void scenePng()} data-testid="export-3d-png">
            3D view PNG
          </button>
          <span className="text-xs text-slate-500">the 3D view as it is on screen now, with its labels, a title, the colour legend and the scale bar</span>
        </li>
        <li className="flex flex-wrap items-baseline gap-2">
          <button type="button" className="btn-primary px-2 py-1 text-sm" onClick={() => void openReport()} data-testid="open-report">
            Printable fault report
          </button>
          <span className="text-xs text-slate-500">
            fault sheet, contour map, the current 3D picture, strike profile, scaling chart, relays, pins, caution and data provenance
          </span>
        </li>
      </ul>
      {message && <p className="text-sm text-amber-800 dark:text-amber-200">{message}</p>}
      <p className="text-xs text-slate-500">Every chart has its own PNG button; profiles also have a CSV button for the values as plotted.</p>
    </div>
  );
}
