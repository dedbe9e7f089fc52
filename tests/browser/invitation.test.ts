// A manager invites a new researcher, who chooses a password from the e-mailed link; a researcher who forgot
// their password gets a new one from the reset link. The links are read from the local SMTP capture.
import type { APIRequestContext, Browser, BrowserContext, Page } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, screenshot, signInThroughForm, startLiveApp, type LiveApp } from '../support/browser.js';

let live: LiveApp;
let browser: Browser;
const contexts: BrowserContext[] = [];
const pageErrors: string[] = [];

beforeAll(async () => {
  [live, browser] = await Promise.all([startLiveApp(), launchBrowser()]);
});
afterAll(async () => {
  await browser?.close();
  await live?.close();
});
afterEach(async () => {
  await Promise.all(contexts.splice(0).map((c) => c.close()));
  pageErrors.length = 0;
});

/** A page in a browser context of its own (its own cookies), collecting script and CSP errors. */
async function freshPage(): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 860 }, locale: 'en-GB' });
  contexts.push(context);
  const page = await context.newPage();
  page.on('pageerror', (e) => pageErrors.push(e.message));
  // Refused API calls (a 401 before sign-in, a 410 for a used link) are logged as failed loads: those are expected.
  page.on('console', (m) => {
    if (m.type() === 'error' && !m.text().startsWith('Failed to load resource')) pageErrors.push(m.text());
  });
  return page;
}

/** The links to `page` in the captured mail to `address`, oldest first, once `count` messages have arrived. */
async function mailedLinks(api: APIRequestContext, address: string, page: 'invitation' | 'reset-password', count: number): Promise<string[]> {
  let links: string[] = [];
  await expect
    .poll(
      async () => {
        const list = (await (await api.get(`${live.url}/api/mailbox?to=${encodeURIComponent(address)}`)).json()) as { id: number }[];
        links = [];
        for (const summary of [...list].reverse()) {
          const one = (await (await api.get(`${live.url}/api/mailbox/${summary.id}`)).json()) as { message: { text: string } };
          const match = new RegExp(`${live.url}/${page}/[A-Za-z0-9_-]{43}`).exec(one.message.text);
          if (match) links.push(match[0]);
        }
        return links.length;
      },
      { timeout: 15_000 },
    )
    .toBe(count);
  return links;
}

