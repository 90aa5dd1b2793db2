import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { createAccount, homeIds } from '../../support/accounts';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { waitForMail, linkIn } from '../../support/mail';
import { demoEmail, demoPassword } from '../../support/session';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

// Every context acts from its own invented address (TEST-NET-1, RFC 5737), so that wrong
// passwords here never count against the address the rest of the suite signs in from.
let n = 0;
async function context(): Promise<BrowserContext> {
  return browser.newContext({ extraHTTPHeaders: { 'x-forwarded-for': `192.0.2.${230 + (n++ % 20)}` } });
}

async function signInWithPassword(page: Page, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl()}/signin`);
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForLoadState('load');
}

const header = (page: Page) => page.locator('header').innerText();

describe('signing in, in Chromium', () => {
  it('password: a wrong one shows a neutral error, the right one signs in, and the shell signs out', async () => {
    const ctx = await context();
    const page = await ctx.newPage();
    await signInWithPassword(page, demoEmail('operator', 'kestrel-vale'), 'not the password');
    const alert = page.getByRole('alert');
    expect(await alert.innerText()).toContain('do not match');
    expect(await alert.innerText()).not.toMatch(/no account|not found|unknown/i);
    await screenshot(page, 'signin-wrong-password');

    await signInWithPassword(page, demoEmail('operator', 'kestrel-vale'), demoPassword());
    expect(await header(page)).toContain('Service desk');
    expect(await header(page)).toContain('Kestrel Vale Heating Co-operative');
    const cookie = (await ctx.cookies()).find((c) => c.name === 'authjs.session-token');
    expect(cookie).toMatchObject({ httpOnly: true, sameSite: 'Lax', secure: false });

    await page.getByRole('button', { name: 'Sign out', exact: true }).click();
    await page.waitForURL(/\/signin\?signedOut=1/);
    expect(await page.getByRole('status').innerText()).toContain('You are signed out');
    expect((await ctx.cookies()).some((c) => c.name === 'authjs.session-token')).toBe(false);
    // A copy of the cookie taken before signing out opens nothing afterwards.
    const replay = await fetch(`${baseUrl()}/api/me`, { headers: { cookie: `authjs.session-token=${cookie!.value}` } });
    expect(replay.status).toBe(401);
    await ctx.close();
  });

  it('sign out everywhere, from the account menu, ends the session in another browser too', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'engineer', label: 'e2e-everywhere' });
    const laptop = await context();
    const phone = await context();
    const here = await laptop.newPage();
    const there = await phone.newPage();
    await signInWithPassword(here, acct.email, acct.password);
    await signInWithPassword(there, acct.email, acct.password);
    await there.goto(`${baseUrl()}/tanks`);
    expect(new URL(there.url()).pathname).toBe('/tanks');

    await here.locator('summary', { hasText: 'Account' }).click();
    const button = here.getByRole('button', { name: 'Sign out everywhere' });
    await button.focus();
    await screenshot(here, 'account-menu');
    await button.press('Enter');
    await here.waitForURL(/\/signin\?signedOut=everywhere/);
    expect(await here.getByRole('status').innerText()).toContain('signed out on every device and browser');

    await there.goto(`${baseUrl()}/tanks`);
    expect(there.url()).toBe(`${baseUrl()}/signin?next=%2Ftanks`);
    await laptop.close();
    await phone.close();
  });

  it('keeps where the person was going: /admin/staff → sign in → back to /admin/staff', async () => {
    const ctx = await context();
    const page = await ctx.newPage();
    await page.goto(`${baseUrl()}/admin/staff`);
    expect(page.url()).toBe(`${baseUrl()}/signin?next=%2Fadmin%2Fstaff`);
    await page.getByLabel('E-mail address').fill(demoEmail('admin', 'kestrel-vale'));
    await page.getByLabel('Password').fill(demoPassword());
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await page.waitForURL(`${baseUrl()}/admin/staff`);
    expect(await page.getByRole('heading', { level: 1 }).innerText()).toBe('Staff and invitations');
    await ctx.close();
  });

  it('e-mail link: asks for one, follows it from the captured mail, and a second click is refused', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'engineer', password: null, label: 'e2e-link' });
    const ctx = await context();
    const page = await ctx.newPage();
    await page.goto(`${baseUrl()}/signin`);
    const since = new Date();
    await page.getByLabel('E-mail address').fill(acct.email);
    await page.getByRole('button', { name: 'E-mail me a sign-in link' }).click();
    await page.waitForLoadState('load');
    expect(await page.getByRole('status').innerText()).toContain('Check your inbox');
    const link = linkIn(await waitForMail(acct.email, /sign-in link/, since), baseUrl());
    await page.goto(link);
    expect(await header(page)).toContain('Field engineer');

    const other = await context();
    const second = await other.newPage();
    await second.goto(link);
    expect(await second.getByRole('alert').innerText()).toContain('expired or has already been used');
    await screenshot(second, 'signin-link-used');
    await ctx.close();
    await other.close();
  });

  it('forgotten password: asks for a link, chooses a new password, lands signed in', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'operator', label: 'e2e-reset' });
    const ctx = await context();
    const page = await ctx.newPage();
    await page.goto(`${baseUrl()}/signin`);
    await page.getByRole('link', { name: 'Forgotten your password?' }).click();
    await waitForIslands(page);
    const since = new Date();
    await page.getByLabel('E-mail address').fill(acct.email);
    await page.getByRole('button', { name: 'E-mail me a reset link' }).click();
    expect(await page.getByRole('status').innerText()).toContain('If an account uses that address');
    const link = linkIn(await waitForMail(acct.email, /new Heatlayer password/, since), `${baseUrl()}/reset-password`);
    await page.goto(link);
    await waitForIslands(page);
    await page.getByLabel('New password').fill('short');
    await page.getByRole('button', { name: 'Save and sign in' }).click();
    expect(await page.getByText('at least 12 characters', { exact: false }).first().isVisible()).toBe(true);
    await page.getByLabel('New password').fill('a fresh long passphrase');
    await page.getByRole('button', { name: 'Save and sign in' }).click();
    await page.waitForURL((u) => !u.pathname.startsWith('/reset-password'));
    expect(await header(page)).toContain('Orrin Bay Energy Services');
    await page.goto(link);
    expect(await page.getByRole('alert').innerText()).toContain('already been used');
    await ctx.close();
  });

  it('invitation: an admin invites an engineer from the staff page; the link creates the account and signs in', async () => {
    const ctx = await context();
    const page = await ctx.newPage();
    await signInWithPassword(page, demoEmail('admin', 'orrin-bay'), demoPassword());
    await page.goto(`${baseUrl()}/admin/staff`);
    await waitForIslands(page);
    const email = `e2e-invite-${Date.now()}@orrinbay.example.com`;
    const since = new Date();
    const form = page.locator('form', { has: page.getByRole('button', { name: 'Send invitation' }) });
    await form.getByLabel('E-mail address').fill(email);
    await form.getByLabel('Role').selectOption('engineer');
    await form.getByRole('button', { name: 'Send invitation' }).click();
    await page.waitForSelector(`[data-invitation="${email}"], form [role=alert]`, { timeout: 10_000 });
    await screenshot(page, 'admin-staff');
    expect(await page.locator('form [role=alert]').count()).toBe(0);
    const link = linkIn(await waitForMail(email, /invitation to Heatlayer/, since), `${baseUrl()}/accept-invitation`);

    const invitee = await context();
    const p2 = await invitee.newPage();
    await p2.goto(link);
    await waitForIslands(p2);
    expect(await p2.locator('main').innerText()).toContain('field engineer');
    await p2.getByLabel('Your name').fill('Joss Kettleby');
    await p2.getByLabel('Choose a password').fill('a long new passphrase');
    await screenshot(p2, 'accept-invitation');
    await p2.getByRole('button', { name: 'Create my account' }).click();
    await p2.waitForURL((u) => !u.pathname.startsWith('/accept-invitation'));
    expect(await header(p2)).toContain('Joss Kettleby');
    expect(await header(p2)).toContain('Field engineer');

    // The admin's audit page shows it.
    await page.goto(`${baseUrl()}/admin/audit`);
    expect(await page.locator('tr[data-action="invitation.accepted"]').first().innerText()).toContain(email);
    await screenshot(page, 'admin-audit');
    await ctx.close();
    await invitee.close();
  });

  it('an expired invitation link says so', async () => {
    const ctx = await context();
    const page = await ctx.newPage();
    await signInWithPassword(page, demoEmail('admin', 'orrin-bay'), demoPassword());
    const res = await page.request.post(`${baseUrl()}/api/invitations`, {
      data: { email: `e2e-late-${Date.now()}@orrinbay.example.com`, role: 'operator' },
      headers: { origin: baseUrl() },
    });
    const { invitation } = await res.json();
    await query(`update invitations set expires_at = now() - interval '1 minute' where id = $1`, [invitation.id]);
    const mail = await waitForMail(invitation.email, /invitation/, new Date(Date.now() - 60_000));
    const anon = await context();
    const p2 = await anon.newPage();
    const answer = await p2.goto(linkIn(mail, baseUrl()));
    expect(answer?.status()).toBe(410);
    expect(await p2.getByRole('alert').innerText()).toContain('expired');
    await ctx.close();
    await anon.close();
  });

  it('handover: an engineer invites the householder of a home, who then sees that home only', async () => {
    const [, , home] = await homeIds('kestrel-vale', 3);
    const ctx = await context();
    const page = await ctx.newPage();
    await signInWithPassword(page, demoEmail('engineer', 'kestrel-vale'), demoPassword());
    await page.goto(`${baseUrl()}/homes/${home}/householders`);
    await waitForIslands(page);
    const email = `e2e-home-${Date.now()}@example.com`;
    const since = new Date();
    await page.getByLabel('Householder’s e-mail address').fill(email);
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.waitForSelector(`[data-invitation="${email}"]`);
    await screenshot(page, 'home-householders');
    const link = linkIn(await waitForMail(email, /invitation/, since), baseUrl());

    const hh = await context();
    const p2 = await hh.newPage();
    await p2.goto(link);
    await waitForIslands(p2);
    await p2.getByLabel('Choose a password').fill('a long new passphrase');
    await p2.getByRole('button', { name: 'Create my account' }).click();
    await p2.waitForURL((u) => !u.pathname.startsWith('/accept-invitation'));
    const me = await (await p2.request.get(`${baseUrl()}/api/me`)).json();
    expect(me).toMatchObject({ role: 'householder', homeIds: [home] });
    await ctx.close();
    await hh.close();
  });
});
