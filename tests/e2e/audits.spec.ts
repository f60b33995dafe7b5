import { expect, test, type APIRequestContext, type Browser, type Page } from '@playwright/test';
import { screenshotPath, storageState, type AccountName } from './accounts';
import { expectAccessible } from './axe';
import { monthLabel, monthRange, monthsBefore, weekIn } from './clock';

// The end-to-end seed has no audit history (serve.sh adds none), so each test's rounds are the
// only ones in their shop. Months count back from the seed's "today": last month is over in
// every shop, and a week is Monday to Sunday inside its month.
const LAST_MONTH = monthRange(monthsBefore(1));
const MONTH_BEFORE = monthsBefore(2);

// Audit rounds end to end against the seeded demo network (Saltwick & Spool). Marram Point is a
// northern shop with a demo shop lead; its last month has between 91 and 150 ready jobs.

interface RoundDetail {
  id: number;
  status: string;
  severity: string;
  lotSize: number;
  codeLetter: string;
  sampleSize: number;
  acceptNumber: number;
  rejectNumber: number;
  decision: 'accepted' | 'rejected' | null;
  failures: number | null;
  seed: string;
  lotJobIds: number[];
  samples: { jobId: number; verdict: string | null }[];
  correctiveActions: { id: number; status: string; ownerName: string | null }[];
  emails: { kind: string; to: string; subject: string }[] | null;
}

interface AuditFigures {
  averageScore: number | null;
  roundsAccepted: number;
  roundsRejected: number;
  severity: string;
}

interface PlannedRound {
  id: number;
  lotSize: number;
  codeLetter: string;
  sampleSize: number;
  accept: number;
  reject: number;
  severity: string;
  seed: string;
  sampledJobIds: number[];
}

async function as(browser: Browser, account: AccountName) {
  const context = await browser.newContext({
    storageState: storageState(account),
    viewport: { width: 1280, height: 900 },
  });
  return { context, page: await context.newPage(), request: context.request };
}

async function shopId(request: APIRequestContext, name: string) {
  const response = await request.get('/api/shops');
  expect(response.status()).toBe(200);
  const { shops } = (await response.json()) as { shops: { id: number; name: string }[] };
  const shop = shops.find((s) => s.name === name);
  if (!shop) throw new Error(`${name} is not among the caller's shops`);
  return shop.id;
}

async function userId(request: APIRequestContext, email: string) {
  const response = await request.get('/api/users');
  expect(response.status()).toBe(200);
  const { users } = (await response.json()) as { users: { id: number; email: string }[] };
  const user = users.find((u) => u.email === email);
  if (!user) throw new Error(`No user ${email}`);
  return user.id;
}

async function round(request: APIRequestContext, id: number) {
  const response = await request.get(`/api/audit-rounds/${id}`);
  expect(response.status()).toBe(200);
  return (await response.json()) as RoundDetail;
}

/** Scores every sampled job of a round through the API, each failing a critical item. */
async function failEverySample(request: APIRequestContext, planned: PlannedRound) {
  let last: { round: { decision: string | null } } | null = null;
  for (const jobId of planned.sampledJobIds) {
    const view = await request.get(`/api/audit-rounds/${planned.id}/samples/${jobId}`);
    expect(view.status()).toBe(200);
    const { items } = (await view.json()) as { items: { id: number; critical: boolean }[] };
    const critical = items.find((i) => i.critical)!;
    const saved = await request.put(`/api/audit-rounds/${planned.id}/samples/${jobId}`, {
      data: {
        answers: items.map((i) =>
          i.id === critical.id
            ? { itemId: i.id, result: 'fail', note: 'Drag washers dry, not greased' }
            : { itemId: i.id, result: 'pass' },
        ),
        final: true,
      },
    });
    expect(saved.status()).toBe(200);
    last = await saved.json();
  }
  return last!;
}

/** Answers every item of the open sample: Pass, except the items named in `fail` (with notes). */
async function scoreOnPage(page: Page, fail: Record<string, string> = {}) {
  const form = page
    .locator('form')
    .filter({ has: page.getByRole('button', { name: 'Finish this job' }) });
  const groups = form.getByRole('group');
  const count = await groups.count();
  for (let i = 0; i < count; i++) {
    const group = groups.nth(i);
    const legend = (await group.locator('legend').innerText()).replace(/^\d+\.\s*/, '');
    const note = Object.entries(fail).find(([title]) => legend.startsWith(title))?.[1];
    await group.getByRole('radio', { name: note ? 'Fail' : 'Pass' }).check();
    if (note) await group.getByRole('textbox').fill(note);
  }
}

