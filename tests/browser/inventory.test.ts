import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot, signInThroughForm, startLiveApp, type LiveApp } from '../support/browser.js';

let live: LiveApp;
let browser: Browser;
let context: BrowserContext;
let page: Page;

beforeAll(async () => {
  [live, browser] = await Promise.all([startLiveApp(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await live?.close();
});
beforeEach(async () => {
  context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  page = await context.newPage();
});
afterEach(async () => {
  await context.close();
});

describe('inventory (lab manager)', () => {
  it('adds a cable and watches its delay update while typing, then sees it in the table', async () => {
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('link', { name: 'Cables & parts' }).click();
    await page.getByRole('table').waitFor();
    await page.getByRole('link', { name: 'Add part' }).click();
    const form = page.getByRole('form', { name: 'New part' });
    await form.getByLabel('Tag').fill('C-321');
    await form.getByLabel('Description').fill('Flexible PTFE cable for the browser test');
    await form.getByLabel('Velocity factor (datasheet)').fill('0.695');
    const delay = page.getByTestId('preview-delay');
    await form.getByLabel('Length (mm)').fill('500');
    // 500 mm at VF 0.695: 2399.742 ps (RF-PRIMER W-03); 1000 mm doubles it.
    await expect.poll(() => delay.textContent()).toBe('2399.7 ps');
    await form.getByLabel('Length (mm)').fill('1000');
    await expect.poll(() => delay.textContent()).toBe('4799.5 ps');
    // c × 4799.483 ps = 1438.849 mm of free space (= 1000 mm / 0.695).
    expect(await page.getByTestId('preview-free-space').textContent()).toBe('1438.8 mm');
    await screenshot(page, 'part-form-cable');

    await form.getByLabel('Length (mm)').fill('-5');
    await form.getByRole('button', { name: 'Add part' }).click();
    await expect.poll(() => form.getByText('Length must be above 0 mm').count()).toBe(1);
    await form.getByLabel('Length (mm)').fill('1000');
    await form.getByRole('button', { name: 'Add part' }).click();
    await page.waitForURL(/\/parts\/\d+$/);
    await expect.poll(() => page.getByTestId('part-delay').textContent()).toBe('4799.5 ps');
    await screenshot(page, 'part-detail-manager');

    await page.goto(`${live.url}/parts?q=C-321`);
    await expect.poll(() => page.getByRole('row', { name: /C-321/ }).count()).toBe(1);
    // A new cable starts with plugs at both ends.
    expect(await page.getByRole('row', { name: /C-321/ }).getByRole('cell', { name: 'SMA m → SMA m', exact: true }).count()).toBe(1);
  });

  it('adds a 2.92 mm male to SMA female adapter: the kind proposes jacks, the manager sets end A to a plug', async () => {
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('link', { name: 'Cables & parts' }).click();
    await page.getByRole('table').waitFor();
    await page.getByRole('link', { name: 'Add part' }).click();
    const form = page.getByRole('form', { name: 'New part' });
    await form.getByLabel('Tag').fill('AD-321');
    expect(await form.getByLabel('Gender, end A').inputValue()).toBe('male');
    expect(await form.getByLabel('Gender, end B').inputValue()).toBe('male');
    await form.getByLabel('Kind').selectOption('adapter');
    // An adapter's usual genders are female/female (a barrel) until the manager chooses.
    await expect.poll(() => form.getByLabel('Gender, end A').inputValue()).toBe('female');
    expect(await form.getByLabel('Gender, end B').inputValue()).toBe('female');
    await form.getByLabel('Description').fill('2.92 mm male to SMA female adapter for the browser test');
    await form.getByLabel('Connector, end A').selectOption('2.92mm');
    await form.getByLabel('Gender, end A').selectOption('male');
    // Once a gender is chosen, changing the kind leaves it alone.
    await form.getByLabel('Kind').selectOption('other');
    await form.getByLabel('Kind').selectOption('adapter');
    expect(await form.getByLabel('Gender, end A').inputValue()).toBe('male');
    expect(await form.getByLabel('Gender, end B').inputValue()).toBe('female');
    await form.getByLabel('Loss (dB), if known').fill('0.06');
    await form.getByLabel('Delay (ps), if known').fill('36');
    await screenshot(page, 'part-form-adapter-genders');
    await form.getByRole('button', { name: 'Add part' }).click();
    await page.waitForURL(/\/parts\/\d+$/);
    await expect.poll(() => page.getByText('2.92 mm male (plug)').count()).toBe(1);
    expect(await page.getByText('SMA female (jack)').count()).toBe(1);

    await page.goto(`${live.url}/parts?kind=adapter`);
    const row = page.getByRole('row', { name: /AD-321/ });
    await expect.poll(() => row.count()).toBe(1);
    expect(await row.getByRole('cell', { name: '2.92 mm m → SMA f', exact: true }).count()).toBe(1);
    // The demo's barrels are jacks at both ends, its savers 2.92 mm plugs with an SMA jack.
    expect(await page.getByRole('row', { name: /AD-10 / }).getByRole('cell', { name: 'SMA f → SMA f', exact: true }).count()).toBe(1);
    expect(await page.getByRole('row', { name: /AD-20 / }).getByRole('cell', { name: '2.92 mm m → SMA f', exact: true }).count()).toBe(1);
    await screenshot(page, 'parts-table-adapters');
    await page.goto(`${live.url}/parts?q=trim`);
    await expect.poll(() => page.getByRole('row', { name: /CB-SMA-16/ }).count()).toBe(1);
    await screenshot(page, 'parts-table-trim-set');
  });

  it('uploads a photo of a part with a progress bar and sees its thumbnail', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'skewbench-photo-'));
    const file = path.join(dir, 'bench.jpg');
    // A large noisy image, so that uploading and processing take long enough to show progress.
    writeFileSync(
      file,
      await sharp({ create: { width: 2600, height: 1700, channels: 3, background: '#8899aa', noise: { type: 'gaussian', mean: 128, sigma: 60 } } }).jpeg({ quality: 95 }).toBuffer(),
    );
    try {
      await signInThroughForm(page, live.url, 'manager@lab.test');
      await page.getByRole('link', { name: 'Cables & parts' }).click();
      await page.getByRole('link', { name: 'C-009' }).click();
      const form = page.getByRole('form', { name: 'Add a photo' });
      await form.waitFor();
      await page.evaluate(() => {
        const w = window as unknown as { sawProgress: boolean };
        w.sawProgress = false;
        new MutationObserver(() => {
          if (document.querySelector('[role="progressbar"]')) w.sawProgress = true;
        }).observe(document.body, { childList: true, subtree: true });
      });
      await form.getByLabel('Image').setInputFiles(file);
      await form.getByLabel('Caption').fill('C-009 coiled on the rack');
      await form.getByRole('button', { name: 'Add photo' }).click();
      await expect.poll(() => page.getByRole('img', { name: 'C-009 coiled on the rack' }).count()).toBe(1);
      expect(await page.evaluate(() => (window as unknown as { sawProgress: boolean }).sawProgress)).toBe(true);
      const thumb = page.getByRole('img', { name: 'C-009 coiled on the rack' });
      await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(320);
      await screenshot(page, 'part-photo-uploaded');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);

  it('filters the instrument table by kind and sorts it, and shows calibration badges', async () => {
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('link', { name: 'Instruments' }).click();
    await page.getByRole('table').waitFor();
    expect(await page.getByText(/Calibration overdue/).count()).toBeGreaterThan(0);
    expect(await page.getByText(/Calibration due in/).count()).toBeGreaterThan(0);
    await page.getByLabel('Kind').selectOption('probe-station');
    await expect.poll(() => page.getByRole('row').count()).toBe(3); // header + PS-1 + PS-2
    await page.getByRole('button', { name: /^Tag/ }).click(); // ascending (already) → descending
    await expect.poll(async () => (await page.getByRole('row').nth(1).textContent())?.startsWith('PS-2')).toBe(true);
    await screenshot(page, 'instruments-manager');
  });

  it('prints QR labels for chosen items', async () => {
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('link', { name: 'Labels' }).click();
    await page.getByText('PS-1').first().click();
    // The choice lives in the URL: the box shows it once the navigation has run, which takes a moment on a busy machine.
    const c003 = page.getByRole('checkbox', { name: /C-003/ });
    await c003.click();
    await expect.poll(() => c003.isChecked()).toBe(true);
    await expect.poll(() => page.getByRole('img', { name: /QR code for/ }).count()).toBe(2);
    expect(await page.getByRole('button', { name: 'Print 2 labels' }).isEnabled()).toBe(true);
    await screenshot(page, 'labels');
  });
});

describe('inventory (researcher and visitor)', () => {
  it.each(['researcher@lab.test', 'visitor@lab.test'])('%s sees instruments and parts but no edit controls', async (email) => {
    await signInThroughForm(page, live.url, email);
    await page.getByRole('link', { name: 'Instruments' }).click();
    await page.getByRole('table').waitFor();
    expect(await page.getByRole('link', { name: 'Add instrument' }).count()).toBe(0);
    await page.getByRole('link', { name: 'NA-1' }).click();
    await page.getByRole('heading', { name: /NA-1/ }).waitFor();
    expect(await page.getByRole('link', { name: 'Edit' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Revoke/ }).count()).toBe(0);
    await expect.poll(() => page.getByText(/Keep the RF input below \+27 dBm/).count()).toBe(1);

    await page.getByRole('link', { name: 'Cables & parts' }).click();
    await page.getByRole('table').waitFor();
    expect(await page.getByRole('link', { name: 'Add part' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Import CSV…' }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Export CSV' }).count()).toBe(1);
    await page.getByRole('link', { name: 'C-011' }).click();
    await expect.poll(() => page.getByTestId('part-delay').textContent()).toBe('866.4 ps');
    expect(await page.getByRole('link', { name: 'Edit' }).count()).toBe(0);
    expect(await page.getByRole('form', { name: 'Add a photo' }).count()).toBe(0);
    // The seeded photo of the matched pair is visible, without controls to change it.
    await page.goto(`${live.url}/parts?q=C-003`);
    await page.getByRole('link', { name: 'C-003' }).click();
    await page.getByRole('img', { name: /Matched pair/ }).click();
    await expect.poll(() => page.getByRole('dialog').count()).toBe(1);
    expect(await page.getByRole('dialog').getByRole('button', { name: /Delete/ }).count()).toBe(0);
    await screenshot(page, `part-detail-${email.split('@')[0]}`);

    await page.goto(`${live.url}/parts/new`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Not available for your role');
  });
});
