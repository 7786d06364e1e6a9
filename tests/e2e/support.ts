/**
 * Shared helpers of the end-to-end specs: the demo accounts of the seed, signing in through the
 * page or through the API, and layout checks.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { expect, type APIRequestContext, type Page } from '@playwright/test';

export const DEMO_PASSWORD = 'phaseloop-demo';

export const DEMO = {
  admin: { email: 'admin@demo.phaseloop.test', name: 'Ada Admin (demo)' },
  analyst: { email: 'analyst@demo.phaseloop.test', name: 'Ana Analyst (demo)' },
  reviewer: { email: 'reviewer@demo.phaseloop.test', name: 'Rui Reviewer (demo)' },
  viewer: { email: 'viewer@demo.phaseloop.test', name: 'Vic Viewer (demo)' },
} as const;

export type DemoUser = keyof typeof DEMO;

export const DEMO_PROJECT = 'Demo stent frame (demo values)';
export const DEMO_PROJECT_ADMIN_ONLY = 'Demo actuator wire (demo values)';

const here = path.dirname(fileURLToPath(import.meta.url));
export const ARTIFACTS = process.env.E2E_ARTIFACTS
  ? path.resolve(here, '../..', process.env.E2E_ARTIFACTS)
  : path.resolve(here, '../artifacts');

/** Signs in through the sign-in form, as a person would. */
export async function signInViaForm(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/**
 * Signs in through the API with the page's own cookie jar (faster than the form, for tests about
 * other things). Follows the contract: CSRF token first, then the login with x-csrf-token.
 */
export async function signInViaApi(request: APIRequestContext, user: DemoUser): Promise<void> {
  const csrf = await request.get('/api/auth/csrf');
  expect(csrf.ok(), 'GET /api/auth/csrf').toBeTruthy();
  const { token } = (await csrf.json()) as { token: string };
  const login = await request.post('/api/auth/login', {
    data: { email: DEMO[user].email, password: DEMO_PASSWORD },
    headers: { 'x-csrf-token': token },
  });
  expect(login.status(), `sign-in of ${user}`).toBe(200);
}

/** A state-changing API call with the session's CSRF token, as the web app makes it. */
export async function apiPost(request: APIRequestContext, url: string, data: unknown): Promise<unknown> {
  const csrf = await request.get('/api/auth/csrf');
  const { token } = (await csrf.json()) as { token: string };
  const answer = await request.post(url, { data, headers: { 'x-csrf-token': token } });
  expect(answer.ok(), `POST ${url} answered ${answer.status()}`).toBeTruthy();
  return answer.status() === 204 ? undefined : answer.json();
}

interface CapturedMail { to: string[] | string; subject: string; text: string }

/**
 * Waits for a mail to an address whose text holds a link with the given path prefix, reading the
 * local mail catcher through the admin API, and returns that link's path (e.g. "/reset/abc").
 */
export async function waitForMailedLink(request: APIRequestContext, to: string, pathPrefix: string): Promise<string> {
  let found: string | null = null;
  await expect(async () => {
    const answer = await request.get('/api/admin/mail');
    expect(answer.ok()).toBeTruthy();
    const { items } = (await answer.json()) as { items: CapturedMail[] };
    const mail = items.find((m) => [m.to].flat().includes(to) && m.text.includes(pathPrefix));
    const match = mail?.text.match(new RegExp(`https?://\\S+?(${pathPrefix}[A-Za-z0-9_\\-.~%]+)`));
    expect(match, `mail to ${to} with a ${pathPrefix} link`).toBeTruthy();
    found = match?.[1] ?? null;
  }).toPass({ timeout: 20_000 });
  return found ?? '';
}

/** The main navigation of the signed-in frame. */
export function mainNav(page: Page) {
  return page.getByRole('navigation', { name: 'Main' });
}

/** Page width against viewport width; a positive overflow means a horizontal scroll bar. */
export async function horizontalOverflow(page: Page): Promise<number> {
  return page.evaluate<number>('document.documentElement.scrollWidth - document.documentElement.clientWidth');
}

/** Waits until no Element Plus loading mask is shown, so screenshots show data, not spinners. */
export async function waitForData(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await expect(page.locator('.el-loading-mask')).toHaveCount(0);
}