test('regional manager, auditor and shop lead – a full round: plan, score, reject, follow up, tighten', async ({
  browser,
}) => {
  test.setTimeout(300_000);
  const manager = await as(browser, 'managerNorth');
  const marram = await shopId(manager.request, 'Marram Point');

  // Planning: the preview counts the lot and shows the plan before anything is drawn.
  await manager.page.goto('/audits');
  await expect(manager.page.getByRole('heading', { level: 1, name: 'Audits' })).toBeVisible();
  await manager.page.getByRole('link', { name: 'Plan a round' }).click();
  await expect(
    manager.page.getByRole('heading', { level: 1, name: 'Plan an audit round' }),
  ).toBeVisible();
  await manager.page.getByLabel('Shop', { exact: true }).selectOption({ label: 'Marram Point' });
  await manager.page.getByLabel('From', { exact: true }).fill(LAST_MONTH.from);
  await manager.page.getByLabel('To', { exact: true }).fill(LAST_MONTH.to);
  const planPanel = manager.page.getByRole('region', { name: 'Sampling plan' });
  await expect(planPanel).toContainText('became ready at Marram Point');
  await expect(planPanel).toContainText('Normal inspection');
  await expect(planPanel.getByText('Sample size', { exact: true })).toBeVisible();
  await expectAccessible(manager.page);
  await manager.page.screenshot({ path: screenshotPath('audits-plan-1280'), fullPage: true });
  await manager.page.setViewportSize({ width: 1024, height: 768 });
  await manager.page.screenshot({ path: screenshotPath('audits-plan-1024'), fullPage: true });
  await manager.page.setViewportSize({ width: 1280, height: 900 });

  // An auditor must be chosen; then the sample is drawn and the auditor e-mailed.
  await manager.page.getByRole('button', { name: 'Draw the sample and assign' }).click();
  await expect(
    manager.page.getByText('Choose the auditor who will score the sample'),
  ).toBeVisible();
  await manager.page
    .getByLabel('Auditor', { exact: true })
    .selectOption({ label: 'Priya Halloran-Voss' });
  await manager.page.getByRole('button', { name: 'Draw the sample and assign' }).click();
  await manager.page.waitForURL(/\/audits\/\d+$/);
  const roundId = Number(manager.page.url().split('/').pop());
  const planned = await round(manager.request, roundId);
  // MIL-STD-105E Table I: lots of 91–150 at level II are code F; Table II-A at AQL 2.5: n 20, Ac 1, Re 2.
  expect(
    planned.lotSize,
    `Marram Point’s ${monthLabel(monthsBefore(1))} lot`,
  ).toBeGreaterThanOrEqual(91);
  expect(planned.lotSize).toBeLessThanOrEqual(150);
  expect(planned).toMatchObject({
    severity: 'normal',
    codeLetter: 'F',
    sampleSize: 20,
    acceptNumber: 1,
    rejectNumber: 2,
    status: 'planned',
  });
  expect(planned.seed).toMatch(/^[0-9a-f]{32}$/);
  expect(planned.lotJobIds).toEqual([...planned.lotJobIds].sort((a, b) => a - b));
  expect(planned.emails).toEqual([
    expect.objectContaining({ kind: 'audit_assigned', to: 'auditor@saltwick.test' }),
  ]);
  await expect(manager.page.getByRole('heading', { level: 1 })).toHaveText(
    `Round #${roundId} · Marram Point`,
  );
  await expect(manager.page.getByText(planned.seed)).toBeVisible();
  await manager.page.getByRole('button', { name: 'Redraw and compare' }).click();
  await expect(
    manager.page.getByText('The redraw matches: the same 20 jobs in the same order.'),
  ).toBeVisible();
  await expect(manager.page.getByRole('region', { name: 'E-mail sent' })).toContainText(
    'auditor@saltwick.test',
  );
  await expectAccessible(manager.page);
  await manager.page.screenshot({ path: screenshotPath('audits-round-1280'), fullPage: true });
  await manager.page.setViewportSize({ width: 1024, height: 768 });
  await manager.page.screenshot({ path: screenshotPath('audits-round-1024'), fullPage: true });
  await manager.page.setViewportSize({ width: 1280, height: 900 });

  // Scoring: the auditor works through the sample one job at a time.
  const auditor = await as(browser, 'auditor');
  // The auditor's home lists the round assigned to them.
  await auditor.page.goto('/');
  await expect(
    auditor.page
      .getByRole('region', { name: 'Your audit rounds' })
      .getByRole('link', { name: `Round #${roundId}` }),
  ).toBeVisible();
  await auditor.page.goto('/audits');
  await expect(
    auditor.page.getByRole('heading', { level: 1, name: 'Your audit rounds' }),
  ).toBeVisible();
  await expectAccessible(auditor.page);
  await auditor.page.screenshot({
    path: screenshotPath('audits-list-auditor-1280'),
    fullPage: true,
  });
  await auditor.page.getByRole('link', { name: `Round #${roundId}` }).click();
  await auditor.page.getByRole('link', { name: 'Start scoring' }).click();
  await expect(auditor.page.getByRole('heading', { level: 1 })).toHaveText(
    `Job #${planned.samples[0]!.jobId}`,
  );
  await expect(auditor.page.getByRole('region', { name: 'Job record' })).toContainText('Checklist');
  await expect(auditor.page.getByRole('region', { name: 'Job record' })).toContainText(
    'Labour and total',
  );
  await expectAccessible(auditor.page);
  await auditor.page.screenshot({ path: screenshotPath('audits-score-1280'), fullPage: true });
  await auditor.page.setViewportSize({ width: 1024, height: 768 });
  await auditor.page.screenshot({ path: screenshotPath('audits-score-1024'), fullPage: true });
  await auditor.page.setViewportSize({ width: 1280, height: 900 });

  // Save part-way, come back, finish with a critical miss.
  const first = auditor.page.getByRole('group', { name: /Check-in record complete/ });
  await first.getByRole('radio', { name: 'Pass' }).check();
  await auditor.page.getByRole('button', { name: 'Save and finish later' }).click();
  await expect(auditor.page.getByText('Saved part-way: 1 of 10 items answered.')).toBeVisible();
  await auditor.page.reload();
  await expect(
    auditor.page
      .getByRole('group', { name: /Check-in record complete/ })
      .getByRole('radio', { name: 'Pass' }),
  ).toBeChecked();
  await auditor.page.getByRole('button', { name: 'Finish this job' }).click();
  await expect(auditor.page.getByText('9 items need attention')).toBeVisible();
  await scoreOnPage(auditor.page, {
    'Drag stack serviced': 'No drag steps ticked; findings do not mention the washers.',
  });
  await expect(auditor.page.getByText('Critical miss', { exact: true })).toBeVisible();
  await auditor.page.getByRole('button', { name: 'Finish this job' }).click();
  await expect(auditor.page.getByRole('heading', { level: 1 })).toHaveText(
    `Job #${planned.samples[1]!.jobId}`,
  );

  // The second job needs work; the other eighteen meet the standard.
  await scoreOnPage(auditor.page, {
    'Every required checklist step ticked': 'Two lubrication steps unticked, no reason given.',
    'Labour, parts and discount add up': 'Labour billed above the posted rate for the bench time.',
  });
  await expect(auditor.page.getByText('Needs work', { exact: true })).toBeVisible();
  await auditor.page.getByRole('button', { name: 'Finish this job' }).click();
  for (const sample of planned.samples.slice(2)) {
    await expect(auditor.page.getByRole('heading', { level: 1 })).toHaveText(
      `Job #${sample.jobId}`,
    );
    await scoreOnPage(auditor.page);
    await auditor.page.getByRole('button', { name: 'Finish this job' }).click();
  }

  // Two failures reach Re 2: the lot is rejected and the follow-up starts.
  await auditor.page.waitForURL(new RegExp(`/audits/${roundId}$`));
  await expect(auditor.page.getByText('Lot rejected').first()).toBeVisible();
  const decided = await round(manager.request, roundId);
  expect(decided).toMatchObject({ status: 'decided', decision: 'rejected', failures: 2 });
  expect(decided.correctiveActions).toEqual([
    expect.objectContaining({ status: 'open', ownerName: 'Imogen Castellane' }),
  ]);
  const rejectedMail = decided.emails!.filter((m) => m.kind === 'audit_rejected').map((m) => m.to);
  expect(rejectedMail.sort()).toEqual(['lead.marram@saltwick.test', 'manager.north@saltwick.test']);

  // The printable report: plan, seed, sample, scores, verdicts and decision; print hides the shell.
  await manager.page.goto(`/audits/${roundId}/report`);
  const report = manager.page.getByRole('article', { name: `Round #${roundId} · Marram Point` });
  await expect(report).toContainText('Lot rejected');
  await expect(report).toContainText(decided.seed);
  await expect(report).toContainText('Critical miss');
  await expect(report).toContainText('Needs work');
  await expectAccessible(manager.page);
  await manager.page.screenshot({ path: screenshotPath('audits-report-1280'), fullPage: true });
  await manager.page.setViewportSize({ width: 1024, height: 768 });
  await manager.page.screenshot({ path: screenshotPath('audits-report-1024'), fullPage: true });
  await manager.page.setViewportSize({ width: 1280, height: 900 });
  await manager.page.emulateMedia({ media: 'print' });
  await expect(manager.page.getByRole('navigation', { name: 'Sections' })).toBeHidden();
  await expect(manager.page.getByRole('button', { name: 'Print the report' })).toBeHidden();
  await expect(report).toBeVisible();
  await manager.page.screenshot({ path: screenshotPath('audits-report-print'), fullPage: true });
  await manager.page.emulateMedia({ media: 'screen' });

  // The shop lead moves the corrective action along; the regional manager verifies it.
  const lead = await as(browser, 'leadMarram');
  await lead.page.goto('/corrective-actions');
  const card = lead.page.getByRole('article', {
    name: new RegExp(`Audit round #${roundId} rejected`),
  });
  await expect(card).toContainText('Imogen Castellane');
  await card.getByRole('button', { name: 'Start work' }).click();
  await expect(card).toContainText('In progress');
  await card
    .getByLabel('What was done')
    .fill('Drag stack retraining for all technicians; lead checks drag ticks daily.');
  await card.getByRole('button', { name: 'Mark done' }).click();
  await expect(card.getByRole('button', { name: 'Mark done' })).toHaveCount(0);
  await expect(card).toContainText('What was done: Drag stack retraining');
  await expectAccessible(lead.page);
  await lead.page.screenshot({ path: screenshotPath('corrective-actions-1280'), fullPage: true });
  await lead.page.setViewportSize({ width: 1024, height: 768 });
  await lead.page.screenshot({ path: screenshotPath('corrective-actions-1024'), fullPage: true });
  await manager.page.goto('/corrective-actions');
  const managerCard = manager.page.getByRole('article', {
    name: new RegExp(`Audit round #${roundId} rejected`),
  });
  await manager.page.screenshot({
    path: screenshotPath('corrective-actions-manager-1280'),
    fullPage: true,
  });
  await managerCard.getByRole('button', { name: 'Verify' }).click();
  await manager.page.getByLabel('Show').selectOption('all');
  await expect(managerCard).toContainText('Verified');

  // A second rejected round (a one-week lot, scored through the API) tightens the next plan.
  const auditorId = await (async () => {
    const owner = await as(browser, 'owner');
    const id = await userId(owner.request, 'auditor@saltwick.test');
    await owner.context.close();
    return id;
  })();
  const week1 = weekIn(MONTH_BEFORE, 1);
  const week2 = weekIn(MONTH_BEFORE, 2);
  const second = await manager.request.post('/api/audit-rounds', {
    data: { shopId: marram, ...week1, auditorId },
  });
  expect(second.status()).toBe(201);
  const secondRound = (await second.json()) as PlannedRound;
  expect(secondRound.severity).toBe('normal');
  const last = await failEverySample(auditor.request, secondRound);
  expect(last.round.decision).toBe('rejected');

  const preview = await manager.request.get(
    `/api/audit-rounds/preview?shopId=${marram}&from=${week2.from}&to=${week2.to}`,
  );
  expect(preview.status()).toBe(200);
  expect(await preview.json()).toMatchObject({
    severity: 'tightened',
    history: [{ decision: 'rejected' }, { decision: 'rejected' }],
    plan: { table: 'II-B' },
  });
  await manager.page.goto('/audits/new');
  await manager.page.getByLabel('Shop', { exact: true }).selectOption({ label: 'Marram Point' });
  await manager.page.getByLabel('From', { exact: true }).fill(week2.from);
  await manager.page.getByLabel('To', { exact: true }).fill(week2.to);
  await expect(planPanel).toContainText('Tightened inspection');
  await expect(planPanel).toContainText('2 of 5 or fewer consecutive rounds were rejected');

  // The shop's figures carry both rounds: none accepted, two rejected, the next one tightened.
  const period = `from=${monthRange(MONTH_BEFORE).from}&to=${LAST_MONTH.to}`;
  const metrics = await manager.request.get(`/api/shops/${marram}/metrics?${period}`);
  expect(metrics.status()).toBe(200);
  const { audits } = ((await metrics.json()) as { figures: { audits: AuditFigures } }).figures;
  expect(audits).toMatchObject({ roundsAccepted: 0, roundsRejected: 2, severity: 'tightened' });
  expect(audits.averageScore).not.toBeNull();
  await manager.page.goto(`/shops/${marram}?${period}`);
  const figures = manager.page.getByRole('region', { name: /^Figures for/ });
  await expect(figures.getByText('2 of 2', { exact: true })).toBeVisible();
  await expect(figures).toContainText('Tightened inspection');
  await expect(figures).toContainText(audits.averageScore!.toFixed(1));
  await figures.screenshot({ path: screenshotPath('audits-shop-figures-1280') });
  await manager.page.goto(`/network?${period}`);
  const row = manager.page.getByRole('row', { name: /Marram Point/ });
  await expect(row).toContainText('2 of 2 rounds rejected');
  await expect(row).toContainText('Tightened inspection');
  await manager.page.screenshot({ path: screenshotPath('audits-network-1280'), fullPage: true });
  // The latest months still have jobs inside their warranty windows: estimates, never flagged.
  const pchart = manager.page.getByRole('figure', { name: /Marram Point: monthly comeback rate/ });
  await expect(pchart).toContainText(
    new RegExp(
      `${monthLabel(MONTH_BEFORE, 'short')} and ${monthLabel(monthsBefore(1), 'short')} are estimates: [\\d,]+ of their`,
    ),
  );
  await pchart.screenshot({ path: screenshotPath('network-pchart-provisional-1280') });

  for (const c of [manager, auditor, lead]) await c.context.close();
});

