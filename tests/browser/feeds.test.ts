import type { Browser, BrowserContext, Page } from 'playwright-core';
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

describe('instrument bookings and calendar feeds', () => {
  it('a researcher sees an instrument’s next bookings and subscribes to their own feed, which a calendar app can read', async () => {
    await signInThroughForm(page, live.url, 'researcher@lab.test');
    await page.getByRole('link', { name: 'Instruments' }).click();
    await page.getByRole('link', { name: 'PS-1' }).click();
    // The demo seeds PS-1 bookings on every weekday of the coming week.
    await expect.poll(() => page.getByRole('list', { name: 'Next bookings' }).getByRole('listitem').count()).toBeGreaterThan(0);
    await screenshot(page, 'instrument-next-bookings');

    await page.getByRole('link', { name: 'My bookings' }).click();
    await page.getByRole('button', { name: 'Create feed link' }).click();
    const link = page.getByLabel('Feed link');
    await expect.poll(async () => (await link.inputValue()).includes('/api/feeds/')).toBe(true);
    // The link is for the lab's PUBLIC_URL; the test app answers on its own port, so swap the origin.
    const url = new URL(await link.inputValue());
    const feed = await fetch(`${live.url}${url.pathname}`);
    expect(feed.status).toBe(200);
    expect(feed.headers.get('content-type')).toMatch(/text\/calendar/);
    const text = await feed.text();
    expect(text.startsWith('BEGIN:VCALENDAR\r\n')).toBe(true);
    expect(text).toMatch(/SUMMARY:[^\r]*PS-1/);
    await screenshot(page, 'my-bookings-feed');
  });
});