describe('invitation by e-mail', () => {
  it('a manager invites a researcher, who sets a password from the link, is signed in, and can sign in again', async () => {
    const manager = await freshPage();
    await signInThroughForm(manager, live.url, 'manager@lab.test');
    await manager.getByTestId('role-label').waitFor();
    await manager.getByRole('link', { name: 'People' }).click();
    await manager.getByRole('table').waitFor();
    const form = manager.getByRole('form', { name: 'Invite by e-mail' });

    // The address of an account with a password: the server's answer lands on the e-mail field.
    await form.getByLabel('Name').fill('Someone Else');
    await form.getByLabel('E-mail').fill('researcher@lab.test');
    await form.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => form.getByText('An account with that e-mail address already exists').count()).toBe(1);
    await screenshot(manager, 'people-invite-taken');

    await form.getByLabel('Name').fill('Linnea Brack');
    await form.getByLabel('E-mail').fill('linnea.brack@lab.test');
    await form.getByLabel('Role').selectOption('researcher');
    await form.getByRole('button', { name: 'Send invitation' }).click();
    await expect.poll(() => form.getByText(/Invitation sent to linnea\.brack@lab\.test/).count()).toBe(1);
    const row = manager.getByRole('row', { name: /Linnea Brack/ });
    await expect.poll(() => row.getByText('Invited', { exact: true }).count()).toBe(1);
    await screenshot(manager, 'people-invite');

    // Sending again replaces the first link.
    await row.getByRole('button', { name: 'Send invitation again' }).click();
    await expect.poll(() => row.getByText('New link sent').count()).toBe(1);
    const [firstLink, link] = await mailedLinks(manager.request, 'linnea.brack@lab.test', 'invitation', 2);

    const stale = await freshPage();
    await stale.goto(firstLink!);
    await expect.poll(() => stale.getByText(/expired .* or was replaced by a newer one/).count()).toBe(1);
    expect(await stale.getByText(/A lab manager can send a new invitation/).count()).toBe(1);
    await screenshot(stale, 'invitation-replaced');

    const invitee = await freshPage();
    await invitee.goto(link!);
    await invitee.getByRole('heading', { name: 'Welcome, Linnea' }).waitFor();
    const facts = invitee.locator('dl');
    expect(await facts.textContent()).toContain(live.config.lab.name);
    expect(await facts.textContent()).toContain('Researcher');
    expect(await facts.textContent()).toContain('linnea.brack@lab.test');
    await screenshot(invitee, 'invitation');

    const choose = invitee.getByRole('form', { name: 'Choose your password' });
    await choose.getByLabel('New password', { exact: true }).fill('linnea-bench-2027');
    await choose.getByLabel('New password again').fill('linnea-bench-2028');
    await choose.getByRole('button', { name: 'Set password and sign in' }).click();
    await expect.poll(() => choose.getByText('The two passwords differ').count()).toBe(1);
    await choose.getByLabel('New password again').fill('linnea-bench-2027');
    await choose.getByRole('button', { name: 'Set password and sign in' }).click();
    await invitee.getByRole('heading', { name: 'Good to see you, Linnea' }).waitFor();
    expect(new URL(invitee.url()).pathname).toBe('/');
    expect(await invitee.getByTestId('role-label').textContent()).toBe('Researcher');

    // The manager's table no longer shows the invitation.
    await manager.reload();
    await manager.getByRole('table').waitFor();
    await expect.poll(() => manager.getByRole('row', { name: /Linnea Brack/ }).getByText('Active', { exact: true }).count()).toBe(1);

    // The link worked once.
    const reuse = await freshPage();
    await reuse.goto(link!);
    await expect.poll(() => reuse.getByText(/already been used/).count()).toBe(1);

    await invitee.getByRole('button', { name: 'Sign out' }).click();
    await invitee.waitForURL(/\/sign-in/);
    await signInThroughForm(invitee, live.url, 'linnea.brack@lab.test', 'linnea-bench-2027');
    await expect.poll(() => invitee.getByTestId('role-label').textContent()).toBe('Researcher');

    // Her account page: the choices of a researcher, and what always comes.
    await invitee.getByRole('link', { name: /Linnea Brack/ }).click();
    await invitee.getByRole('heading', { name: 'Your account' }).waitFor();
    const choices = invitee.getByRole('form', { name: 'E-mail notifications' });
    await choices.getByLabel('Freed slots').waitFor();
    expect(await choices.getByLabel('My bookings').isChecked()).toBe(true);
    expect(await choices.getByLabel('Calibration digest').count()).toBe(0);
    expect(await choices.textContent()).toContain('cannot be switched off');
    await choices.getByLabel('Freed slots').uncheck();
    await choices.getByRole('button', { name: 'Save choices' }).click();
    await expect.poll(() => choices.getByText('Your choices are saved.').count()).toBe(1);
    const [stored] = await live.db.sequelize.query<{ notification_settings: Record<string, boolean> }>(
      `SELECT notification_settings FROM users WHERE email = 'linnea.brack@lab.test'`,
      { type: QueryTypes.SELECT },
    );
    expect(stored!.notification_settings).toEqual({ bookingUpdates: true, waitlistOffers: false });
    await invitee.reload();
    await choices.getByLabel('Freed slots').waitFor();
    expect(await choices.getByLabel('Freed slots').isChecked()).toBe(false);
    await screenshot(invitee, 'account');
    expect(pageErrors).toEqual([]);
  });
});

describe('forgotten password', () => {
  it('a researcher asks for a link from the sign-in page, chooses a new password, and signs in with it', async () => {
    const page = await freshPage();
    await page.goto(`${live.url}/sign-in`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.getByRole('heading', { name: 'Forgot your password?' }).waitFor();
    await page.getByLabel('E-mail').fill('researcher2@lab.test');
    await page.getByRole('button', { name: 'Send me a link' }).click();
    await expect.poll(() => page.getByText(/If an account with a password exists for that address/).count()).toBe(1);
    await screenshot(page, 'forgot-password');

    const manager = await freshPage();
    await signInThroughForm(manager, live.url, 'manager@lab.test');
    await manager.getByTestId('role-label').waitFor();
    const [link] = await mailedLinks(manager.request, 'researcher2@lab.test', 'reset-password', 1);

    await page.goto(link!);
    const choose = page.getByRole('form', { name: 'Choose a new password' });
    await choose.getByLabel('New password', { exact: true }).fill('fresh-start-secret');
    await choose.getByLabel('New password again').fill('fresh-start-secret');
    await screenshot(page, 'reset-password');
    await choose.getByRole('button', { name: 'Save the new password' }).click();
    await page.waitForURL(/\/sign-in\?notice=password-changed/);
    await expect.poll(() => page.getByText(/Your password was changed/).count()).toBe(1);
    await page.getByLabel('E-mail').fill('researcher2@lab.test');
    await page.getByLabel('Password').fill('fresh-start-secret');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect.poll(() => page.getByTestId('role-label').textContent()).toBe('Researcher');

    // Opened again, the link says it was used and offers a new one.
    await page.goto(link!);
    await expect.poll(() => page.getByText(/already been used/).count()).toBe(1);
    expect(await page.getByRole('link', { name: 'Request a new link' }).count()).toBe(1);
    await screenshot(page, 'reset-password-used');
    expect(pageErrors).toEqual([]);
  });
});
