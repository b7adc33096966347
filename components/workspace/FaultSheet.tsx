"use client";
import type { AnalysisReport, SegmentResult } from "@/lib/engine/types";
import { LINKAGE_BASIS } from "@/lib/engine/relays";
import { CautionNote } from "./CautionNote";
import type { PickSetProvenance } from "@/lib/contracts/seal";
import { describeVelocityModel, DEPTH_CONVERSION_CAUTION, type VelocityModel } from "@/lib/engine/time-depth";
import { azimuth, degrees, endsSentence, metres, metresWithRange, MODEL_NAMES, plain, ratio } from "@/lib/format";

function Row({ label, value, testId }: { label: string; value: string; testId?: string }) {
  return (
    <div className="flex items-baseline justify-between gap-3 py-1">
      <dt className="text-slate-500 dark:text-slate-400">{label}</dt>
      <dd className="num whitespace-nowrap text-right" data-testid={testId}>
        {value}
      </dd>
    </div>
  );
}

function SegmentSheet({ segment, first }: { segment: SegmentResult; first: boolean }) {
  const tip = segment.tipLine;
  return (
    <section className="space-y-3" data-testid={`sheet-${segment.id}`}>
      <h3 className="flex items-center justify-between text-sm font-semibold">
        <span>Segment {segment.id}</span>
        <span className="text-xs font-normal text-slate-500">{segment.pickCount.toLocaleString("en")} picks</span>
      </h3>
      <dl className="divide-y divide-slate-100 text-sm dark:divide-slate-800">
        <Row label="Dmax (displacement), observed" value={metres(segment.max.displacementM)} testId={first ? "sheet-dmax" : undefined} />
        {segment.max.fittedDisplacementM !== undefined && (
          <Row
            label="Dmax, fitted (5–95 %)"
            value={metresWithRange(segment.max.fittedDisplacementM, segment.max.fittedDisplacementRangeM)}
            testId={first ? "sheet-dmax-fitted" : undefined}
          />
        )}
        <Row label="Max throw" value={metres(segment.max.throwM)} />
        <Row
          label="Length L (tip line along the surface, 5–95 %)"
          value={metresWithRange(tip.lengthM, tip.lengthRangeM)}
          testId={first ? "sheet-length" : undefined}
        />
        <Row
          label="Height H (tip line along the surface, 5–95 %)"
          value={metresWithRange(tip.heightM, tip.heightRangeM)}
          testId={first ? "sheet-height" : undefined}
        />
        {tip.cutoff && (
          <Row
            label={`Resolution cut-off (${tip.cutoff.source === "set" ? "set" : "estimated"})`}
            value={`${metres(tip.cutoff.displacementM)} displacement`}
            testId={first ? "sheet-cutoff" : undefined}
          />
        )}
        <Row label="Aspect ratio L/H" value={plain(tip.aspectRatio)} />
        <Row label="Area" value={`${(tip.areaM2 / 1e6).toFixed(2)} km²`} />
        <Row label="Dmax/L" value={ratio(segment.scaling.dOverL)} />
        <Row label="Mapped length / height" value={`${metres(segment.mappedLimit.lengthM, 0)} / ${metres(segment.mappedLimit.heightM, 0)}`} />
        <Row label="Strike / dip (reference plane)" value={`${azimuth(segment.plane.strikeDeg)} / ${degrees(segment.plane.dipDeg)}`} />
        <Row label="Plane misfit (RMS)" value={metres(segment.plane.rmsM)} />
        {segment.surface && (
          <>
            <Row
              label="Surface off the plane, max / RMS"
              value={`${metres(segment.surface.maxOffsetM)} / ${metres(segment.surface.rmsOffsetM)}`}
              testId={first ? "sheet-surface-offset" : undefined}
            />
            <Row
              label="Local dip (5–95 %)"
              value={`${degrees(segment.surface.localDipRangeDeg[0])} – ${degrees(segment.surface.localDipRangeDeg[1])}`}
              testId={first ? "sheet-local-dip" : undefined}
            />
          </>
        )}
        <Row label="Mean / max gradient (m/m)" value={`${plain(segment.gradients.meanPerM, 3)} / ${plain(segment.gradients.maxPerM, 3)}`} />
        <Row
          label="Tip gradients, strike ends (m/m)"
          value={`${plain(segment.gradients.tips.strikeStartPerM, 3)} / ${plain(segment.gradients.tips.strikeEndPerM, 3)}`}
        />
        <Row
          label="Tip gradients, up / down dip (m/m)"
          value={`${plain(segment.gradients.tips.upDipPerM, 3)} / ${plain(segment.gradients.tips.downDipPerM, 3)}`}
        />
        <Row label="Peak offset s / t (× half-axis)" value={`${plain(segment.asymmetry.alongStrike)} / ${plain(segment.asymmetry.downDip)}`} />
      </dl>
      <div className="rounded-lg bg-slate-50 p-3 text-xs leading-relaxed text-slate-600 dark:bg-slate-950 dark:text-slate-300">
        <p>
          <span className="font-medium text-slate-800 dark:text-slate-100">Tip line:</span>{" "}
          {tip.selection
            ? `${asSentence(tip.method)} ${tip.selection}`
            : `${MODEL_NAMES[tip.model] ?? tip.model}, ±${metres(tip.uncertaintyM, 0)}. ${asSentence(tip.method)}`}
        </p>
        {tip.ends && (
          <p className="mt-1.5" data-testid={first ? "sheet-ends" : undefined}>
            <span className="font-medium text-slate-800 dark:text-slate-100">Ends:</span> {endsSentence(tip.ends)}.
            {tip.ends.some((end) => end.status === "open") &&
              " Where an end is open the picks stop while displacement is still high (a survey edge, a crossing fault, a gap): the fault goes on beyond it, so the length or height is a minimum."}
          </p>
        )}
        {segment.surface && (
          <p className={`mt-1.5 ${segment.surface.matters ? "text-amber-800 dark:text-amber-200" : ""}`} data-testid={first ? "sheet-surface-note" : undefined}>
            <span className="font-medium text-slate-800 dark:text-slate-100">Surface:</span> {segment.surface.note}
          </p>
        )}
        <p className="mt-1.5">
          <span className="font-medium text-slate-800 dark:text-slate-100">Scaling:</span> {segment.scaling.note}
        </p>
        {segment.plane.planarityWarning && <p className="mt-1.5 text-amber-700 dark:text-amber-300">{segment.plane.planarityWarning}</p>}
      </div>
    </section>
  );
}

