import { existsSync, mkdirSync } from 'node:fs';
import type { Server } from 'node:http';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { freePort } from '../../scripts/lib/postgres.mjs';
import { startTestApp, DEMO_PASSWORD, type TestApp } from './test-app.js';

const root = path.resolve(import.meta.dirname, '..', '..');
export const artifacts = path.join(root, 'tests', 'artifacts');

/** Debian's chromium, headless, with the flags this machine's closed network needs. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export interface LiveApp extends TestApp {
  url: string;
  server: Server;
}

/**
 * The real app, built client included, listening on a free loopback port, with its mail running (local capture
 * and outbox worker) and PUBLIC_URL pointing at it, so links in captured mail open this app.
 */
export async function startLiveApp(): Promise<LiveApp> {
  const dist = process.env.TEST_CLIENT_DIST ?? '';
  if (!existsSync(path.join(dist, 'index.html'))) throw new Error('The built client is missing: `npm test` builds it first.');
  const port = await freePort();
  const t = await startTestApp({ CLIENT_DIST: dist, PUBLIC_URL: `http://127.0.0.1:${port}` }, { mail: true });
  const server = await new Promise<Server>((resolve) => {
    const s = t.app.listen(port, '127.0.0.1', () => resolve(s));
  });
  return {
    ...t,
    server,
    url: `http://127.0.0.1:${port}`,
    close: async () => {
      server.closeAllConnections();
      await new Promise((r) => server.close(r));
      await t.close();
    },
  };
}

export async function signInThroughForm(page: Page, url: string, email: string, password = DEMO_PASSWORD) {
  await page.goto(`${url}/`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

export async function screenshot(page: Page, name: string) {
  mkdirSync(artifacts, { recursive: true });
  await page.screenshot({ path: path.join(artifacts, `${name}.png`), fullPage: true });
}
