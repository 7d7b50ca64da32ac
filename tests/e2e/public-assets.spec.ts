// public/: the icons, the web app manifest (an owner adds their pieces to a phone's home screen) and
// robots.txt, served by the production build and linked from every page's head.
import { expect, test } from "@playwright/test";

test("the manifest, its icons, the favicon and robots.txt are served", async ({ request }) => {
  const res = await request.get("/manifest.webmanifest");
  expect(res.status()).toBe(200);
  const manifest = (await res.json()) as { name: string; start_url: string; display: string; icons: { src: string; sizes: string; type: string }[] };
  expect(manifest.start_url).toBe("/pieces");
  expect(manifest.display).toBe("standalone");
  expect(manifest.icons.map((i) => i.sizes)).toEqual(expect.arrayContaining(["192x192", "512x512"]));
  for (const icon of manifest.icons) {
    const r = await request.get(icon.src);
    expect(r.status(), icon.src).toBe(200);
    expect(r.headers()["content-type"]).toContain(icon.type);
  }
  const fav = await request.get("/favicon.ico");
  expect(fav.status()).toBe(200);
  expect((await fav.body()).subarray(0, 4)).toEqual(Buffer.from([0, 0, 1, 0]));
  const robots = await request.get("/robots.txt");
  expect(robots.status()).toBe(200);
  expect(await robots.text()).toMatch(/Disallow: \//);
});

test("every page links the manifest and the touch icon", async ({ page }) => {
  await page.goto("/");
  await expect(page.locator('link[rel="manifest"]')).toHaveAttribute("href", "/manifest.webmanifest");
  await expect(page.locator('link[rel="apple-touch-icon"]')).toHaveAttribute("href", /apple-touch-icon\.png/);
});
