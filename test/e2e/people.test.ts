import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startAppServer, type AppServer } from '../helpers/app-server';
import { openedDialog } from '../helpers/browser';

// Issue 5 in a real browser: the demo owner looks after the team library, invites a new
// assistant by e-mail (caught by the local SMTP fake), and the assistant joins through the
// e-mailed link and can use, but not change, the team's presets. Needs a prior `ng build`.
const screenshots = join(import.meta.dirname, '../../docs/screenshots');
const args = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];
const invitee = 'mara.quay@tuckline.test';

describe('team library and people in Chromium', () => {
  let server: AppServer;
  const contexts: BrowserContext[] = [];
  const profiles: string[] = [];
  let owner: Page;
  let inviteLink = '';

  async function freshPage(): Promise<Page> {
    const profile = mkdtempSync(join(tmpdir(), 'tuckline-e2e-people-'));
    profiles.push(profile);
    const context = await chromium.launchPersistentContext(profile, { executablePath: '/usr/bin/chromium', headless: true, viewport: { width: 1360, height: 860 }, args });
    contexts.push(context);
    return context.pages()[0] ?? (await context.newPage());
  }
  const shot = (page: Page, name: string) => page.screenshot({ path: join(screenshots, `${name}.png`) });
  /** Picks an option of a mat-select, once any previous panel has finished closing. */
  async function choose(page: Page, select: string, option: string) {
    await expect.poll(() => page.locator('div.mat-mdc-select-panel').count()).toBe(0);
    await page.getByRole('combobox', { name: select, exact: true }).click();
    await page.getByRole('option', { name: option, exact: true }).click();
  }

  beforeAll(async () => {
    server = await startAppServer();
    mkdirSync(screenshots, { recursive: true });
    owner = await freshPage();
  });

  afterAll(async () => {
    for (const c of contexts) await c.close();
    await server?.stop();
    for (const p of profiles) rmSync(p, { recursive: true, force: true });
  });

  it('shows the owner the library with the starter presets and edit controls', async () => {
    await owner.goto(`${server.url}/sign-in`);
    await owner.getByLabel('E-mail').fill('owner@tuckline.test');
    await owner.getByLabel('Password').fill('tuckline-demo');
    await owner.getByRole('button', { name: 'Sign in' }).click();
    await owner.waitForURL(/\/songs$/);
    await owner.getByRole('link', { name: 'Presets' }).click();
    await owner.waitForURL(/\/presets$/);
    await expect.poll(() => owner.locator('tr.preset-row').count()).toBeGreaterThanOrEqual(6);
    expect(await owner.locator('tr.preset-row .name-link').allTextContents()).toContain('Trap 808 tuck');
    expect(await owner.getByRole('button', { name: 'New preset' }).count()).toBe(1);
    expect(await owner.locator('button.preset-actions').count()).toBeGreaterThanOrEqual(6);
    // The server filters by genre.
    await choose(owner, 'Genre', 'trap');
    await expect.poll(async () => (await owner.locator('tr.preset-row .name-link').allTextContents()).map((t) => t.trim())).toEqual(['Trap 808 tuck']);
    await choose(owner, 'Genre', 'All genres');
    await expect.poll(() => owner.locator('tr.preset-row').count()).toBeGreaterThanOrEqual(6);
    await shot(owner, 'presets-library');
    await owner.getByRole('radio', { name: 'Cards' }).click();
    await expect.poll(() => owner.locator('.preset-card').count()).toBeGreaterThanOrEqual(6);
    await shot(owner, 'presets-cards');
    await owner.getByRole('radio', { name: 'Table' }).click();
  });

  it('saves a new version through the dialog and compares it with the first', async () => {
    await owner.locator('tr.preset-row', { hasText: 'Trap 808 tuck' }).getByRole('button', { name: /Actions for/ }).click();
    await owner.getByRole('menuitem', { name: 'Edit' }).click();
    const dialog = await openedDialog(owner);
    await dialog.getByLabel('Gain of point 2, dB').fill('-24');
    await dialog.getByLabel('Gain of point 3, dB').fill('-24');
    await dialog.getByLabel('Time of point 4, ms').fill('160');
    await dialog.getByLabel('Name').click();
    await shot(owner, 'preset-dialog');
    await dialog.getByRole('button', { name: 'Save as new version' }).click();
    await expect.poll(() => dialog.count()).toBe(0);
    await owner.locator('tr.preset-row .name-link', { hasText: 'Trap 808 tuck' }).click();
    await owner.waitForURL(/\/presets\/[0-9a-f-]+$/);
    await expect.poll(() => owner.locator('table[aria-label="Versions of this preset"] tr.mat-mdc-row').count()).toBe(2);
    await owner.getByRole('button', { name: 'Compare version 1 with the current one' }).click();
    await expect.poll(() => owner.locator('.drawing path.line.compare').count()).toBe(1);
    expect(await owner.locator('.drawing .legend').textContent()).toContain('Version 1');
    await shot(owner, 'preset-compare');
  });

  it('invites a new assistant from the team page', async () => {
    await owner.getByRole('link', { name: 'Team' }).click();
    await owner.waitForURL(/\/team$/);
    await owner.getByLabel('E-mail').fill(invitee);
    await choose(owner, 'Role', 'assistant');
    // The fake hands over the next message to that address, so listen before sending.
    const delivered = server.ctx.mail.waitFor(invitee);
    await owner.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => owner.locator('table[aria-label="Pending invitations"] tr.invitation-row').allTextContents()).toEqual([expect.stringContaining(invitee)]);
    const mail = await delivered;
    const path = /\/invitations\/[A-Za-z0-9_-]+/.exec(mail.text)?.[0];
    expect(path, mail.text).toBeTruthy();
    inviteLink = `${server.url}${path}`;
    await shot(owner, 'team-invite');
  });

  it('shows the owner the invitation in the audit trail, filtered', async () => {
    await owner.getByRole('link', { name: 'Audit trail' }).click();
    await owner.waitForURL(/\/audit$/);
    await expect.poll(() => owner.locator('tr.audit-row').count()).toBeGreaterThan(0);
    await choose(owner, 'What', 'Invitations');
    await expect.poll(async () => (await owner.locator('tr.audit-row').allTextContents()).join('\n')).toContain('sent an invitation');
    expect((await owner.locator('tr.audit-row').allTextContents()).join('\n')).toContain(invitee);
    await owner.getByRole('button', { name: 'Clear filters' }).click();
    await expect.poll(async () => (await owner.locator('tr.audit-row').allTextContents()).join('\n')).toContain('saved preset');
    await shot(owner, 'audit');
  });

  it('lets the owner change the team defaults', async () => {
    await owner.getByRole('link', { name: 'Settings' }).click();
    await owner.waitForURL(/\/settings$/);
    await owner.getByLabel('Resolution').fill('480');
    await choose(owner, 'trap', 'Trap 808 tuck');
    await owner.getByRole('button', { name: 'Save settings' }).click();
    await expect.poll(() => owner.locator('mat-snack-bar-container').textContent()).toContain('Team settings saved.');
    await owner.reload();
    await expect.poll(() => owner.getByLabel('Resolution').inputValue()).toBe('480');
    expect(await owner.getByRole('combobox', { name: 'trap' }).textContent()).toContain('Trap 808 tuck');
    await shot(owner, 'team-settings');
  });

  it('lets the invitee create an account through the e-mailed link and land in the team', async () => {
    const page = await freshPage();
    await page.goto(inviteLink);
    await expect.poll(() => page.locator('h1').textContent()).toMatch(/^Join /);
    expect(await page.locator('.facts').textContent()).toContain(invitee);
    await page.getByLabel('Your name').fill('Mara Quay');
    await page.getByLabel('Choose a password').fill('low-end-theory-42');
    await shot(page, 'invitation-accept');
    await page.getByRole('button', { name: 'Create account and join' }).click();
    await page.waitForURL(/\/songs$/);
    expect((await page.locator('tl-role-chip').first().textContent())?.trim()).toBe('assistant');

    await page.getByRole('link', { name: 'Presets' }).click();
    await page.waitForURL(/\/presets$/);
    await expect.poll(() => page.locator('tr.preset-row').count()).toBeGreaterThanOrEqual(6);
    expect(await page.locator('tr.preset-row .name-link').allTextContents()).toContain('Trap 808 tuck');
    // No create, import or edit controls for an assistant …
    expect(await page.getByRole('button', { name: 'New preset' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Import file' }).count()).toBe(0);
    expect(await page.locator('button.preset-actions').count()).toBe(0);
    await page.locator('tr.preset-row .name-link', { hasText: 'Trap 808 tuck' }).click();
    await page.waitForURL(/\/presets\/[0-9a-f-]+$/);
    await expect.poll(() => page.locator('table[aria-label="Versions of this preset"] tr.mat-mdc-row').count()).toBe(2);
    expect(await page.getByRole('button', { name: 'Edit' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /^Restore version/ }).count()).toBe(0);

    // … and the API refuses a change made straight from the page.
    const statuses = await page.evaluate(async () => {
      const me = await (await fetch('/api/auth/me')).json();
      const teamId = me.teams[0].id as string;
      const list = await (await fetch(`/api/teams/${teamId}/presets`)).json();
      const patch = await fetch(`/api/teams/${teamId}/presets/${list[0].id}`, {
        method: 'PATCH',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ version: list[0].version, name: 'Taken over' }),
      });
      return { teams: me.teams.length as number, patch: patch.status, code: (await patch.json()).error?.code as string };
    });
    expect(statuses).toEqual({ teams: 1, patch: 403, code: 'auth.forbidden' });

    // The team's settings are there to read, not to change.
    await page.getByRole('link', { name: 'Settings' }).click();
    await page.waitForURL(/\/settings$/);
    await expect.poll(() => page.getByLabel('Resolution').inputValue()).toBe('480');
    expect(await page.getByLabel('Resolution').isDisabled()).toBe(true);
    expect(await page.getByRole('button', { name: 'Save settings' }).count()).toBe(0);

    // An assistant applies a published preset to a lane of the demo song.
    await page.getByRole('link', { name: 'Songs' }).first().click();
    await page.waitForURL(/\/songs$/);
    await page.getByText('Night Ferry').first().click();
    await page.locator('tl-step-bar').getByText('Tuck', { exact: true }).first().click();
    await page.getByRole('combobox', { name: 'Preset to apply' }).click();
    await page.getByRole('option', { name: /^Trap 808 tuck · v\d+$/ }).click();
    await page.getByRole('button', { name: 'Apply', exact: true }).click();
    await expect.poll(() => page.locator('tl-lane-preset .origin').textContent()).toMatch(/From preset Trap 808 tuck v\d+/);
    const lane = await page.evaluate(async () => {
      const me = await (await fetch('/api/auth/me')).json();
      const teamId = me.teams[0].id as string;
      const songs = await (await fetch(`/api/teams/${teamId}/songs?q=Night%20Ferry`)).json();
      const lanes = await (await fetch(`/api/teams/${teamId}/songs/${songs.items[0].id}/lanes`)).json();
      return lanes[0] as { presetName: string; presetVersion: number; presetLatestVersion: number };
    });
    expect(lane.presetName).toBe('Trap 808 tuck');
    expect(lane.presetVersion).toBe(lane.presetLatestVersion);
    // Making presets is for engineers and owners.
    expect(await page.getByRole('button', { name: 'Save as preset…' }).count()).toBe(0);
    await shot(page, 'lane-preset-applied');
  });

  it('refuses the same link a second time with a clear message', async () => {
    const page = await freshPage();
    await page.goto(inviteLink);
    await expect.poll(() => page.locator('h1').textContent()).toBe('This invitation cannot be used');
    expect(await page.getByRole('alert').textContent()).toContain('not valid any more');
  });

  it('resets a forgotten password through the e-mailed link, once', async () => {
    const page = await freshPage();
    await page.goto(`${server.url}/sign-in`);
    await page.getByRole('link', { name: 'Forgot password?' }).click();
    await page.waitForURL(/\/reset-password$/);
    const delivered = server.ctx.mail.waitFor(invitee);
    await page.getByLabel('E-mail').fill(invitee);
    await page.getByRole('button', { name: 'Send reset link' }).click();
    await expect.poll(() => page.getByRole('status').textContent()).toBe('If that address has an account, a reset link is on its way.');
    const path = /\/reset-password\/[A-Za-z0-9_-]+/.exec((await delivered).text)?.[0];
    expect(path).toBeTruthy();
    await page.goto(`${server.url}${path}`);
    await page.getByLabel('New password', { exact: true }).fill('second-pressing-77');
    await page.getByLabel('Repeat the new password').fill('second-pressing-77');
    await page.getByRole('button', { name: 'Save new password' }).click();
    await page.waitForURL(/\/sign-in\?notice=password-reset$/);
    expect(await page.getByRole('status').textContent()).toContain('Your password is changed.');
    await page.getByLabel('E-mail').fill(invitee);
    await page.getByLabel('Password').fill('second-pressing-77');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/songs$/);
    // The link works once.
    await page.goto(`${server.url}${path}`);
    await page.getByLabel('New password', { exact: true }).fill('third-pressing-99');
    await page.getByLabel('Repeat the new password').fill('third-pressing-99');
    await page.getByRole('button', { name: 'Save new password' }).click();
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('not valid');
    expect(await page.getByRole('link', { name: 'Ask for a new link' }).count()).toBe(1);
  });
});