test('auditor – cannot edit a job or see a round not assigned to them', async ({ browser }) => {
  const owner = await as(browser, 'owner');
  const saltwick = await shopId(owner.request, 'Saltwick Harbor');
  const otherAuditor = await userId(owner.request, 'auditor.two@saltwick.test');
  const planned = await owner.request.post('/api/audit-rounds', {
    data: { shopId: saltwick, ...weekIn(monthsBefore(3)), auditorId: otherAuditor },
  });
  expect(planned.status()).toBe(201);
  const notMine = (await planned.json()) as PlannedRound;

  const auditor = await as(browser, 'auditor');
  const jobId = notMine.sampledJobIds[0]!;
  // The bench refuses an auditor every write (and the job itself: auditors read jobs only in rounds).
  expect(
    (await auditor.request.patch(`/api/jobs/${jobId}`, { data: { findings: 'x' } })).status(),
  ).toBe(403);
  expect(
    (
      await auditor.request.post(`/api/jobs/${jobId}/transitions`, { data: { to: 'collected' } })
    ).status(),
  ).toBe(403);
  expect(
    (await auditor.request.put(`/api/jobs/${jobId}/checklist`, { data: { stepIds: [] } })).status(),
  ).toBe(403);
  expect(
    (
      await auditor.request.post(`/api/jobs/${jobId}/parts`, {
        data: { name: 'Drag washer', quantity: 1, unitPriceCents: 100 },
      })
    ).status(),
  ).toBe(403);
  expect((await auditor.request.get(`/api/jobs/${jobId}`)).status()).toBe(403);

  // Another auditor's round does not exist for this one.
  expect((await auditor.request.get(`/api/audit-rounds/${notMine.id}`)).status()).toBe(404);
  expect(
    (await auditor.request.get(`/api/audit-rounds/${notMine.id}/samples/${jobId}`)).status(),
  ).toBe(404);
  const put = await auditor.request.put(`/api/audit-rounds/${notMine.id}/samples/${jobId}`, {
    data: { answers: [], final: false },
  });
  expect(put.status()).toBe(404);
  const list = (await (await auditor.request.get('/api/audit-rounds')).json()) as {
    rounds: { id: number }[];
  };
  expect(list.rounds.map((r) => r.id)).not.toContain(notMine.id);
  await auditor.page.goto(`/audits/${notMine.id}`);
  await expect(auditor.page.getByRole('heading', { level: 1 })).toHaveText('Not found');
  // Auditors cannot plan either.
  expect(
    (
      await auditor.request.post('/api/audit-rounds', {
        data: { shopId: saltwick, ...weekIn(monthsBefore(4)), auditorId: otherAuditor },
      })
    ).status(),
  ).toBe(403);
  await owner.context.close();
  await auditor.context.close();
});

