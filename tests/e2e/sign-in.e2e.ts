import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchPlainBrowser } from './support/browser';
import { newSession, shot, signIn } from './support/web-session';

describe('signing in through the local provider', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchPlainBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('sends a visitor to sign-in, brings the chemist to the demo workspace with their role, and signs out', async () => {
    const { context, page } = await newSession(browser);
    const errors: string[] = [];
    page.on('pageerror', (err) => errors.push(err.message));

    await page.goto('/w/demo');
    await page.getByRole('link', { name: 'Sign in with GitHub' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await shot(page, 'web-sign-in');

    await signIn(page, { demo: 'Demo Chemist' }, page.url());
    // returnTo brought us back to the page we asked for.
    await page.getByRole('heading', { name: 'Batches' }).waitFor();
    expect(new URL(page.url()).pathname).toBe('/w/demo');
    const rail = page.getByRole('complementary');
    expect(await rail.getByText('chemist@example.org').isVisible()).toBe(true);
    expect(await rail.getByText('Your role:').locator('..').textContent()).toContain('chemist');
    expect(await page.getByRole('combobox', { name: 'Workspace' }).inputValue()).toBe('demo');
    // The seeded demo batch is listed.
    expect(await page.getByRole('table').getByRole('row').count()).toBeGreaterThan(1);
    await shot(page, 'web-batches');

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.getByRole('link', { name: 'Sign in with GitHub' }).waitFor();
    // The session is gone on the server too.
    const me = await page.request.get('/api/me');
    expect(me.status()).toBe(401);
    expect(errors).toEqual([]);
    await context.close();
  });
});