/** Where the picks came from when they were not picked in depth: the cut-off file, the velocity model, the caution. */
function InputProvenance({ velocityModel, derivedFrom }: { velocityModel: VelocityModel | null; derivedFrom: PickSetProvenance | null }) {
  if (!velocityModel && !derivedFrom) return null;
  return (
    <section
      className="space-y-1.5 rounded-lg bg-slate-50 p-3 text-xs leading-relaxed text-slate-600 dark:bg-slate-950 dark:text-slate-300"
      data-testid="sheet-input"
    >
      {derivedFrom && (
        <p data-testid="sheet-derived">
          <span className="font-medium text-slate-800 dark:text-slate-100">Picks derived from cut-off lines:</span> {derivedFrom.fileName} (checksum{" "}
          {derivedFrom.checksum.slice(0, 12)}…), hanging-wall and footwall cut-offs paired every {metres(derivedFrom.stationSpacingM, 0)} along strike (
          {derivedFrom.stationSpacingSource === "set" ? "spacing set at upload" : "spacing from the vertex spacing"}); throw is their vertical separation, heave
          their horizontal one
          {derivedFrom.rakeDeg === 90 ? ", displacement along the dip (dip slip assumed)" : `, displacement along a rake of ${derivedFrom.rakeDeg}°`}.
        </p>
      )}
      {velocityModel && (
        <>
          <p data-testid="sheet-velocity">
            <span className="font-medium text-slate-800 dark:text-slate-100">Depth-converted from two-way time</span> with{" "}
            {describeVelocityModel(velocityModel)}. Every length here is in depth; nothing was measured in time.
          </p>
          <p className="text-amber-800 dark:text-amber-200" data-testid="sheet-depth-caution">
            {DEPTH_CONVERSION_CAUTION}
          </p>
        </>
      )}
    </section>
  );
}

