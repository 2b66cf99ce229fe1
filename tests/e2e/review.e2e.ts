import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { batchDetailSchema } from '@shared/contracts/api';
import { launchPlainBrowser, screenshot } from './support/browser';
import { newSession, signIn } from './support/web-session';

const fragments = join(import.meta.dirname, '..', '..', 'examples', 'demo', 'fragments.xyz');
const BATCH = 'Review flow (browser test)';

describe('a reviewer decides every structure of a batch and signs it off', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchPlainBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('flags one structure with a comment, accepts the rest in bulk, and signs off once nothing is pending', async () => {
    // Its own batch, uploaded by the demo chemist: signing off freezes a batch, and the demo
    // batch is re-snapped by the structure test.
    const chemist = await newSession(browser);
    await signIn(chemist.page, { demo: 'Demo Chemist' });
    const created = await chemist.page.request.post('/api/workspaces/demo/batches', {
      headers: { Origin: inject('appUrl') },
      multipart: { name: BATCH, files: { name: 'fragments.xyz', mimeType: 'chemical/x-xyz', buffer: readFileSync(fragments) } },
    });
    expect(created.status()).toBe(201);
    const batchId = batchDetailSchema.parse(await created.json()).id;
    const deadline = Date.now() + 90_000;
    let status = '';
    while (Date.now() < deadline) {
      status = batchDetailSchema.parse(await (await chemist.page.request.get(`/api/batches/${batchId}`)).json()).status;
      if (status !== 'queued' && status !== 'running') break;
      await chemist.page.waitForTimeout(1000);
    }
    expect(status).toBe('done');
    await chemist.context.close();

    const { page } = await newSession(browser);
    const pageErrors: string[] = [];
    page.on('pageerror', (e) => pageErrors.push(e.message));
    await signIn(page, { demo: 'Demo Reviewer' });
    await page.goto(`/w/demo/batches/${batchId}`);
    await page.getByRole('heading', { level: 1, name: BATCH }).waitFor();

    // Sign-off waits until every structure is decided, and says so.
    const signOff = page.getByRole('button', { name: 'Sign off batch' });
    expect(await signOff.isDisabled()).toBe(true);
    expect(await page.getByText(/structures? still needs? a decision/).textContent()).toMatch(/^\d+ structures? still/);
    await screenshot(page, 'web-review-before');

    // One structure flagged on its own page, with a comment.
    const table = page.getByRole('table', { name: /structures of this batch/i });
    const first = table.getByRole('row').nth(1).getByRole('link').first();
    const firstName = (await first.textContent())!.trim();
    await first.click();
    await page.getByRole('heading', { level: 1, name: firstName }).waitFor();
    const review = page.getByRole('region', { name: 'Review', exact: true });
    await review.getByLabel(/comment/i).fill('Check the C–H lengths against the optimisation log');
    await review.getByRole('button', { name: 'Flag' }).click();
    await review.getByRole('list', { name: /decisions on this structure/i }).getByText('Flagged').waitFor();
    await screenshot(page, 'web-review-structure-flagged');

    // The rest accepted in bulk: show only pending rows, select the page, accept.
    await page.getByRole('link', { name: /back to the batch/i }).click();
    await page.getByRole('heading', { level: 1, name: BATCH }).waitFor();
    await page.getByRole('combobox', { name: 'Review', exact: true }).selectOption('pending');
    await page.waitForURL(/review=pending/);
    // The loader fetches the filtered page; wait until the flagged structure has left the table.
    await expect.poll(() => table.getByRole('link', { name: firstName, exact: true }).count(), { timeout: 15_000 }).toBe(0);
    await page.getByRole('checkbox', { name: /select all structures on this page/i }).check();
    const bar = page.getByRole('region', { name: /actions on selected/i });
    await bar.getByRole('button', { name: /^Accept \d+$/ }).click();
    await page.getByText(/^Accepted \d+ structures?\./).waitFor();

    // Now every structure is decided: sign off.
    await page.getByRole('combobox', { name: 'Review', exact: true }).selectOption('');
    await expect.poll(() => signOff.isEnabled(), { timeout: 15_000 }).toBe(true);
    await page.getByLabel(/sign-off comment/i).fill('Screened; one flagged for the submitter');
    await signOff.click();
    await page.getByText(/Signed off by Demo Reviewer/).waitFor();

    // The history shows the flag with its comment and the sign-off.
    const history = page.getByRole('region', { name: 'Review history' });
    await history.getByText('Signed off', { exact: true }).waitFor();
    expect(await history.textContent()).toContain('Check the C–H lengths against the optimisation log');
    const batch = batchDetailSchema.parse(await (await page.request.get(`/api/batches/${batchId}`)).json());
    expect(batch.signedOffBy?.name).toBe('Demo Reviewer');
    expect(batch.counts.flagged).toBe(1);
    expect(batch.counts.accepted + batch.counts.flagged).toBe(batch.counts.total);
    await screenshot(page, 'web-review-signed-off');
    expect(pageErrors).toEqual([]);
  });
});