test('regional manager – plans only in their region; bad input is 400 and draws nothing', async ({
  browser,
}) => {
  const south = await as(browser, 'managerSouth');
  const owner = await as(browser, 'owner');
  const skerry = await shopId(owner.request, 'Skerry Wharf');
  const auditorId = await userId(owner.request, 'auditor@saltwick.test');
  const preview = await south.request.get(
    `/api/audit-rounds/preview?shopId=${skerry}&from=${LAST_MONTH.from}&to=${LAST_MONTH.to}`,
  );
  expect(preview.status()).toBe(404);
  const foreign = await south.request.post('/api/audit-rounds', {
    data: { shopId: skerry, ...LAST_MONTH, auditorId },
  });
  expect(foreign.status()).toBe(404);
  const before = (
    (await (await owner.request.get('/api/audit-rounds')).json()) as { rounds: unknown[] }
  ).rounds.length;
  const bad = await owner.request.post('/api/audit-rounds', {
    data: {
      shopId: skerry,
      from: LAST_MONTH.to,
      to: LAST_MONTH.from,
      aql: 3,
      level: 'IV',
      auditorId,
    },
  });
  expect(bad.status()).toBe(400);
  expect(bad.headers()['content-type']).toContain('application/problem+json');
  const problem = (await bad.json()) as { errors: { field: string }[] };
  expect(problem.errors.map((e) => e.field)).toEqual(
    expect.arrayContaining(['body.aql', 'body.level']),
  );
  const reversed = await owner.request.post('/api/audit-rounds', {
    data: { shopId: skerry, from: LAST_MONTH.to, to: LAST_MONTH.from, auditorId },
  });
  expect(reversed.status()).toBe(400);
  expect(
    ((await reversed.json()) as { errors: { field: string; message: string }[] }).errors,
  ).toEqual([{ field: 'body.to', message: 'The period must end on or after its start' }]);
  const after = (
    (await (await owner.request.get('/api/audit-rounds')).json()) as { rounds: unknown[] }
  ).rounds.length;
  expect(after).toBe(before);
  await south.context.close();
  await owner.context.close();
});

