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

/** Counts distinct RGB colours in a PNG screenshot by decoding it in the page with a 2D canvas. */
export async function distinctColours(page: Page, png: Buffer): Promise<number> {
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
    return colours.size;
  }, png.toString("base64"));
}
