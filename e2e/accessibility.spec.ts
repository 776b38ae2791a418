// axe-core scans of every main screen, signed in as the role that uses it, at the desk (1440x900,
// light) and on a phone (390x844, dark): both sizes and both schemes, without scanning every
// combination on a 2-core CI machine. A serious or critical finding fails the test, and so
// does any `region` (content outside landmarks) or `label-content-name-mismatch` finding (a control
// whose accessible name leaves out the words it shows), the two that review found; the second is an
// experimental rule in axe 4.14, so it is switched on here.
import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Browser, type BrowserContext, type Page } from '@playwright/test';
import { DEMO, signIn } from './support';

type Who = keyof typeof DEMO | null;

interface Screen {
  name: string;
  who: Who;
  path: string | ((page: Page) => Promise<string>);
  /** Waits until the screen has its content, so axe sees what a person sees. */
  ready: (page: Page) => Promise<void>;
}

const heading = (name: string | RegExp) => async (page: Page) => {
  await expect(page.getByRole('heading', { name, level: 1 })).toBeVisible();
};

const SCREENS: Screen[] = [
  { name: 'sign in', who: null, path: '/sign-in', ready: heading(/sign in/i) },
  { name: 'register', who: null, path: '/register', ready: heading(/register/i) },
  {
    name: 'tickets list',
    who: 'technician',
    path: '/tickets',
    ready: async (page) => {
      await heading('Tickets')(page);
      await expect(page.getByRole('table', { name: 'Tickets' }).locator('a.tag').first()).toBeVisible();
    },
  },
  {
    name: 'ticket page',
    who: 'member',
    // The member's newest ticket, whatever the demo data or earlier tests made.
    path: async (page) => {
      await page.goto('/tickets');
      const tag = page.getByRole('table', { name: 'Tickets' }).locator('a.tag').first();
      await expect(tag).toBeVisible();
      return `/tickets/${(await tag.textContent())!.trim()}`;
    },
    ready: async (page) => {
      await expect(page.getByText('Timeline', { exact: true })).toBeVisible();
    },
  },
  { name: 'hand in equipment', who: 'member', path: '/hand-in', ready: heading(/hand in equipment/i) },
  {
    name: 'bench board',
    who: 'technician',
    path: '/board',
    ready: async (page) => {
      await heading(/bench board/i)(page);
      await expect(page.locator('[data-tag]').first()).toBeVisible();
    },
  },
  {
    name: 'accounts',
    who: 'admin',
    path: '/admin/accounts',
    ready: async (page) => {
      await heading('Accounts')(page);
      await expect(page.getByRole('table', { name: 'Accounts' }).getByText('admin@kestrelfen.example')).toBeVisible();
    },
  },
  { name: 'bench calculators', who: 'member', path: '/calculators', ready: heading(/bench calculators/i) },
  { name: 'change password', who: 'member', path: '/account/password', ready: heading(/change password/i) },
];

const VARIANTS = [
  { label: 'desk, light', viewport: { width: 1440, height: 900 }, colorScheme: 'light' as const },
  { label: 'phone, dark', viewport: { width: 390, height: 844 }, colorScheme: 'dark' as const },
];

const ALWAYS_FAIL = new Set(['region', 'label-content-name-mismatch']);

async function scan(page: Page) {
  const results = await new AxeBuilder({ page })
    .options({ rules: { 'label-content-name-mismatch': { enabled: true } } })
    .analyze();
  return results.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical' || ALWAYS_FAIL.has(v.id))
    .map((v) => `${v.id} (${v.impact}): ${v.help}\n    ${v.nodes.map((n) => n.target.join(' ')).join('\n    ')}`);
}

type StorageState = Awaited<ReturnType<BrowserContext['storageState']>>;
/** One sign-in per role for the whole file: each test starts from that role's cookies. */
const sessions = new Map<Who, StorageState>();

async function openAs(browser: Browser, who: Who, variant: (typeof VARIANTS)[number]) {
  if (who && !sessions.has(who)) {
    const signing = await browser.newContext();
    await signIn(await signing.newPage(), DEMO[who]);
    sessions.set(who, await signing.storageState());
    await signing.close();
  }
  const context = await browser.newContext({
    viewport: variant.viewport,
    colorScheme: variant.colorScheme,
    storageState: who ? sessions.get(who) : undefined,
  });
  return { context, page: await context.newPage() };
}

for (const variant of VARIANTS) {
  test.describe(variant.label, () => {
    for (const screen of SCREENS) {
      test(`axe finds nothing serious on ${screen.name}`, async ({ browser }) => {
        test.setTimeout(120_000);
        const { context, page } = await openAs(browser, screen.who, variant);
        const path = typeof screen.path === 'string' ? screen.path : await screen.path(page);
        await page.goto(path);
        await screen.ready(page);
        const found = await scan(page);
        await context.close();
        expect(found, `${screen.name} (${path}):\n${found.join('\n')}`).toEqual([]);
      });
    }
  });
}