test.describe('technician', () => {
  test.use({ storageState: storageState('techMarram') });
  test('technician – has no Audits section and gets 403 from the audit API', async ({
    page,
    request,
  }) => {
    await page.goto('/');
    const nav = page.getByRole('navigation', { name: 'Sections' });
    await expect(nav.getByRole('link', { name: 'Home' })).toBeVisible();
    await expect(nav.getByRole('link', { name: 'Audits' })).toHaveCount(0);
    await expect(nav.getByRole('link', { name: 'Corrective actions' })).toHaveCount(0);
    expect((await request.get('/api/audit-rounds')).status()).toBe(403);
    expect((await request.get('/api/corrective-actions')).status()).toBe(403);
  });
});

test('owner – publishes a new audit form version; a round planned before keeps its version', async ({
  browser,
}) => {
  const owner = await as(browser, 'owner');
  const ternhollow = await shopId(owner.request, 'Ternhollow Lake');
  const auditorId = await userId(owner.request, 'auditor@saltwick.test');
  const before = await owner.request.post('/api/audit-rounds', {
    data: { shopId: ternhollow, ...monthRange(MONTH_BEFORE), auditorId },
  });
  expect(before.status()).toBe(201);
  const planned = (await before.json()) as PlannedRound;

  await owner.page.goto('/settings');
  await owner.page.getByRole('link', { name: 'Audit form' }).click();
  await expect(owner.page.getByRole('heading', { level: 1, name: 'Audit form' })).toBeVisible();
  await expectAccessible(owner.page);
  await owner.page.screenshot({ path: screenshotPath('audit-form-1280'), fullPage: true });
  const first = owner.page.getByRole('group', { name: 'Item 1', exact: true });
  await first.getByLabel('Weight').fill('9');
  await owner.page.getByRole('button', { name: 'Publish this version' }).click();
  await expect(
    owner.page.getByText('Version 2 is published; new rounds will use it.'),
  ).toBeVisible();

  const kept = await owner.request.get(`/api/audit-rounds/${planned.id}`);
  expect(((await kept.json()) as { form: { version: number } }).form.version).toBe(1);
  const next = await owner.request.get(
    `/api/audit-rounds/preview?shopId=${ternhollow}&from=${monthRange(monthsBefore(3)).from}&to=${monthRange(monthsBefore(3)).to}`,
  );
  expect(((await next.json()) as { form: { version: number } }).form.version).toBe(2);
  await owner.context.close();
});
