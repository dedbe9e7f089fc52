import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { signInFailedMessage } from '../../shared/schemas/auth.js';
import { launchBrowser, screenshot, signInThroughForm, startLiveApp, type LiveApp } from '../support/browser.js';

let live: LiveApp;
let browser: Browser;
let context: BrowserContext;
let page: Page;
const pageErrors: string[] = [];

beforeAll(async () => {
  [live, browser] = await Promise.all([startLiveApp(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await live?.close();
});
beforeEach(async () => {
  context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  page = await context.newPage();
  pageErrors.length = 0;
  page.on('pageerror', (e) => pageErrors.push(e.message));
  // A CSP violation shows up as a console error; the built app must cause none. (Refused API calls,
  // such as the 401 of /me before sign-in, are logged by the browser as failed loads: those are expected.)
  page.on('console', (m) => {
    if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(m.text());
  });
});
afterEach(async () => {
  await context.close();
});

const navLinks = async () => page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents();

describe('sign-in and navigation by role', () => {
  it.each([
    ['manager@lab.test', 'Lab manager', ['Overview', 'Calendar', 'My bookings', 'Setups', 'Instruments', 'Cables & parts', 'Labels', 'People', 'Mail']],
    ['researcher@lab.test', 'Researcher', ['Overview', 'Calendar', 'My bookings', 'Setups', 'Instruments', 'Cables & parts']],
    ['visitor@lab.test', 'Visitor', ['Overview', 'Calendar', 'Setups', 'Instruments', 'Cables & parts']],
  ])('%s signs in and sees the %s navigation', async (email, roleLabel, links) => {
    await signInThroughForm(page, live.url, email);
    await expect.poll(() => page.getByTestId('role-label').textContent()).toBe(roleLabel);
    expect(await navLinks()).toEqual(links);
    await expect.poll(() => page.getByRole('heading', { level: 2, name: /Bench cautions/ }).count()).toBe(1);
    await screenshot(page, `overview-${roleLabel.toLowerCase().replace(' ', '-')}`);
    expect(pageErrors).toEqual([]);
  });

  it('a wrong password shows the sign-in failure message and stays on the sign-in page', async () => {
    await signInThroughForm(page, live.url, 'researcher@lab.test', 'wrong-password');
    await expect.poll(() => page.getByRole('alert').first().textContent()).toContain(signInFailedMessage);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await screenshot(page, 'sign-in-wrong-password');
  });

  it('empty fields get inline messages without a request', async () => {
    await page.goto(`${live.url}/sign-in`);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByText('Enter your e-mail address').count()).toBe(1);
    expect(await page.getByText('Enter your password').count()).toBe(1);
  });

  it('a visitor who opens the People page by address is told it is for managers; sign-out returns to sign-in', async () => {
    await signInThroughForm(page, live.url, 'visitor@lab.test');
    await page.getByTestId('role-label').waitFor();
    await page.goto(`${live.url}/people`);
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Not available for your role');
    await page.goto(`${live.url}/`);
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in/);
    await page.goto(`${live.url}/people`);
    await page.waitForURL(/\/sign-in\?next=%2Fpeople/);
  });
});

describe('people page (lab manager)', () => {
  it('adds a person, shows field messages for bad input, changes a role and deactivates the account', async () => {
    await signInThroughForm(page, live.url, 'manager@lab.test');
    await page.getByRole('link', { name: 'People' }).click();
    await page.getByRole('table').waitFor();
    const form = page.getByRole('form', { name: 'Add a person' });

    await form.getByLabel('E-mail').fill('not-an-address');
    await form.getByRole('button', { name: 'Add person' }).click();
    await expect.poll(() => form.getByText('Enter a valid e-mail address').count()).toBe(1);
    expect(await form.getByText('Enter a name').count()).toBe(1);

    await form.getByLabel('Name').fill('Wren Castellane');
    await form.getByLabel('E-mail').fill('wren.castellane@lab.test');
    await form.getByLabel('Role').selectOption('visitor');
    await form.getByLabel('Initial password').fill('wren-first-pass');
    await form.getByRole('button', { name: 'Add person' }).click();
    await expect.poll(() => page.getByRole('row', { name: /Wren Castellane/ }).count()).toBe(1);

    // The same address again: the server's answer lands on the e-mail field.
    await form.getByLabel('Name').fill('Wren Again');
    await form.getByLabel('E-mail').fill('wren.castellane@lab.test');
    await form.getByLabel('Initial password').fill('wren-first-pass');
    await form.getByRole('button', { name: 'Add person' }).click();
    await expect.poll(() => form.getByText('An account with that e-mail address already exists').count()).toBe(1);

    const row = page.getByRole('row', { name: /Wren Castellane/ });
    await row.getByLabel('Role of Wren Castellane').selectOption('researcher');
    await expect.poll(async () => (await live.db.sequelize.query("SELECT role FROM users WHERE email = 'wren.castellane@lab.test'"))[0]).toEqual([{ role: 'researcher' }]);
    await row.getByRole('button', { name: 'Deactivate…' }).click();
    await row.getByRole('button', { name: 'Sign out and deactivate' }).click();
    await expect.poll(() => row.getByText('Deactivated').count()).toBe(1);
    await screenshot(page, 'people-manager');
    expect(pageErrors).toEqual([]);
  });
});
