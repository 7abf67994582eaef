import fs from "node:fs";
import path from "node:path";
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { startBrowserApp, SCREENSHOT_DIR, type BrowserApp } from "../support/browser";
import { can, ROLES, type Role } from "../../shared/auth/roles";

// Every page each role can reach — its menu, and the demo records those pages open — read on a desktop
// (1440 px) and a phone (390 px) held in portrait:
// - axe-core runs the WCAG 2 A and AA rules (wcag2a, wcag2aa, wcag21a, wcag21aa; not its experimental ones) on each; any serious or
//   critical violation fails, named by page, rule and element (colour contrast is 4.5:1 for text and 3:1
//   for large text, WCAG 2.1 success criterion 1.4.3);
// - the page may not scroll sideways: the document is no wider than the window (a table may scroll
//   inside its own box);
// - a full-page screenshot of each lands in test-results/screenshots/<role>/<page>-<width>.png.
// One page load serves all three checks at 1440 px; the same page is then narrowed to 390 px.

const require = createRequire(import.meta.url);
const AXE_SOURCE = fs.readFileSync(require.resolve("axe-core/axe.min.js"), "utf8");
const WIDTHS = [
  { width: 1440, height: 900 },
  { width: 390, height: 844 },
] as const;

interface AxeNode {
  target: string[];
  html: string;
  failureSummary?: string;
}
interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: AxeNode[];
}

/** Every problem found, also written as it is found (a long run can be read before it ends). */
const PROBLEM_LOG = path.resolve("test-results/legibility-problems.txt");

let b: BrowserApp;
beforeAll(async () => {
  fs.mkdirSync(path.dirname(PROBLEM_LOG), { recursive: true });
  fs.writeFileSync(PROBLEM_LOG, "");
  b = await startBrowserApp();
}, 300_000);
afterAll(async () => b?.close());

/** A page of the app: its address and the file name of its screenshots. */
interface Visit {
  path: string;
  name: string;
}

/** Items of a list answer (a page of items or a plain array), or none when the role may not read it. */
async function listOf<T>(page: Page, url: string): Promise<T[]> {
  const res = await page.request.get(url);
  if (!res.ok()) return [];
  const body = (await res.json()) as T[] | { items: T[] };
  return Array.isArray(body) ? body : body.items;
}

/** The role's menu, then the demo records its list pages open (read with the role's own session). */
async function pagesOf(page: Page, role: Role): Promise<Visit[]> {
  const nav = page.getByRole("navigation", { name: "Main" });
  const hrefs = await nav.getByRole("link").evaluateAll((links) => links.map((a) => new URL((a as HTMLAnchorElement).href).pathname));
  const menu = [...new Set(hrefs)];
  const visits: Visit[] = menu.map((p) => ({ path: p, name: p === "/" ? "overview" : p.slice(1).replaceAll("/", "-") }));
  const add = (p: string, name: string) => visits.push({ path: p, name });
  const has = (p: string) => menu.includes(p);

  // One demo record of each kind (pages of a kind share their components), chosen to show the most.
  if (has("/tools")) {
    add("/tools/MIC-0104", "tool-MIC-0104");
    if (can(role, "tools.write")) add("/tools/new", "tools-new");
    if (can(role, "calibrations.write")) add("/tools/MIC-0101/calibrate", "tool-MIC-0101-calibrate");
    if (can(role, "intervals.read")) {
      add("/tools/MIC-0101/chain", "tool-MIC-0101-chain");
      add("/analysis/drift/MIC-0104", "drift-MIC-0104");
    }
  }
  // The status page a label's QR code opens on a phone.
  add("/t/MIC-0101", "status-MIC-0101");
  add("/t/MIC-0110", "status-MIC-0110");
  if (has("/jobs")) {
    const jobs = await listOf<{ id: string; engineSerial?: string; status?: string }>(page, "/api/jobs?pageSize=50");
    jobs.forEach((j, i) => add(`/jobs/${j.id}`, `check-sheet-${i + 1}`));
  }
  if (has("/investigations")) {
    const [inv] = await listOf<{ id: string }>(page, "/api/investigations?toolAssetTag=MIC-0104");
    if (inv) add(`/investigations/${inv.id}`, "investigation-MIC-0104");
  }
  if (has("/standards")) {
    const standards = await listOf<{ id: string }>(page, "/api/standards");
    if (standards[0]) add(`/standards/${standards[0].id}`, "standard-1");
  }
  if (has("/limit-tables")) {
    const tables = await listOf<{ id: string }>(page, "/api/limit-tables");
    if (tables[0]) {
      add(`/limit-tables/${tables[0].id}`, "limit-table-1");
      if (can(role, "limitTables.write")) add(`/limit-tables/${tables[0].id}/revise`, "limit-table-1-revise");
    }
    if (can(role, "limitTables.write")) add("/limit-tables/new", "limit-tables-new");
  }
  if (has("/studies")) {
    const studies = await listOf<{ id: string; reference: string }>(page, "/api/studies");
    const finished = studies.find((s) => s.reference === "GRR-0001") ?? studies[0];
    if (finished) add(`/studies/${finished.id}`, `study-${finished.reference}`);
    if (can(role, "studies.write")) add("/studies/new", "studies-new");
  }
  if (has("/bench/studies")) {
    const mine = await listOf<{ id: string; reference: string }>(page, "/api/studies/mine");
    for (const s of mine) add(`/bench/studies/${s.id}`, `bench-study-${s.reference}`);
  }
  if (has("/analysis/intervals")) {
    const families = await listOf<{ familyId: string; name: string }>(page, "/api/intervals/families");
    const dial = families.find((f) => /dial/i.test(f.name)) ?? families[0];
    if (dial) add(`/analysis/intervals/${dial.familyId}`, "interval-family");
  }
  return visits;
}

