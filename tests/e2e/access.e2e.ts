import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { batchSummarySchema, page as pageOf } from '@shared/contracts/api';
import { launchPlainBrowser } from './support/browser';
import { newSession, shot, signIn } from './support/web-session';

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
    await shot(page, 'web-batches-reviewer');

    const list = pageOf(batchSummarySchema).parse(await (await page.request.get('/api/workspaces/demo/batches')).json());
    expect(list.items.length).toBeGreaterThan(0);
    demoBatchId = list.items[0].id;

    await page.goto('/w/demo/new');
    await page.getByRole('alert').filter({ hasText: 'Your role doesn’t allow uploads' }).waitFor();
    expect(await page.getByRole('button', { name: 'Upload and snap' }).count()).toBe(0);
    await shot(page, 'web-new-batch-reviewer');
    await context.close();
  });

  it('someone outside the demo workspace gets the 404 page for its addresses', async () => {
    const { context, page } = await newSession(browser);
    const login = `outsider-${Date.now().toString(36)}`;
    await signIn(page, { login });
    await page.getByRole('heading', { name: 'You’re not in a workspace yet — ask an owner for an invitation' }).waitFor();
    await shot(page, 'web-no-workspace');

    for (const path of ['/w/demo', '/w/demo/new', '/w/demo/settings', `/w/demo/batches/${demoBatchId}`]) {
      await page.goto(path);
      await page.getByRole('heading', { name: 'Not found — or not yours' }).waitFor();
      // Nothing of the workspace leaks into the page.
      expect(await page.getByText('Demo group').count()).toBe(0);
    }
    await shot(page, 'web-not-found-outsider');
    // The API agrees.
    expect((await page.request.get(`/api/batches/${demoBatchId}`)).status()).toBe(404);
    expect((await page.request.get('/api/workspaces/demo/batches')).status()).toBe(404);
    await context.close();
  });

  it('an owner manages members, invitations and tokens; the last owner is protected', async () => {
    const { context, page } = await newSession(browser);
    await signIn(page, { demo: 'Demo Owner' });
    await page.getByRole('complementary').getByRole('link', { name: 'Settings' }).click();
    await page.getByRole('heading', { name: 'Workspace settings' }).waitFor();
    const members = page.getByRole('table', { name: 'Members of this workspace' });
    expect(await members.textContent()).toContain('reviewer@example.org');

    // The only owner cannot demote themself: the API's message is shown, the role stays.
    await page.getByRole('combobox', { name: 'Role of Demo Owner' }).selectOption('chemist');
    const refusal = page.getByRole('region', { name: 'Members' }).getByRole('alert');
    await refusal.waitFor();
    expect((await refusal.textContent())?.length).toBeGreaterThan(10);
    await expect.poll(() => page.getByRole('combobox', { name: 'Role of Demo Owner' }).inputValue()).toBe('owner');

    // Invite by e-mail; the invitation mail reaches the development mailbox.
    const invitee = `invitee-${Date.now().toString(36)}@example.org`;
    await page.getByRole('textbox', { name: 'E-mail' }).fill(invitee);
    await page.getByRole('combobox', { name: 'Role', exact: true }).selectOption('reviewer');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByRole('status').filter({ hasText: `Invitation sent to ${invitee}` }).waitFor();
    expect(await page.getByRole('table', { name: 'Invitations' }).getByRole('row').filter({ hasText: invitee }).textContent()).toContain('pending');
    const mailbox = page.getByRole('region', { name: 'Development mailbox' });
    await expect
      .poll(
        async () => {
          await mailbox.getByRole('button', { name: 'Refresh' }).click();
          return mailbox.textContent();
        },
        { timeout: 15_000, interval: 1000 },
      )
      .toContain(invitee);

    // The invitee follows the link from the mail: signs in with that address and joins as a reviewer.
    const link = /\/invite\/[A-Za-z0-9_.~-]+/.exec((await mailbox.textContent()) ?? '')?.[0];
    expect(link).toBeTruthy();
    const invited = await newSession(browser);
    await invited.page.goto(link!);
    await invited.page.getByText('invited').first().waitFor();
    expect(await invited.page.getByRole('main').textContent()).toContain('Demo group');
    await shot(invited.page, 'web-invitation');
    await invited.page.getByRole('link', { name: 'Sign in to accept' }).click();
    await invited.page.getByRole('link', { name: 'Sign in with GitHub' }).click();
    await invited.page.getByRole('textbox', { name: 'Login', exact: true }).fill(invitee.split('@')[0]);
    await invited.page.getByRole('textbox', { name: /^E-mail/ }).fill(invitee);
    await invited.page.getByRole('button', { name: 'Continue as this login' }).click();
    await invited.page.getByRole('button', { name: 'Accept and open the workspace' }).click();
    await invited.page.getByRole('heading', { name: 'Batches' }).waitFor();
    expect(new URL(invited.page.url()).pathname).toBe('/w/demo');
    expect(await invited.page.getByRole('complementary').getByText('Your role:').locator('..').textContent()).toContain('reviewer');
    await invited.context.close();

    // A token is shown once, with the warning, and works as a Bearer token.
    await page.getByRole('textbox', { name: 'Label' }).fill('browser test');
    await page.getByRole('button', { name: 'Create token' }).click();
    const dialog = page.getByRole('dialog', { name: 'Your new API token' });
    await dialog.waitFor();
    expect(await dialog.textContent()).toContain('you won’t see it again');
    const token = (await dialog.getByLabel('Token').textContent())!.trim();
    expect(token.length).toBeGreaterThan(20);
    await shot(page, 'web-settings-token');
    await dialog.getByRole('button', { name: 'I’ve stored it' }).click();
    const me = await fetch(`${inject('appUrl')}/api/me`, { headers: { Authorization: `Bearer ${token}` } });
    expect(me.status).toBe(200);
    expect(await page.getByRole('table', { name: 'API tokens' }).textContent()).toContain('browser test');
    expect(await page.getByText(token).count()).toBe(0);

    await shot(page, 'web-settings');
    await context.close();
  });
});
