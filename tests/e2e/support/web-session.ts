import { inject } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { screenshot } from './browser';

/** A fresh, isolated browser session (own cookies) against the app under test, at 1280 × 800. */
export async function newSession(browser: Browser): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ baseURL: inject('appUrl'), viewport: { width: 1280, height: 800 } });
  const page = await context.newPage();
  return { context, page };
}

/**
 * Signs in through the app's sign-in page and the fake provider: either a demo account by its
 * name on the provider's picker, or a new login typed under "Another login".
 */
export async function signIn(page: Page, who: { demo: 'Demo Owner' | 'Demo Chemist' | 'Demo Reviewer' } | { login: string }, start = '/'): Promise<void> {
  await page.goto(start);
  await page.getByRole('link', { name: 'Sign in with GitHub' }).click();
  await page.getByRole('heading', { name: 'Choose an account for Pointfold' }).waitFor();
  if ('demo' in who) {
    await page.getByRole('button', { name: new RegExp(`^${who.demo}\\b`) }).click();
  } else {
    await page.getByRole('textbox', { name: 'Login', exact: true }).fill(who.login);
    await page.getByRole('button', { name: 'Continue as this login' }).click();
  }
  // Back in the app: the rail with the sign-out button is there once /api/me answered.
  await page.getByRole('button', { name: 'Sign out' }).waitFor();
}

/** A full-page screenshot taken from the top, so the sticky rail sits where a reader expects it. */
export async function shot(page: Page, name: string): Promise<string> {
  await page.evaluate(() => window.scrollTo(0, 0));
  return screenshot(page, name);
}