/** Waits until the page has its data: no request in flight, no list marked busy, no "Loading…". */
async function settle(page: Page) {
  await page.waitForLoadState("networkidle");
  await page.waitForFunction(() => !document.querySelector('[aria-busy="true"]') && !/^(Loading|Checking)[^…]*…$/m.test(document.body.innerText));
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  // Text laid out again in the web font is measured in the next frame (resize observers run then): wait two.
  await page.evaluate(() => new Promise<void>((done) => requestAnimationFrame(() => requestAnimationFrame(() => done()))));
}

/** Serious and critical WCAG 2 A/AA violations on the page, one line per element. */
async function axeProblems(page: Page, where: string): Promise<string[]> {
  // Evaluated through the DevTools protocol: the app's Content Security Policy refuses inline scripts.
  if (!(await page.evaluate(() => "axe" in window))) await page.evaluate(AXE_SOURCE);
  const violations = await page.evaluate(async () => {
    type Axe = { run: (ctx: Document, opts: object) => Promise<{ violations: unknown[] }>; getRules: (tags: string[]) => { ruleId: string; tags: string[] }[] };
    const axe = (window as unknown as { axe: Axe }).axe;
    // The WCAG rules axe runs by default: its experimental rules (still being tuned) are left out, as axe does.
    const rules = axe.getRules(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).filter((r) => !r.tags.includes("experimental")).map((r) => r.ruleId);
    const result = await axe.run(document, { runOnly: { type: "rule", values: rules }, resultTypes: ["violations"] });
    return result.violations;
  });
  const lines: string[] = [];
  for (const v of violations as AxeViolation[]) {
    if (v.impact !== "serious" && v.impact !== "critical") continue;
    for (const n of v.nodes) {
      const why = (n.failureSummary ?? "").split("\n").slice(1).join(" ").trim();
      lines.push(`${where}: ${v.id} (${v.impact}) — ${v.help} — ${n.target.join(" ")} ${n.html.slice(0, 120)} — ${why}`);
    }
  }
  return lines;
}

/** The page scrolls sideways when the document is wider than the window. */
async function overflowProblem(page: Page, where: string): Promise<string | null> {
  const { scrollWidth, innerWidth, widest } = await page.evaluate(() => {
    const innerWidth = window.innerWidth;
    // The element reaching furthest right, to name in the message.
    let widest = "";
    let right = innerWidth;
    for (const el of Array.from(document.body.querySelectorAll("*"))) {
      const r = el.getBoundingClientRect();
      if (r.right > right + 0.5) {
        right = r.right;
        widest = `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ""}${el.getAttribute("class") ? `.${el.getAttribute("class")!.trim().split(/\s+/).slice(0, 4).join(".")}` : ""} (right edge ${Math.round(r.right)} px)`;
      }
    }
    return { scrollWidth: document.scrollingElement!.scrollWidth, innerWidth, widest };
  });
  return scrollWidth > innerWidth ? `${where}: the page is ${scrollWidth} px wide in a ${innerWidth} px window; widest: ${widest}` : null;
}

describe("every page of every role is legible and fits the screen", () => {
  for (const role of ROLES) {
    it(`${role}: no serious or critical WCAG 2 A/AA violation and no sideways scrolling at 1440 and 390 px, with screenshots`, async () => {
      const { page, context, errors } = await b.newPage(WIDTHS[0]);
      await b.signIn(page, role);
      const visits = await pagesOf(page, role);
      expect(visits.length).toBeGreaterThan(5);
      const dir = path.join(SCREENSHOT_DIR, role);
      fs.mkdirSync(dir, { recursive: true });
      const problems: string[] = [];
      for (const v of visits) {
        await page.setViewportSize(WIDTHS[0]);
        await page.goto(v.path);
        await settle(page);
        for (const size of WIDTHS) {
          await page.setViewportSize(size);
          await settle(page);
          const where = `${role} ${v.path} at ${size.width} px`;
          const found = await axeProblems(page, where);
          const overflow = await overflowProblem(page, where);
          if (overflow) found.push(overflow);
          problems.push(...found);
          fs.appendFileSync(PROBLEM_LOG, found.map((l) => `${l}\n`).join(""));
          await page.screenshot({ path: path.join(dir, `${v.name}-${size.width}.png`), fullPage: true, timeout: 120_000 });
        }
      }
      await context.close();
      expect(problems, `${problems.length} problem(s):\n${problems.join("\n")}`).toEqual([]);
      expect(errors).toEqual([]);
    }, 900_000);
  }
});
