import { test, type Page } from '@playwright/test';
import { EditorPage } from './support/editor';
import { expect } from './support/expect';
import { SignInPage } from './support/pages';

const DEMO_PASSWORD = 'kilorung-demo-1';
// Seeded (scripts/seed.ts): the X-ray supply (approved at r3) and the detector bias ladder with its fork.
const XRAY = '00000003-5eed-4000-8000-000000000001';
const BIAS = '00000003-5eed-4000-8000-000000000002';
const FORK = '00000003-5eed-4000-8000-000000000004';

/** Records every content-security-policy violation the page reports, from before its first script. */
async function watchCsp(page: Page): Promise<string[]> {
  const seen: string[] = [];
  page.on('console', (m) => {
    if (/Content Security Policy/i.test(m.text())) seen.push(m.text());
  });
  await page.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => console.error(`Content Security Policy violation: ${e.violatedDirective} ${e.blockedURI}`));
  });
  return seen;
}

test('every page is served with the security headers', async ({ request }) => {
  for (const path of ['/', '/signin', '/api/health']) {
    const res = await request.get(path);
    const h = res.headers();
    expect(h['content-security-policy'], path).toContain("frame-ancestors 'none'");
    expect(h['content-security-policy'], path).toContain("object-src 'none'");
    expect(h['content-security-policy'], path).not.toContain('unsafe-eval');
    expect(h['x-frame-options'], path).toBe('DENY');
    expect(h['x-content-type-options'], path).toBe('nosniff');
    expect(h['referrer-policy'], path).toBe('same-origin');
    expect(h['x-powered-by'], path).toBeUndefined();
  }
});

test('the app works under its content security policy: editor with solve and export, compare, feed, settings', async ({ page }) => {
  test.setTimeout(120_000);
  const violations = await watchCsp(page);
  await new SignInPage(page).withPassword('ada.owner@tallgrass.test', DEMO_PASSWORD);
  await page.goto(`/designs/${BIAS}`);
  const ed = new EditorPage(page);
  await ed.ready('view'); // a teammate's design opens to view
  await ed.waitSolved();
  // the PNG export draws the SVG through an image (blob:/data: URLs)
  const download = page.waitForEvent('download');
  await page.getByTestId('export-png').click();
  expect((await download).suggestedFilename()).toMatch(/\.png$/);
  await expect(page.getByTestId('comment-thread').or(page.getByTestId('review-panel')).first()).toBeVisible();
  await page.goto(`/designs/${XRAY}?revision=2`);
  await ed.ready('view');
  await page.goto(`/designs/${BIAS}/compare?a=1&b=2&bDesign=${FORK}`);
  await expect(page.getByTestId('compare-metric').first()).toBeVisible();
  await page.goto('/activity');
  await expect(page.getByTestId('activity-item').first()).toBeVisible();
  await page.goto('/settings/notifications');
  await expect(page.getByTestId('notification-switch').first()).toBeVisible();
  expect(violations).toEqual([]);
});
