import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { chromium, type Browser, type Page } from 'playwright-core';
import { structureDetailSchema, structureRowSchema, page as pageOf } from '@shared/contracts/api';
import { CHROMIUM_PATH, screenshot } from './support/browser';
import { newSession, signIn } from './support/web-session';

/** Seeded by server/modules/batches/seed.ts (DEMO_BATCH_NAME). */
const DEMO_BATCH = 'Ligand and precursor screen (demo)';
/** How a screen reader names a group badge (src/lib/format.ts spokenGroup): "C 2 v". */
const spoken = (g: string) => [g[0], ...g.slice(1).replace('∞', ' infinity ').split('')].join(' ').replace(/\s+/g, ' ').trim();

describe('a chemist inspects a structure of the demo batch', () => {
  let browser: Browser;
  beforeAll(async () => {
    // The shared helper's flags, plus a software GL (SwiftShader) so the 3D view really draws headless.
    browser = await chromium.launch({
      executablePath: CHROMIUM_PATH,
      headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--use-angle=swiftshader', '--enable-unsafe-swiftshader'],
    });
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('opens the batch and a structure, sees its group and the 3D view, re-snaps it to another rung and downloads the batch ZIP', { timeout: 240_000 }, async () => {
    const { page } = await newSession(browser);
    try {
      await chemistWalkthrough(page);
    } catch (error) {
      await screenshot(page, 'web-structure-FAILED').catch(() => undefined);
      throw error;
    }
  });
});

/** Prints where a long browser walk is, so a timeout says which step hung. */
const step = (what: string) => process.stdout.write(`[structure e2e] ${new Date().toISOString().slice(11, 19)} ${what}\n`);

async function chemistWalkthrough(page: Page) {
  const pageErrors: string[] = [];
  page.on('pageerror', (e) => pageErrors.push(e.message));
  step('signing in');
  await signIn(page, { demo: 'Demo Chemist' });

  step('opening the demo batch');
  // The batches list → the demo batch.
  await page.goto('/w/demo');
  await page.getByRole('link', { name: DEMO_BATCH }).click();
  await page.getByRole('heading', { level: 1, name: DEMO_BATCH }).waitFor();
  const table = page.getByRole('table', { name: /structures of this batch/i });
  await table.waitFor();
  expect(await table.getByRole('row').count()).toBeGreaterThan(1);
  await page.getByRole('figure').filter({ hasText: 'Perceived groups' }).locator('svg.recharts-surface').first().waitFor();
  await screenshot(page, 'web-batch-demo');

  step('choosing a structure');
  // Pick a structure whose ladder offers another group (asked of the API with this session).
  const batchId = new URL(page.url()).pathname.split('/').pop()!;
  const rows = pageOf(structureRowSchema).parse(await (await page.request.get(`/api/batches/${batchId}/structures?pageSize=500`)).json()).items;
  let target: { id: string; name: string; group: string; from: string } | null = null;
  for (const row of rows.filter((r) => r.status === 'done')) {
    const detail = structureDetailSchema.parse(await (await page.request.get(`/api/structures/${row.id}`)).json());
    const other = detail.result?.ladder.find((r) => r.group !== detail.result!.pointGroup);
    if (detail.result && other) {
      target = { id: row.id, name: row.name, group: other.group, from: detail.result.pointGroup };
      break;
    }
  }
  expect(target, 'a demo structure with a ladder of two or more groups').not.toBeNull();

  step('opening the structure');
  // Find it with the table's search and open it.
  await page.getByLabel('Search names').fill(target!.name);
await page.waitForURL(/[?&]q=/);
await expect.poll(() => table.getByRole('row').count(), { timeout: 15_000 }).toBe(2);
  await table.getByRole('link', { name: target!.name, exact: true }).click();
  await page.getByRole('heading', { level: 1, name: target!.name }).waitFor();
  const summary = page.locator('header dl');
  await summary.getByRole('img', { name: spoken(target!.from) }).first().waitFor();

  step('checking the 3D view');
  // The 3D view draws: a WebGL canvas with pixels other than the background.
  const canvas = page.locator('canvas').first();
  await canvas.waitFor();
  await page.waitForTimeout(500);
  const drawn = await canvas.evaluate((c: HTMLCanvasElement) => {
    const copy = document.createElement('canvas');
    copy.width = c.width;
    copy.height = c.height;
    const ctx = copy.getContext('2d')!;
    ctx.drawImage(c, 0, 0);
    const { data } = ctx.getImageData(0, 0, c.width, c.height);
    let other = 0;
    // Background #141925 = (20, 25, 37); count pixels clearly different from it.
    for (let i = 0; i < data.length; i += 4 * 7) if (Math.abs(data[i] - 20) + Math.abs(data[i + 1] - 25) + Math.abs(data[i + 2] - 37) > 60) other++;
    return other;
  });
  expect(drawn).toBeGreaterThan(50);
  await page.getByRole('switch', { name: /displacement arrows/i }).check();
  await page.getByRole('switch', { name: /input geometry/i }).check();
  await screenshot(page, 'web-structure-page');

  step('re-snapping');
  // Re-snap to another rung of the ladder; the page polls until the worker is done.
  const ladder = page.getByRole('region', { name: /ladder/i });
  await ladder.getByRole('button', { name: `Snap to ${target!.group}`, exact: true }).click();
  await page.getByText(`Re-snapped to ${target!.group}.`).waitFor({ timeout: 60_000 });
  await summary.getByRole('img', { name: spoken(target!.group) }).first().waitFor();
  const after = structureDetailSchema.parse(await (await page.request.get(`/api/structures/${target!.id}`)).json());
  expect(after.result?.pointGroup).toBe(target!.group);
  await screenshot(page, 'web-structure-resnapped');

  step('downloading the batch');
  // Back to the batch and download the whole batch as a ZIP (streamed, then saved from a blob).
  await page.getByRole('link', { name: /back to the batch/i }).click();
  await page.getByRole('heading', { level: 1, name: DEMO_BATCH }).waitFor();
  await page.getByRole('button', { name: 'Download ZIP' }).waitFor();
  await expect.poll(async () => page.getByRole('button', { name: 'Download ZIP' }).isEnabled(), { timeout: 60_000 }).toBe(true);
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download ZIP' }).click()]);
  expect(download.suggestedFilename()).toMatch(/\.zip$/);
  const path = `${inject('artifactsDir')}/web-demo-batch.zip`;
  await download.saveAs(path);
  const bytes = await import('node:fs').then((fs) => fs.readFileSync(path));
  expect(bytes.subarray(0, 2).toString('latin1')).toBe('PK');
  expect(bytes.includes(Buffer.from('manifest.json'))).toBe(true);
  await page.getByText(/^Saved .+\.zip/).waitFor();
  await screenshot(page, 'web-batch-downloaded');
  expect(pageErrors).toEqual([]);
}
