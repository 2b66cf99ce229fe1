import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';

/**
 * Debian's Chromium driven by playwright-core (no browser download). The flags keep it from
 * reaching for the network, which this machine does not have, and let it run as root.
 */
export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'];

export interface TestBrowser {
  browser: BrowserContext;
  /** A new page in the shared context (cookies persist across pages of one TestBrowser). */
  newPage(): Promise<Page>;
  close(): Promise<void>;
}

/** Launches Chromium with a fresh profile in a temporary folder (removed on close). */
export async function launchBrowser(): Promise<TestBrowser> {
  const profile = mkdtempSync(join(tmpdir(), 'pf-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: CHROMIUM_ARGS,
    viewport: { width: 1280, height: 800 },
    baseURL: inject('appUrl'),
  });
  return {
    browser: context,
    newPage: () => context.newPage(),
    async close() {
      await context.close().catch(() => undefined);
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Launches a plain browser (no persistent profile) for tests that want several isolated contexts. */
export function launchPlainBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_ARGS });
}

/** Saves a full-page PNG under the test artefacts folder (.test-data/artifacts/<name>.png); returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  const dir = inject('artifactsDir');
  mkdirSync(dir, { recursive: true });
  const path = join(dir, `${name.replace(/[^A-Za-z0-9._-]+/g, '-')}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}
