"use client";
// The read-only view behind a viewpoint link: one fault's surface in the saved camera and settings.
// Everything comes from the token-scoped routes under /api/v/[token]; nothing here links into the study.
import { useEffect, useMemo } from "react";
import { useQuery } from "@tanstack/react-query";
import { decodeFaultDisplay } from "@/lib/display/payload";
import type { PublicViewpoint } from "@/lib/contracts/viewpoints";
import { FaultSheet } from "@/components/workspace/FaultSheet";
import { FaultViewer } from "@/components/workspace/FaultViewer";
import { PinText } from "./PinText";
import { applySceneSettings, isBuiltInColourMode, useSceneSettings } from "@/scene/sceneSettingsStore";

class DisplayError extends Error {
  constructor(
    readonly status: number,
    message: string,
  ) {
    super(message);
  }
}

export function SharedViewpoint({ token, data }: { token: string; data: PublicViewpoint }) {
  // settings go into the store before the viewer first renders, so the first frame is already the saved view; the
  // store says which link's settings it holds
  useEffect(() => {
    applySceneSettings(data.viewpoint.settings, token);
  }, [data.viewpoint.settings, token]);
  const settingsApplied = useSceneSettings((state) => state.appliedFrom === token);
  // a shared view loads no analysis fields (stress colourings): only displacement and throw can be shown
  const colourNote = isBuiltInColourMode(data.viewpoint.settings.colourMode)
    ? null
    : `Coloured by displacement: the saved colouring (${data.viewpoint.settings.colourMode}) is not available in a shared view.`;

  const display = useQuery({
    queryKey: ["shared-display", token],
    enabled: data.analysis !== null,
    staleTime: Infinity,
    refetchOnWindowFocus: false,
    retry: false,
    queryFn: async () => {
      const response = await fetch(`/api/v/${encodeURIComponent(token)}/display`, { cache: "no-store" });
      if (!response.ok) {
        const body = await response.json().catch(() => ({}));
        throw new DisplayError(response.status, body.error ?? "The surface could not be loaded.");
      }
      return decodeFaultDisplay(new Uint8Array(await response.arrayBuffer()));
    },
  });

  const pins = useMemo(() => data.pins?.map((pin) => ({ id: pin.id, x: pin.x, y: pin.y, z: pin.z, resolved: pin.state === "resolved" })), [data.pins]);

  return (
    <main className="mx-auto max-w-[1600px] px-4 py-5" data-testid="shared-viewpoint">
      <div className="mb-4">
        <p className="eyebrow">Shared view · read-only</p>
        <h1 className="text-2xl font-semibold" data-testid="shared-fault-name">
          {data.fault.name}
        </h1>
        <p className="text-sm text-slate-600 dark:text-slate-300" data-testid="shared-viewpoint-title">
          {data.viewpoint.title}
        </p>
        {data.viewpoint.note && (
          <p className="mt-1 max-w-3xl whitespace-pre-line text-sm text-slate-500" data-testid="shared-viewpoint-note">
            {data.viewpoint.note}
          </p>
        )}
        {colourNote && <p className="mt-1 text-xs text-slate-500">{colourNote}</p>}
      </div>
      {!data.analysis ? (
        <div className="card p-10 text-center text-sm text-slate-500" data-testid="shared-no-surface">
          This fault has no finished analysis to show yet.
        </div>
      ) : (
        <div className="grid items-start gap-4 xl:grid-cols-[1fr_380px]">
          <div className="card overflow-hidden" data-testid="viewer-card">
            {display.data && settingsApplied ? (
              <FaultViewer display={display.data} pins={pins} initialCamera={data.viewpoint.camera} />
            ) : (
              <div
                className="flex h-[600px] items-center justify-center px-6 text-center text-sm text-slate-500"
                data-testid={display.isError ? "shared-display-error" : undefined}
              >
                {display.isError
                  ? display.error instanceof DisplayError && display.error.status === 410
                    ? `${display.error.message} Reload the page for details.`
                    : display.error.message
                  : "Loading surface…"}
              </div>
            )}
          </div>
          <aside className="card space-y-4 p-4" data-testid="shared-side">
            <p className="text-xs text-slate-500">
              Pick set v{data.analysis.pickSetVersion}
              {data.link.expiresAt ? ` · this link expires ${new Date(data.link.expiresAt).toUTCString()}` : ""}
            </p>
            <FaultSheet report={data.analysis.report} />
            {data.pins && (
              <section data-testid="shared-pins">
                <h2 className="mb-2 text-sm font-semibold">Pinned notes ({data.pins.length})</h2>
                {data.pins.length === 0 ? (
                  <p className="text-sm text-slate-500">No pinned notes on this fault.</p>
                ) : (
                  <ol className="space-y-2 text-sm">
                    {data.pins.map((pin) => (
                      <li key={pin.id} className="rounded-md bg-slate-50 p-2 dark:bg-slate-800/60" data-testid="shared-pin">
                        <div className="mb-0.5 flex items-baseline justify-between gap-2 text-xs">
                          <span className={`font-medium ${pin.state === "resolved" ? "text-slate-400" : "text-slip-700 dark:text-slip-300"}`}>{pin.state}</span>
                          <time className="text-slate-500" dateTime={pin.createdAt}>
                            {new Date(pin.createdAt).toLocaleDateString()}
                          </time>
                        </div>
                        <PinText text={pin.body} />
                        {pin.replies.length > 0 && (
                          <ol className="mt-2 space-y-1.5 border-l-2 border-slate-200 pl-2 dark:border-slate-700" aria-label="Replies">
                            {pin.replies.map((reply, index) => (
                              <li key={index} data-testid="shared-reply">
                                <time className="block text-[11px] text-slate-500" dateTime={reply.createdAt}>
                                  reply · {new Date(reply.createdAt).toLocaleDateString()}
                                </time>
                                <PinText text={reply.body} />
                              </li>
                            ))}
                          </ol>
                        )}
                      </li>
                    ))}
                  </ol>
                )}
              </section>
            )}
          </aside>
        </div>
      )}
    </main>
  );
}