export function FaultSheet({
  report,
  velocityModel = null,
  derivedFrom = null,
}: {
  report: AnalysisReport;
  velocityModel?: VelocityModel | null;
  derivedFrom?: PickSetProvenance | null;
}) {
  return (
    <div className="space-y-5">
      {report.kinematics && (
        <p className="text-xs leading-relaxed text-slate-600 dark:text-slate-300" data-testid="sheet-sense">
          <span className="font-medium text-slate-800 dark:text-slate-100">Sense:</span> {report.kinematics.note}
        </p>
      )}
      <InputProvenance velocityModel={velocityModel} derivedFrom={derivedFrom} />
      {report.segments.map((segment, index) => (
        <SegmentSheet key={segment.id} segment={segment} first={index === 0} />
      ))}
      {report.relays.length > 0 && (
        <section>
          <h3 className="mb-2 text-sm font-semibold">Relays</h3>
          <table className="w-full text-xs" data-testid="relay-table">
            <thead className="text-left text-slate-500">
              <tr>
                <th className="py-1 font-medium">Pair</th>
                <th className="py-1 text-right font-medium">Overlap</th>
                <th className="py-1 text-right font-medium">Separation</th>
                <th className="py-1 text-right font-medium">O/S</th>
                <th className="py-1 text-right font-medium">Linkage</th>
              </tr>
            </thead>
            <tbody>
              {report.relays.map((relay) => (
                <tr key={relay.segments.join("-")} className="border-t border-slate-100 dark:border-slate-800">
                  <td className="py-1">{relay.segments.join(" – ")}</td>
                  <td className="num py-1 text-right">{metres(relay.overlapM, 0)}</td>
                  <td className="num py-1 text-right">{metres(relay.separationM, 0)}</td>
                  <td className="num py-1 text-right">{plain(relay.overlapToSeparation, 1)}</td>
                  <td className="py-1 text-right">{relay.linkage}-linked</td>
                </tr>
              ))}
            </tbody>
          </table>
          {report.relays.map((relay) => (
            <p key={relay.segments.join("-")} className="mt-2 text-xs leading-relaxed text-slate-600 dark:text-slate-300" data-testid="relay-evidence">
              <span className="font-medium text-slate-800 dark:text-slate-100">{relay.segments.join(" – ")}, evidence:</span> {relay.evidence}{" "}
              {relay.comparison}
            </p>
          ))}
          <p className="mt-2 text-xs leading-relaxed text-slate-500" data-testid="relay-basis">
            {report.relays[0].basis ?? LINKAGE_BASIS}
          </p>
        </section>
      )}
      <p className="text-xs leading-relaxed text-slate-600 dark:text-slate-300" data-testid="sheet-quality">
        <span className="font-medium text-slate-800 dark:text-slate-100">Pick quality:</span>{" "}
        {report.quality?.note ??
          "This analysis was made before pick quality was used, so every pick counted fully; re-run it to weight picks by their quality."}
      </p>
      {report.warnings.length > 0 && (
        <ul className="list-disc space-y-1 pl-4 text-xs text-amber-700 dark:text-amber-300">
          {report.warnings.map((warning) => (
            <li key={warning}>{warning}</li>
          ))}
        </ul>
      )}
      <CautionNote compact />
    </div>
  );
}

/** A lower-case phrase from the engine's report as a sentence of its own. */
const asSentence = (phrase: string) => `${phrase.charAt(0).toUpperCase()}${phrase.slice(1)}${/[.!?]$/.test(phrase) ? "" : "."}`;
