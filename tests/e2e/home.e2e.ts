import { existsSync, statSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { launchBrowser, screenshot, type TestBrowser } from './support/browser';

describe('the home page, served by the API from the built app', () => {
  let browser: TestBrowser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('renders in Chromium with a Pointfold title, and a screenshot is kept', async () => {
    const page = await browser.newPage();
    const errors: string[] = [];
    page.on('pageerror', (err) => errors.push(err.message));
    const response = await page.goto('/', { waitUntil: 'networkidle' });
    expect(response?.status()).toBe(200);
    expect(await page.title()).toContain('Pointfold');
    // The React root rendered something (not an empty shell).
    await page.locator('#root *').first().waitFor({ state: 'attached' });
    expect(errors).toEqual([]);
    const path = await screenshot(page, 'home');
    expect(existsSync(path) && statSync(path).size).toBeGreaterThan(1000);
  });

  it('serves a deep link through the history fallback, and /api stays JSON', async () => {
    const appUrl = inject('appUrl');
    const deep = await fetch(`${appUrl}/some/deep/link`);
    expect(deep.status).toBe(200);
    expect(deep.headers.get('content-type')).toContain('text/html');
    const api = await fetch(`${appUrl}/api/no-such-route`);
    expect(api.status).toBe(404);
    expect(api.headers.get('content-type')).toContain('application/json');
  });

  it('reports database, queue and worker up on /api/health', async () => {
    const res = await fetch(`${inject('appUrl')}/api/health`);
    const body = (await res.json()) as { status: string; database: boolean; queue: boolean; worker: boolean };
    expect(res.status).toBe(200);
    expect(body).toMatchObject({ status: 'ok', database: true, queue: true, worker: true });
  });
});
