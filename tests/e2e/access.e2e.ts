import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { batchSummarySchema, page as pageOf } from '@shared/contracts/api';
import { launchPlainBrowser, screenshot } from './support/browser';
import { newSession, signIn } from './support/web-session';

describe('who sees what', () => {
  let browser: Browser;
  let demoBatchId: string;
  beforeAll(async () => {
    browser = await launchPlainBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('a reviewer sees the batches but no upload button, and the upload page refuses', async () => {
    const { context, page } = await newSession(browser);
    await signIn(page, { demo: 'Demo Reviewer' });
    await page.getByRole('heading', { name: 'Batches' }).waitFor();
    expect(await page.getByRole('complementary').getByText('Your role:').locator('..').textContent()).toContain('reviewer');
    expect(await page.getByRole('link', { name: 'New batch' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /upload/i }).count()).toBe(0);
    await screenshot(page, 'web-batches-reviewer');

    const list = pageOf(batchSummarySchema).parse(await (await page.request.get('/api/workspaces/demo/batches')).json());
    expect(list.items.length).toBeGreaterThan(0);
    demoBatchId = list.items[0].id;

    await page.goto('/w/demo/new');
    await page.getByRole('alert').filter({ hasText: 'Your role doesn’t allow uploads' }).waitFor();
    expect(await page.getByRole('button', { name: 'Upload and snap' }).count()).toBe(0);
    await screenshot(page, 'web-new-batch-reviewer');
    await context.close();
  });

  it('someone outside the demo workspace gets the 404 page for its addresses', async () => {
    const { context, page } = await newSession(browser);
    const login = `outsider-${Date.now().toString(36)}`;
    await signIn(page, { login });
    await page.getByRole('heading', { name: 'You’re not in a workspace yet — ask an owner for an invitation' }).waitFor();
    await screenshot(page, 'web-no-workspace');

    for (const path of ['/w/demo', '/w/demo/new', '/w/demo/settings', `/w/demo/batches/${demoBatchId}`]) {
      await page.goto(path);
      await page.getByRole('heading', { name: 'Not found — or not yours' }).waitFor();
      // Nothing of the workspace leaks into the page.
      expect(await page.getByText('Demo group').count()).toBe(0);
    }
    await screenshot(page, 'web-not-found-outsider');
    // The API agrees.
    expect((await page.request.get(`/api/batches/${demoBatchId}`)).status()).toBe(404);
    expect((await page.request.get('/api/workspaces/demo/batches')).status()).toBe(404);
    await context.close();
  });
});
