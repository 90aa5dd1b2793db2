import { afterAll, describe, expect, it } from 'vitest';
import { baseUrl } from '../../support/browser';
import { closeTestDb } from '../../support/db';
import { attemptSignIn, demoEmail, demoPassword } from '../../support/session';

afterAll(closeTestDb);

function setCookie(res: Response, name: string): string {
  const line = res.headers.getSetCookie().find((l) => l.startsWith(`${name}=`));
  if (!line) throw new Error(`No Set-Cookie for ${name}: ${res.headers.getSetCookie().join(' | ')}`);
  return line;
}

// Flags per OWASP Session Management Cheat Sheet ("Cookies"): HttpOnly, SameSite, Secure over HTTPS;
// the __Secure- / __Host- prefixes per RFC 6265bis §4.1.3.
describe('session cookies', () => {
  it('are HttpOnly and SameSite=Lax, and not Secure over plain HTTP', async () => {
    const { res } = await attemptSignIn(baseUrl(), demoEmail('operator', 'orrin-bay'), demoPassword());
    const line = setCookie(res, 'authjs.session-token');
    expect(line).toMatch(/;\s*HttpOnly/i);
    expect(line).toMatch(/;\s*SameSite=Lax/i);
    expect(line).toMatch(/;\s*Path=\//i);
    expect(line).not.toMatch(/;\s*Secure/i);
  });

  it('are Secure with the __Secure- prefix when served over HTTPS (behind a TLS proxy)', async () => {
    // What a browser sends through a TLS-terminating proxy: the forwarded scheme and an https Origin.
    const https = { 'x-forwarded-proto': 'https', origin: baseUrl().replace(/^http:/, 'https:') };
    const { res, jar } = await attemptSignIn(baseUrl(), demoEmail('operator', 'orrin-bay'), demoPassword(), https);
    const line = setCookie(res, '__Secure-authjs.session-token');
    expect(line).toMatch(/;\s*Secure/i);
    expect(line).toMatch(/;\s*HttpOnly/i);
    expect(line).toMatch(/;\s*SameSite=Lax/i);
    expect([...jar.keys()]).toContain('__Host-authjs.csrf-token');
    // The secure cookie is what the server reads over HTTPS.
    const cookie = `__Secure-authjs.session-token=${jar.get('__Secure-authjs.session-token')}`;
    const me = await fetch(`${baseUrl()}/api/me`, { headers: { cookie, ...https } });
    expect(me.status).toBe(200);
    expect((await me.json()).email).toBe('operator@orrinbay.example.com');
  });

  it('refuses a forged session cookie', async () => {
    const res = await fetch(`${baseUrl()}/api/me`, { headers: { cookie: 'authjs.session-token=forged.value.here' } });
    expect(res.status).toBe(401);
  });
});
