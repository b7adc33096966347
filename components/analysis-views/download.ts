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

/** An SVG element as a decoded image (for drawing on a canvas); `color` pins what the SVG draws with currentColor. */
export async function svgImage(svg: SVGSVGElement, color?: string): Promise<HTMLImageElement> {
  const clone = svg.cloneNode(true) as SVGSVGElement;
  clone.setAttribute("xmlns", "http://www.w3.org/2000/svg");
  clone.style.color = color ?? (getComputedStyle(svg).color || "#0f172a");
  const image = new Image();
  image.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(new XMLSerializer().serializeToString(clone))}`;
  await image.decode();
  return image;
}

const svgSize = (svg: SVGSVGElement) => ({
  width: Number(svg.getAttribute("width")) || svg.clientWidth,
  height: Number(svg.getAttribute("height")) || svg.clientHeight,
});

/**
 * A chart as a picture that stands alone: its title, its legends (colour ramps, and swatches with their labels) and the
 * plot, as one PNG data URL at `scale` × its size on the page's ground colour. Null when the chart has not been drawn.
 */
export async function figurePngDataUrl(holder: HTMLElement, title: string, dark: boolean, scale = 2): Promise<string | null> {
  const plot = mainSvg(holder);
  if (!plot) return null;
  const ink = getComputedStyle(plot).color || (dark ? "#e2e8f0" : "#0f172a");
  const ground = dark ? "#0f172a" : "#ffffff";
  const font = getComputedStyle(holder).fontFamily || "sans-serif";
  const { width, height } = svgSize(plot);
  const ramps = [...holder.querySelectorAll<SVGSVGElement>("svg")].filter((svg) => svg !== plot && !svg.closest('[class$="-swatch"]'));
  const swatches = [...holder.querySelectorAll<HTMLElement>('[class$="-swatch"]')].map((swatch) => ({
    colour: swatch.querySelector("svg")?.getAttribute("fill") ?? swatch.querySelector("svg")?.getAttribute("stroke") ?? ink,
    label: swatch.textContent?.trim() ?? "",
  }));

  // lay the swatches out in rows across the plot's width
  const measure = document.createElement("canvas").getContext("2d")!;
  measure.font = `12px ${font}`;
  const rows: { colour: string; label: string; x: number }[][] = [[]];
  let x = 0;
  for (const swatch of swatches) {
    const itemWidth = 20 + measure.measureText(swatch.label).width + 14;
    if (x > 0 && x + itemWidth > width) {
      rows.push([]);
      x = 0;
    }
    rows.at(-1)!.push({ ...swatch, x });
    x += itemWidth;
  }
  const titleHeight = 24;
  const swatchHeight = swatches.length ? rows.length * 20 + 4 : 0;
  const rampImages = await Promise.all(ramps.map((svg) => svgImage(svg, ink)));
  const rampHeight = ramps.reduce((sum, svg) => sum + svgSize(svg).height + 4, 0);
  const pad = 10;
  const canvas = document.createElement("canvas");
  canvas.width = Math.round((width + 2 * pad) * scale);
  canvas.height = Math.round((titleHeight + swatchHeight + rampHeight + height + 2 * pad) * scale);
  const context = canvas.getContext("2d")!;
  context.scale(scale, scale);
  context.fillStyle = ground;
  context.fillRect(0, 0, width + 2 * pad, titleHeight + swatchHeight + rampHeight + height + 2 * pad);
  context.translate(pad, pad);
  context.fillStyle = ink;
  context.font = `600 14px ${font}`;
  context.textBaseline = "middle";
  context.fillText(title, 0, titleHeight / 2);
  context.font = `12px ${font}`;
  rows.forEach((row, index) => {
    const y = titleHeight + index * 20 + 10;
    for (const item of row) {
      context.fillStyle = item.colour;
      context.fillRect(item.x, y - 7, 14, 14);
      context.fillStyle = ink;
      context.fillText(item.label, item.x + 20, y);
    }
  });
  let y = titleHeight + swatchHeight;
  ramps.forEach((svg, index) => {
    const size = svgSize(svg);
    context.drawImage(rampImages[index], 0, y, size.width, size.height);
    y += size.height + 4;
  });
  context.drawImage(await svgImage(plot, ink), 0, y, width, height);
  return canvas.toDataURL("image/png");
}

/** Where the workspace leaves the composed 3D picture for the printable report of that analysis. */
export const REPORT_PICTURE_KEY = (faultId: string, analysisId: string) => `slipfield:report-picture:${faultId}:${analysisId}`;
