// The 3D view as a picture that stands alone (for the PNG export and the printable report): the canvas as shown, with
// its segment, peak and depth labels and the orientation marker drawn where they are on screen, a title above and, below,
// the colour legend with units, the line keys and the scale bar. Drawn with the 2D canvas API from what the viewer
// shows (the legend's data-* attributes, the overlay store), so it matches the screen.
import { legendTicks, niceStep, surfaceInterpolator } from "@/scene/geometry";
import { useOverlayStore } from "@/scene/overlayStore";
import { useSceneSettings } from "@/scene/sceneSettingsStore";
import { svgImage } from "@/components/analysis-views/download";
import { metres } from "@/lib/format";

const HEADER_PX = 46;
const FOOTER_PX = 64;

/** The picture's colours follow the theme it was taken in (the lines in the view do too). */
const PALETTES = {
  light: {
    page: "#ffffff",
    groundTop: "#f1f5f9",
    groundBottom: "#e2e8f0",
    ink: "#0f172a",
    muted: "#475569",
    rule: "#e2e8f0",
    limit: "#334155",
    disc: "rgba(255,255,255,0.85)",
    discRing: "#cbd5e1",
    chip: "rgba(255,255,255,0.9)",
    chipRing: "#cbd5e1",
  },
  dark: {
    page: "#0f172a",
    groundTop: "#0f172a",
    groundBottom: "#020617",
    ink: "#f1f5f9",
    muted: "#94a3b8",
    rule: "#1e293b",
    limit: "#cbd5e1",
    disc: "rgba(15,23,42,0.85)",
    discRing: "#334155",
    chip: "rgba(15,23,42,0.9)",
    chipRing: "#475569",
  },
};
// the app's own fonts (next/font gives them generated family names)
const fontFamily = (element: Element, fallback: string) => getComputedStyle(element).fontFamily || fallback;

function roundedRect(context: CanvasRenderingContext2D, x: number, y: number, width: number, height: number, radius: number) {
  context.beginPath();
  context.roundRect(x, y, width, height, radius);
}

const nextFrame = () => new Promise((resolve) => requestAnimationFrame(resolve));

