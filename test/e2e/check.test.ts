import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import supertest from 'supertest';
import { renderDemoStems } from '../../server/seed/demo-stems';
import { startAppServer, type AppServer } from '../helpers/app-server';
import { launchChromium, screenshotsDir, type Browser } from '../helpers/browser';

// The Check step in Chromium against the real server: the demo song "Night Ferry" is seeded with
// generated kick and 808 stems and one lane (server/seed/seed-demo.ts). Needs a prior `ng build`.
const screenshots = screenshotsDir;

describe('Check step in Chromium', () => {
  let server: AppServer;
  let browser: Browser;
  let page: Page;

  beforeAll(async () => {
    server = await startAppServer();
    browser = await launchChromium({ viewport: { width: 1360, height: 1000 }, extraArgs: ['--autoplay-policy=no-user-gesture-required'] });
    page = browser.page;
  });

  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });

  it('shows the headroom gained on the demo song, as the API measures it', async () => {
    await page.goto(`${server.url}/sign-in`);
    await page.getByLabel('E-mail').fill('engineer@tuckline.test');
    await page.getByLabel('Password').fill('tuckline-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/songs$/);
    await page.getByText('Night Ferry').first().click();
    await page.locator('tl-step-bar').getByText('Check', { exact: true }).first().click();
    const gained = page.locator('.gained .big').first();
    await gained.waitFor({ timeout: 60_000 });
    // The same figure straight from the API, through the page's own session cookie.
    const report = await page.evaluate(async () => {
      const teams = await (await fetch('/api/teams')).json();
      const songs = await (await fetch(`/api/teams/${teams[0].id}/songs?q=Night%20Ferry`)).json();
      return (await fetch(`/api/teams/${teams[0].id}/songs/${songs.items[0].id}/report`)).json();
    });
    expect(report.headroomGainedDb.samplePeak).toBeGreaterThan(1);
    expect(await gained.textContent()).toBe(`${report.headroomGainedDb.samplePeak.toFixed(1)} dB`);
    await expect.poll(() => page.locator('tl-hit-peaks-chart circle').count()).toBe(2 * report.perHit.length);
    await page.screenshot({ path: join(screenshots, 'check-report.png') });
  });

  it('previews quietly, behind a visible hearing caution, and switches A/B without losing its place', async () => {
    const caution = page.getByRole('note');
    expect(await caution.textContent()).toMatch(/starts at -20 dB.*damages hearing and\s+loudspeakers/s);
    await page.getByRole('button', { name: 'Load the preview' }).click();
    await page.getByRole('button', { name: 'Play' }).waitFor({ timeout: 60_000 });
    expect(await page.getByText('Level -20 dB').count()).toBe(1);
    await page.getByRole('button', { name: 'Play' }).click();
    await page.waitForTimeout(1200);
    const before = await page.locator('.position').textContent();
    await page.getByText('A · tucks off').click();
    await page.waitForTimeout(600);
    const after = await page.locator('.position').textContent();
    const sec = (t: string | null) => Number(t!.split(':')[1]);
    expect(sec(after)).toBeGreaterThan(sec(before));
    await page.locator('tl-preview-player').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(screenshots, 'check-preview.png') });
    await page.getByRole('button', { name: 'Pause' }).click();
  });

  it('deletes a song only after asking, and the list no longer has it', async () => {
    await page.goto(`${server.url}/songs`);
    await page.getByText('Copper Rain').first().click();
    await page.getByRole('button', { name: 'Delete song' }).click();
    await page.getByRole('button', { name: 'Cancel' }).click();
    // Until the first dialog has finished closing, its backdrop takes the next click.
    await page.getByRole('dialog').waitFor({ state: 'detached' });
    expect(await page.locator('h1').textContent()).toContain('Copper Rain');
    await page.getByRole('button', { name: 'Delete song' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Delete song' }).click();
    await page.waitForURL(/\/songs$/);
    await expect.poll(() => page.locator('tr.song-row').allTextContents()).not.toContainEqual(expect.stringContaining('Copper Rain'));
    const left = await server.ctx.db.$client.query("select count(*)::int n from songs where title = 'Copper Rain'");
    expect(left.rows[0].n).toBe(0);
  });

  it('marks what a new kick revision changed on the timeline until it is acknowledged', async () => {
    // A new kick revision for Night Ferry with one more hit per bar (pattern 0, 6, 10, 14), uploaded through the API.
    const agent = supertest.agent(server.ctx.app);
    await agent.post('/api/auth/sign-in').send({ email: 'engineer@tuckline.test', password: 'tuckline-demo' }).expect(200);
    const teamId = (await agent.get('/api/teams')).body[0].id;
    const song = (await agent.get(`/api/teams/${teamId}/songs?q=Night%20Ferry`)).body.items[0];
    const revised = renderDemoStems({ bpm: song.bpm, bars: 16, silentBassBars: [8, 9], pattern: [0, 6, 10, 14] });
    const up = await agent.post(`/api/teams/${teamId}/songs/${song.id}/stems`).field('role', 'kick').attach('file', Buffer.from(revised.kickWav), 'NightFerry_Kick_v2.wav');
    expect(up.status).toBe(201);
    expect(up.body.hitMap.revisionSummary.added).toHaveLength(16);
    await page.goto(`${server.url}/songs/${song.id}?step=hits`);
    await expect.poll(() => page.locator('tl-timeline g.flag.flag-added').count()).toBe(16);
    await page.screenshot({ path: join(screenshots, 'workspace-revision.png') });
    await page.getByRole('button', { name: 'Got it' }).click();
    await expect.poll(() => page.locator('tl-timeline g.flag').count()).toBe(0);
  });
});
