import { expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "quillon-demo-1";

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/studies$/);
}

export async function openDemoStudy(page: Page) {
  await page.getByRole("link", { name: /Quillon Graben/ }).click();
  await expect(page.getByTestId("study-title")).toHaveText(/Quillon Graben/);
}

/**
 * Decodes a PNG screenshot in the page with a 2D canvas and measures it: the number of distinct RGB colours, and the
 * fraction of its height between the first and last row holding strongly coloured pixels (the surface's colours and
 * the amber tip line; grey ground and slate labels are not), ignoring the legend's column at the left.
 */
export async function pictureStats(page: Page, png: Buffer): Promise<{ distinctColours: number; colouredSpan: number }> {
  return page.evaluate(async (base64) => {
    const image = new Image();
    image.src = `data:image/png;base64,${base64}`;
    await image.decode();
    const canvas = document.createElement("canvas");
    canvas.width = image.width;
    canvas.height = image.height;
    const context = canvas.getContext("2d")!;
    context.drawImage(image, 0, 0);
    const pixels = context.getImageData(0, 0, image.width, image.height).data;
    const colours = new Set<number>();
    for (let index = 0; index < pixels.length; index += 4) colours.add((pixels[index] << 16) | (pixels[index + 1] << 8) | pixels[index + 2]);
    const skipLeft = Math.round(image.width * 0.22);
    let top = -1;
    let bottom = -1;
    for (let y = 0; y < image.height; y++) {
      let coloured = 0;
      for (let x = skipLeft; x < image.width * 0.85; x++) {
        const i = (y * image.width + x) * 4;
        if (Math.max(pixels[i], pixels[i + 1], pixels[i + 2]) - Math.min(pixels[i], pixels[i + 1], pixels[i + 2]) > 60) coloured++;
      }
      if (coloured >= 3) {
        if (top < 0) top = y;
        bottom = y;
      }
    }
    return { distinctColours: colours.size, colouredSpan: top < 0 ? 0 : (bottom - top) / image.height };
  }, png.toString("base64"));
}

/** Counts distinct RGB colours in a PNG screenshot. */
export async function distinctColours(page: Page, png: Buffer): Promise<number> {
  return (await pictureStats(page, png)).distinctColours;
}