/** True once the 3D view has drawn its first frame (FaultScene raises the flag), waiting up to 8 s. */
async function sceneShown(): Promise<boolean> {
  const until = performance.now() + 8_000;
  while (!window.__slipfieldSceneReady) {
    if (performance.now() > until) return false;
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
  await nextFrame();
  await nextFrame();
  return true;
}

/**
 * A PNG data URL of the 3D view inside `frame` (the viewer's element marked data-scene-frame), titled `title`; null when
 * there is no canvas to read.
 */
export async function composeScenePicture(frame: HTMLElement, title: string): Promise<string | null> {
  // a view switched on a moment ago has no frame yet (and its canvas not its final size): wait for the first frame
  if (!(await sceneShown())) return null;
  const sceneCanvas = frame.querySelector("canvas");
  if (!sceneCanvas || sceneCanvas.clientWidth === 0) return null;
  const widthPx = sceneCanvas.clientWidth;
  const heightPx = sceneCanvas.clientHeight;
  const scale = Math.max(1, sceneCanvas.width / widthPx);
  const out = document.createElement("canvas");
  out.width = Math.round(widthPx * scale);
  out.height = Math.round((HEADER_PX + heightPx + FOOTER_PX) * scale);
  const context = out.getContext("2d");
  if (!context) return null;
  const colours = document.documentElement.classList.contains("dark") ? PALETTES.dark : PALETTES.light;
  const INK = colours.ink;
  const MUTED = colours.muted;
  const FONT = fontFamily(frame, "system-ui, sans-serif");
  const mono = frame.querySelector(".num, .font-mono");
  const MONO = mono ? fontFamily(mono, "ui-monospace, monospace") : "ui-monospace, monospace";
  context.scale(scale, scale);
  context.fillStyle = colours.page;
  context.fillRect(0, 0, widthPx, HEADER_PX + heightPx + FOOTER_PX);

  // the view, on the viewer's ground
  const ground = context.createLinearGradient(0, HEADER_PX, 0, HEADER_PX + heightPx);
  ground.addColorStop(0, colours.groundTop);
  ground.addColorStop(1, colours.groundBottom);
  context.fillStyle = ground;
  context.fillRect(0, HEADER_PX, widthPx, heightPx);
  try {
    context.drawImage(sceneCanvas, 0, HEADER_PX, widthPx, heightPx);
  } catch {
    return null;
  }
  const origin = sceneCanvas.getBoundingClientRect();
  const at = (element: Element) => {
    const box = element.getBoundingClientRect();
    return { x: box.left - origin.left, y: box.top - origin.top + HEADER_PX, width: box.width, height: box.height };
  };

  // labels where they are on screen
  context.textBaseline = "middle";
  for (const element of frame.querySelectorAll<HTMLElement>("[data-scene-label]")) {
    const box = at(element);
    if (box.width === 0 || box.x + box.width < 0 || box.x > widthPx || box.y < HEADER_PX || box.y > HEADER_PX + heightPx) continue;
    const kind = element.dataset.sceneLabel;
    const text = element.textContent?.trim() ?? "";
    if (kind === "segment") {
      roundedRect(context, box.x, box.y, box.width, box.height, 4);
      context.fillStyle = colours.chip;
      context.fill();
      context.strokeStyle = colours.chipRing;
      context.stroke();
      context.fillStyle = INK;
      context.font = `600 12px ${FONT}`;
      context.textAlign = "center";
      context.fillText(text, box.x + box.width / 2, box.y + box.height / 2);
    } else if (kind === "peak") {
      roundedRect(context, box.x, box.y, box.width, box.height, 3);
      context.fillStyle = "rgba(15,23,42,0.8)";
      context.fill();
      context.fillStyle = "#ffffff";
      context.font = `500 11px ${FONT}`;
      context.textAlign = "center";
      context.fillText(text, box.x + box.width / 2, box.y + box.height / 2);
    } else {
      context.fillStyle = MUTED;
      context.font = `10px ${MONO}`;
      context.textAlign = "right";
      context.fillText(text, box.x + box.width - 10, box.y + box.height / 2);
    }
  }

  // orientation marker, on its disc
  const marker = frame.querySelector<SVGSVGElement>('[data-testid="orientation-marker"]');
  if (marker) {
    const box = at(marker);
    context.beginPath();
    context.arc(box.x + box.width / 2, box.y + box.height / 2, box.width / 2, 0, Math.PI * 2);
    context.fillStyle = colours.disc;
    context.fill();
    context.strokeStyle = colours.discRing;
    context.stroke();
    try {
      context.drawImage(await svgImage(marker), box.x, box.y, box.width, box.height);
    } catch {
      // the marker is a convenience; the picture stands without it
    }
  }

  // title
  const { exaggeration } = useSceneSettings.getState();
  context.textAlign = "left";
  context.textBaseline = "alphabetic";
  context.fillStyle = INK;
  context.font = `600 15px ${FONT}`;
  context.fillText(title, 12, 21);
  context.fillStyle = MUTED;
  context.font = `12px ${FONT}`;
  context.fillText(
    `3D view in perspective${exaggeration > 0 ? `, displacement drawn as relief ×${exaggeration.toFixed(1)}` : ", flat on the fault plane"}; depths below datum; view as saved from the workspace.`,
    12,
    38,
  );

  // footer: colour bar with its ticks and units, line keys, scale bar
  const legend = frame.querySelector<HTMLElement>('[data-testid="legend"]');
  const footerTop = HEADER_PX + heightPx;
  context.strokeStyle = colours.rule;
  context.beginPath();
  context.moveTo(0, footerTop + 0.5);
  context.lineTo(widthPx, footerTop + 0.5);
  context.stroke();
  if (legend) {
    const low = Number(legend.dataset.low);
    const high = Number(legend.dataset.high);
    const reversed = legend.dataset.reversed === "1";
    const barX = 12;
    const barY = footerTop + 24;
    const barWidth = Math.min(260, widthPx * 0.32);
    context.fillStyle = INK;
    context.font = `600 11px ${FONT}`;
    context.fillText(legend.dataset.title ?? "", barX, footerTop + 16);
    const gradient = context.createLinearGradient(barX, 0, barX + barWidth, 0);
    for (let i = 0; i <= 10; i++) gradient.addColorStop(i / 10, surfaceInterpolator(reversed ? 1 - i / 10 : i / 10));
    context.fillStyle = gradient;
    context.fillRect(barX, barY, barWidth, 10);
    context.font = `10px ${MONO}`;
    context.textAlign = "center";
    context.fillStyle = MUTED;
    if (high > low) {
      for (const tick of legendTicks(low, high, 6)) {
        const x = barX + ((tick - low) / (high - low)) * barWidth;
        context.fillRect(x - 0.5, barY + 10, 1, 3);
        context.fillText(tick.toLocaleString("en", { maximumFractionDigits: 2 }), x, barY + 23);
      }
    }
    context.textAlign = "left";
    const keysX = barX + barWidth + 28;
    context.font = `11px ${FONT}`;
    context.fillStyle = "#f08c00";
    context.fillRect(keysX, footerTop + 14, 18, 4);
    context.fillStyle = MUTED;
    context.fillText("inferred tip line", keysX + 24, footerTop + 19);
    context.strokeStyle = colours.limit;
    context.setLineDash([4, 3]);
    context.lineWidth = 2;
    context.beginPath();
    context.moveTo(keysX, footerTop + 32);
    context.lineTo(keysX + 18, footerTop + 32);
    context.stroke();
    context.setLineDash([]);
    context.lineWidth = 1;
    context.fillText("mapped limit of the picks", keysX + 24, footerTop + 35);
    context.fillText(legend.dataset.contours ?? "", keysX, footerTop + 52);
  }
  const metresPerPixel = useOverlayStore.getState().metresPerPixel;
  if (metresPerPixel) {
    const lengthM = niceStep(metresPerPixel * 120);
    const barPx = lengthM / metresPerPixel;
    const right = widthPx - 12;
    context.strokeStyle = INK;
    context.lineWidth = 2;
    context.beginPath();
    context.moveTo(right - barPx, footerTop + 14);
    context.lineTo(right - barPx, footerTop + 22);
    context.lineTo(right, footerTop + 22);
    context.lineTo(right, footerTop + 14);
    context.stroke();
    context.lineWidth = 1;
    context.fillStyle = INK;
    context.font = `11px ${MONO}`;
    context.textAlign = "right";
    context.fillText(`${metres(lengthM, 0)} at the centre of view`, right, footerTop + 38);
  }
  return out.toDataURL("image/png");
}
