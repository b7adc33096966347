// Browser-side download helpers for the analysis views: text files, and PNGs of Plot charts (SVG serialised onto a canvas).

export function downloadBlob(blob: Blob, fileName: string) {
  const url = URL.createObjectURL(blob);
  const link = document.createElement("a");
  link.href = url;
  link.download = fileName;
  document.body.appendChild(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function downloadText(text: string, fileName: string, type = "text/csv") {
  downloadBlob(new Blob([text], { type: `${type};charset=utf-8` }), fileName);
}

export function downloadDataUrl(dataUrl: string, fileName: string) {
  const link = document.createElement("a");
  link.href = dataUrl;
  link.download = fileName;
  document.body.appendChild(link);
  link.click();
  link.remove();
}

/** The chart's main SVG (the largest one; legends are small separate SVGs). */
export function mainSvg(container: HTMLElement): SVGSVGElement | null {
  let best: SVGSVGElement | null = null;
  let bestArea = -1;
  container.querySelectorAll("svg").forEach((svg) => {
    const area = (Number(svg.getAttribute("width")) || svg.clientWidth) * (Number(svg.getAttribute("height")) || svg.clientHeight);
    if (area > bestArea) {
      best = svg;
      bestArea = area;
    }
  });
  return best;
}

/** Renders an SVG element to a PNG data URL at `scale` × its size, on the page's background colour. */
export async function svgToPngDataUrl(svg: SVGSVGElement, scale = 2, background = "#ffffff"): Promise<string> {
  const width = Number(svg.getAttribute("width")) || svg.clientWidth;
  const height = Number(svg.getAttribute("height")) || svg.clientHeight;
  const clone = svg.cloneNode(true) as SVGSVGElement;
  clone.setAttribute("xmlns", "http://www.w3.org/2000/svg");
  // Plot draws with currentColor; pin it to the colour the chart shows on screen
  clone.style.color = getComputedStyle(svg).color || "#0f172a";
  const source = new XMLSerializer().serializeToString(clone);
  const image = new Image();
  image.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(source)}`;
  await image.decode();
  const canvas = document.createElement("canvas");
  canvas.width = Math.round(width * scale);
  canvas.height = Math.round(height * scale);
  const context = canvas.getContext("2d")!;
  context.fillStyle = background;
  context.fillRect(0, 0, canvas.width, canvas.height);
  context.drawImage(image, 0, 0, canvas.width, canvas.height);
  return canvas.toDataURL("image/png");
}

/** Where the workspace leaves the composed 3D picture for the printable report of that analysis. */
export const REPORT_PICTURE_KEY = (faultId: string, analysisId: string) => `slipfield:report-picture:${faultId}:${analysisId}`;
