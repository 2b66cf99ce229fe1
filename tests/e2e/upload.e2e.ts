import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { batchDetailSchema } from '@shared/contracts/api';
import { launchPlainBrowser } from './support/browser';
import { newSession, shot, signIn } from './support/web-session';

const examples = join(import.meta.dirname, '..', '..', 'examples', 'demo');
const files = ['ligands.xyz', 'fragments.xyz', 'complexes.sdf', 'clusters.qcschema.json'].map((f) => join(examples, f));

describe('a chemist uploads the example batch', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchPlainBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('drops the example files, sees what was recognised, submits, and watches the batch finish', async () => {
    const { context, page } = await newSession(browser);
    await signIn(page, { demo: 'Demo Chemist' });
    await page.getByRole('main').getByRole('link', { name: 'New batch' }).click();
    await page.getByRole('heading', { name: 'New batch' }).waitFor();

    // The drop zone's "Choose files…" opens this input; Playwright sets the files on it directly.
    await page.getByLabel('Geometry files or ZIPs').setInputFiles(files);
    const fileList = page.getByRole('list', { name: 'Files to upload' });
    expect(await fileList.getByRole('listitem').count()).toBe(4);
    const recognised = page.getByRole('region', { name: 'What was recognised' });
    await recognised.waitFor({ timeout: 30_000 });
    expect(await recognised.textContent()).toMatch(/[1-9]\d* structures? in/);
    await page.getByLabel('Batch name').fill('Example batch (browser test)');
    await shot(page, 'web-new-batch');

    await page.getByRole('button', { name: 'Upload and snap' }).click();
    await page.waitForURL(/\/w\/demo\/batches\/[^/]+$/, { timeout: 60_000 });
    const batchId = new URL(page.url()).pathname.split('/').pop()!;
    await shot(page, 'web-batch-submitted');

    // Watch it finish (the page polls; the test asks the API with the same session).
    const deadline = Date.now() + 90_000;
    let status = '';
    while (Date.now() < deadline) {
      const res = await page.request.get(`/api/batches/${batchId}`);
      status = batchDetailSchema.parse(await res.json()).status;
      if (status !== 'queued' && status !== 'running') break;
      await page.waitForTimeout(1000);
    }
    expect(status).toBe('done');

    // The batches table shows it finished, with outcome counts and the groups found.
    await page.goto('/w/demo');
    const row = page.getByRole('row').filter({ has: page.getByRole('link', { name: 'Example batch (browser test)' }) });
    await row.getByText('Done').waitFor({ timeout: 10_000 });
    expect(await row.getByRole('progressbar').count()).toBe(0);
    const outcome = await row.getByLabel('Outcome of Example batch (browser test)').textContent();
    expect(outcome).toMatch(/clean\d+over budget\d+knife edge\d+error\d+/);
    expect(await row.getByRole('list', { name: 'Point groups found' }).getByRole('listitem').count()).toBeGreaterThan(0);
    await shot(page, 'web-batches-after-upload');

    await page.goto(`/w/demo/batches/${batchId}`);
    await page.waitForLoadState('networkidle');
    await shot(page, 'web-batch-done');
    await context.close();
  });
});
