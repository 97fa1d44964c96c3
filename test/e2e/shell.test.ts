import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startAppServer, type AppServer } from '../helpers/app-server';
import { launchChromium, openedDialog, screenshotsDir, type Browser } from '../helpers/browser';

// The client shell in a real browser against the real server and a freshly seeded database.
// Needs a prior `ng build` (dist/web/browser).
const screenshots = screenshotsDir;

describe('client shell in Chromium', () => {
  let server: AppServer;
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    server = await startAppServer();
    browser = await launchChromium();
    page = browser.page;
  });

  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });

  const shot = (name: string) => page.screenshot({ path: join(screenshots, `${name}.png`) });

  it('sends a visitor to sign-in and rejects a wrong password beside the form', async () => {
    await page.goto(`${server.url}/songs`);
    await page.waitForURL(/\/sign-in/);
    await page.getByLabel('E-mail').waitFor();
    await shot('sign-in');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.locator('mat-error').allTextContents()).toEqual(['Enter a valid e-mail address.', 'Enter your password.']);
    await page.getByLabel('E-mail').fill('engineer@tuckline.test');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByRole('alert').textContent()).toBeTruthy();
    await shot('sign-in-error');
  });

  it('signs in as the demo engineer and lists the demo songs', async () => {
    await page.getByLabel('E-mail').fill('engineer@tuckline.test');
    await page.getByLabel('Password').fill('tuckline-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/songs$/);
    const rows = page.locator('tr.song-row');
    await expect.poll(() => rows.count()).toBeGreaterThanOrEqual(3);
    const titles = await page.locator('tr.song-row .title-link').allTextContents();
    expect(titles.map((t) => t.trim())).toEqual(expect.arrayContaining(['Night Ferry', 'Copper Rain', 'Sundial Riddim']));
    // An engineer does not manage members: no Team (nor audit trail) in the navigation.
    expect((await page.locator('mat-nav-list a').allTextContents()).map((t) => t.trim())).toEqual(['Songs', 'Presets', 'Settings']);
    expect((await page.locator('tl-role-chip').textContent())?.trim()).toBe('engineer');
    await shot('songs-list');
  });

  it('filters the list on the server', async () => {
    await page.getByLabel('Find a song').fill('copper');
    await expect.poll(async () => (await page.locator('tr.song-row .title-link').allTextContents()).map((t) => t.trim())).toEqual(['Copper Rain']);
    await page.getByLabel('Find a song').fill('');
    await expect.poll(() => page.locator('tr.song-row').count()).toBeGreaterThanOrEqual(3);
  });

  it('creates a song through the dialog, with inline errors first', async () => {
    await page.getByRole('button', { name: 'New song' }).first().click();
    const dialog = await openedDialog(page);
    await dialog.getByRole('button', { name: 'Create song' }).click();
    await expect.poll(() => dialog.locator('mat-error').allTextContents()).toEqual(
      expect.arrayContaining(['Give the song a title.', 'Enter the tempo in BPM.']),
    );
    await dialog.getByLabel('Title').fill('Harbour Lights');
    await dialog.getByLabel('Artist alias').fill('Marram Grass');
    await dialog.getByLabel('Tempo').fill('500');
    await dialog.getByLabel('Title').click();
    await expect.poll(() => dialog.locator('mat-error').allTextContents()).toEqual(['Tempo must be 20–400 BPM.']);
    await dialog.getByLabel('Tempo').fill('124');
    await dialog.getByLabel('Notes').fill('Sub drops out in the bridge.');
    await dialog.getByLabel('Title').click();
    await shot('new-song-dialog');
    await dialog.getByRole('button', { name: 'Create song' }).click();
    await page.waitForURL(/\/songs\/[^/]+$/);
    await expect.poll(() => page.locator('h1').textContent()).toBe('Harbour Lights');
  });

  it('opens the song page with the five steps', async () => {
    const labels = await page.locator('tl-step-bar .label').allTextContents();
    expect(labels).toEqual(['Stems', 'Hits', 'Tuck', 'Check', 'Export']);
    expect(await page.locator('tl-step-bar .step').first().textContent()).toContain('No stems yet');
    await page.getByRole('button', { name: /Hits/ }).click();
    await page.waitForURL(/step=hits/);
    await expect.poll(() => page.locator('tl-step-bar [aria-current="step"] .label').textContent()).toBe('Hits');
    await shot('song-page');
  });

  it('lists the new song and switches to the light theme', async () => {
    await page.getByRole('link', { name: 'All songs' }).click();
    await page.waitForURL(/\/songs$/);
    await expect.poll(() => page.locator('tr.song-row .title-link').allTextContents()).toContain('Harbour Lights');
    await page.getByRole('button', { name: 'Use the light theme' }).click();
    expect(await page.evaluate(() => document.documentElement.classList.contains('theme-light'))).toBe(true);
    await page.reload();
    await expect.poll(() => page.locator('tr.song-row').count()).toBeGreaterThanOrEqual(4);
    expect(await page.evaluate(() => localStorage.getItem('tuckline.theme'))).toBe('light');
    await shot('songs-list-light');
    await page.getByRole('button', { name: 'Use the dark theme' }).click();
  });

  it('shows the owner the team page, and signs out', async () => {
    await page.getByRole('button', { name: 'Account' }).click();
    await page.getByRole('menuitem', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in/);
    await page.getByLabel('E-mail').fill('owner@tuckline.test');
    await page.getByLabel('Password').fill('tuckline-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/songs$/);
    await page.getByRole('link', { name: 'Team' }).click();
    await page.waitForURL(/\/team$/);
    await expect.poll(() => page.locator('table[aria-label="Team members"] tr.mat-mdc-row').count()).toBeGreaterThanOrEqual(3);
    await shot('team-members');
  });
});
