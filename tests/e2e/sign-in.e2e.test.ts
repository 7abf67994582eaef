import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startBrowserApp, type BrowserApp } from "../support/browser";
import { ROLES } from "../../shared/auth/roles";

let b: BrowserApp;
beforeAll(async () => {
  b = await startBrowserApp();
});
afterAll(async () => b?.close());

describe("signing in to Tenthwise in the browser", () => {
  it("a wrong password is refused on the sign-in page with a readable message", async () => {
    const { page, context } = await b.newPage();
    await page.goto("/");
    await page.waitForURL(/\/sign-in/);
    await page.getByLabel("E-mail").fill("crib@tenthwise.test");
    await page.getByLabel("Password").fill("not-it");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("alert").filter({ hasText: "not right" }).textContent()).resolves.toMatch(/E-mail or password is not right/);
    await context.close();
  });

  it("each role signs in and sees the navigation its role may use; only admins see People", async () => {
    for (const role of ROLES) {
      const { page, context, errors } = await b.newPage();
      await b.signIn(page, role);
      const nav = page.getByRole("navigation", { name: "Main" });
      await expect(nav.getByRole("link", { name: "Overview" }).count()).resolves.toBe(1);
      const people = await nav.getByRole("link", { name: "People" }).count();
      expect(people, `${role} sees People`).toBe(role === "admin" ? 1 : 0);
      await b.screenshot(page, `home-${role}`);
      await page.getByRole("button", { name: "Sign out" }).click();
      await page.waitForURL(/\/sign-in/);
      expect(errors, `page errors for ${role}`).toEqual([]);
      await context.close();
    }
  });

  it("on a phone the navigation folds behind a Menu button", async () => {
    const { page, context } = await b.newPage({ width: 390, height: 844 });
    await b.signIn(page, "mechanic");
    await expect(page.getByRole("navigation", { name: "Main" }).isVisible()).resolves.toBe(false);
    await page.getByRole("button", { name: "Menu" }).click();
    await expect.poll(() => page.getByRole("navigation", { name: "Main" }).isVisible()).toBe(true);
    await b.screenshot(page, "phone-menu-mechanic");
    await context.close();
  });
});
