import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Locator, type Page } from 'playwright-core';

/** Where the browser tests write the screenshots the README shows. */
export const screenshotsDir = join(import.meta.dirname, '../../docs/screenshots');

/**
 * Flags for Debian's Chromium as root on this closed network: no sandbox, no GPU,
 * and no background networking (its connections are refused here, many at a time).
 */
export const chromiumArgs = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export interface Browser {
  context: BrowserContext;
  page: Page;
  close(): Promise<void>;
}

/** Headless /usr/bin/chromium with a fresh profile (playwright-core never downloads a browser of its own). */
export async function launchChromium(options: { viewport?: { width: number; height: number }; extraArgs?: string[] } = {}): Promise<Browser> {
  const profile = mkdtempSync(join(tmpdir(), 'tuckline-e2e-'));
  mkdirSync(screenshotsDir, { recursive: true });
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport: options.viewport ?? { width: 1360, height: 860 },
    args: [...chromiumArgs, ...(options.extraArgs ?? [])],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/**
 * The dialog just opened, once it has finished opening: Angular Material
 * moves the focus into it (autoFocus 'first-tabbable') only after its open
 * animation, so a field filled before then can lose its text to the first
 * field when the focus arrives (seen on a loaded machine: "-24" meant for a
 * gain landed in the preset's name). A person waits for the dialog to settle;
 * so does this.
 */
export async function openedDialog(page: Page): Promise<Locator> {
  const dialog = page.getByRole('dialog');
  await dialog.waitFor();
  await page.locator('mat-dialog-container:focus, mat-dialog-container :focus').waitFor();
  return dialog;
}
