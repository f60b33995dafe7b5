import { chromium } from '@playwright/test';
const base = 'http://127.0.0.1:3190';
const [, , email, sizes, ...paths] = process.argv;
const b = await chromium.launch({ executablePath: '/usr/bin/chromium' });
const ctx = await b.newContext({ viewport: { width: 1366, height: 900 } });
const p = await ctx.newPage();
await p.goto(base + '/sign-in');
await p.screenshot({ path: `/tmp/shots/sign-in.png` });
await p.getByLabel('E-mail').fill(email);
await p.getByLabel('Password').fill('reelwright-demo');
await p.getByRole('button', { name: 'Sign in' }).click();
await p.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
for (const size of sizes.split(',')) {
  const [w, h] = size.split('x').map(Number);
  await p.setViewportSize({ width: w, height: h });
  for (const path of paths) {
    await p.goto(base + path);
    await p.waitForLoadState('networkidle');
    const name = `${email.split('@')[0]}-${path.replace(/\//g, '_') || 'home'}-${size}`;
    await p.screenshot({ path: `/tmp/shots/${name}.png` });
    console.log(name);
  }
}
await b.close();
