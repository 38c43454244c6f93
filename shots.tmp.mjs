import { chromium } from '@playwright/test';
const base = 'http://localhost:3015';
const lessons = process.argv.slice(2);
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--headless', '--no-sandbox', '--disable-gpu'] });
const page = await browser.newPage({ viewport: { width: 360, height: 800 } });
page.setDefaultTimeout(240000);
await page.goto(base + '/sign-in');
await page.getByLabel('E-mail address').first().fill('sam@brindlewick.test');
await page.getByLabel('Password').fill('patchwright-demo');
await page.getByRole('button', { name: 'Sign in', exact: true }).click();
await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
for (const l of lessons) {
  const errors = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  const r = await page.goto(base + '/courses/' + l, { waitUntil: 'networkidle' });
  const sw = await page.evaluate(() => document.documentElement.scrollWidth);
  const name = l.replace(/\//g, '__');
  const figs = page.locator('figure');
  const n = await figs.count();
  for (let i = 0; i < n; i++) await figs.nth(i).screenshot({ path: `/tmp/curric/${name}-fig${i}.png` });
  const tables = page.locator('table');
  for (let i = 0; i < await tables.count(); i++) await tables.nth(i).screenshot({ path: `/tmp/curric/${name}-table${i}.png` });
  console.log(l, r.status(), 'scrollWidth', sw, errors.join(' | '));
}
await browser.close();
