import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { startBrowserApp, type BrowserApp } from "../support/browser";
import { ROLES, type Role } from "../../shared/auth/roles";

// What a fresh browser (nothing cached) downloads to sign in and see its home page: the bodies as they
// travel (compressed scripts, styles and API answers; fonts and images as stored). A tablet on a
// shop's Wi-Fi feels every one of them. Headers are counted apart.
const BUDGET = 200 * 1000;

let b: BrowserApp;
beforeAll(async () => {
  b = await startBrowserApp();
});
afterAll(async () => b?.close());

/** What each role's home page asks the server for (src/features/overview/components/home-page.tsx). */
const HOME_ANSWERS: Record<Role, string[]> = {
  mechanic: ["/api/stats/mine"],
  crib: ["/api/stats/dashboard"],
  inspector: ["/api/stats/inspection"],
  quality: ["/api/stats/dashboard", "/api/stats/inspection"],
  auditor: ["/api/stats/dashboard", "/api/stats/inspection"],
  admin: ["/api/stats/dashboard", "/api/stats/inspection"],
};

async function firstLoad(page: Page, role: Role, run: () => Promise<void>) {
  const sizes: Promise<{ url: string; bytes: number; headers: number }>[] = [];
  let pending = 0;
  let lastChange = Date.now();
  page.on("request", () => {
    pending++;
    lastChange = Date.now();
  });
  const settled = () => {
    pending--;
    lastChange = Date.now();
  };
  page.on("requestfailed", settled);
  page.on("requestfinished", (req) => {
    settled();
    // A response the browser took from its own cache reports a size below zero (no body came over the wire):
    // it counts as nothing, never as a deduction from the rest.
    sizes.push(req.sizes().then((s) => ({ url: req.url(), bytes: Math.max(0, s.responseBodySize), headers: Math.max(0, s.responseHeadersSize) })));
  });
  const answers = HOME_ANSWERS[role].map((path) => page.waitForResponse((r) => new URL(r.url()).pathname === path, { timeout: 60_000 }));
  await run();
  await Promise.all(answers);
  // Then whatever the answers make the page load (code split by route, images), until the network is quiet.
  while (pending > 0 || Date.now() - lastChange < 750) await new Promise((r) => setTimeout(r, 100));
  const all = await Promise.all(sizes);
  return { total: all.reduce((n, x) => n + x.bytes, 0), headers: all.reduce((n, x) => n + x.headers, 0), all };
}

describe("first load after sign-in", () => {
  for (const role of ROLES) {
    it(`a ${role}'s first visit, sign-in page to home page, downloads at most 200 kB, compressed, and no source maps`, async () => {
      const { page, context, errors } = await b.newPage();
      try {
        const load = await firstLoad(page, role, async () => {
          await b.signIn(page, role);
          await page.getByRole("heading", { level: 1 }).first().waitFor();
        });
        const scripts = load.all.filter((x) => /\.js(\?|$)/.test(x.url));
        expect(scripts.length).toBeGreaterThan(0);
        expect(load.all.filter((x) => /\.map(\?|$)/.test(x.url))).toEqual([]);
        console.log(`first load ${role}: ${(load.total / 1000).toFixed(1)} kB in ${load.all.length} responses (headers ${(load.headers / 1000).toFixed(1)} kB more)\n${[...load.all].sort((x, y) => y.bytes - x.bytes).map((x) => `  ${x.bytes} ${new URL(x.url).pathname}`).join("\n")}`);
        expect(load.total, load.all.map((x) => `${x.bytes} ${x.url}`).join("\n")).toBeLessThanOrEqual(BUDGET);
        expect(errors).toEqual([]);
      } finally {
        await context.close();
      }
    });
  }

  it("the built client carries no source maps, and its scripts are sent gzip-compressed", async () => {
    const res = await fetch(`${b.baseUrl}/sign-in`, { headers: { "Accept-Encoding": "gzip" } });
    const html = await res.text();
    const script = html.match(/src="(\/assets\/[^"]+\.js)"/)?.[1];
    expect(script).toBeTruthy();
    const js = await fetch(`${b.baseUrl}${script}`, { headers: { "Accept-Encoding": "gzip" } });
    expect(js.headers.get("content-encoding")).toBe("gzip");
    expect(await js.text()).not.toContain("sourceMappingURL");
    const map = await fetch(`${b.baseUrl}${script}.map`);
    expect(map.headers.get("content-type") ?? "").not.toContain("json");
  });
});
