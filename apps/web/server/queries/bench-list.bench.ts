// The bench list against 100,000 jobs in one shop, on in-memory PGlite. Prints timings; asserts
// nothing. Run: pnpm --filter @reelwright/web exec vitest bench --run server/queries/bench-list.bench.ts
import { sql } from '@reelwright/db';
import { bench, describe, vi } from 'vitest';
import { jobListQuery, type JobListParams } from '~/lib/validators/jobs';
import { openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildNetwork } from '../bench/fixture';
import { listJobs } from './bench';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

const JOBS = 100_000;
const CUSTOMERS = 20_000;

await openMemoryDb();
const net = await buildNetwork(state.handle!.db);
const shop = net.shops.dune.id;
const started = performance.now();
await state.handle!.db.execute(sql`
  insert into customers (shop_id, name, phone, email)
  select ${shop}, 'Customer ' || g || ' ' || (array['Ashgrove','Birchall','Calloway','Dunmore','Eastwick'])[1 + g % 5],
         '207 555 ' || lpad((g % 10000)::text, 4, '0'), 'c' || g || '@example.test'
  from generate_series(1, ${CUSTOMERS}) g`);
await state.handle!.db.execute(sql`
  insert into reels (customer_id, kind, maker, model, size)
  select c.id, 'spinning', (array['Brinemark','Tidewright','Gullwing','Copperhook'])[1 + c.id % 4],
         'Model ' || (c.id % 37), '3000'
  from customers c where c.shop_id = ${shop}`);
await state.handle!.db.execute(sql`
  insert into jobs (shop_id, customer_id, reel_id, service_type, state, state_changed_at,
                    technician_id, checked_in_at, promised_at, ready_at, collected_at,
                    labour_cents, parts_cents)
  select ${shop}, r.customer_id, r.id,
         (array['tune_up','overhaul','repair','parts_install']::service_type[])[1 + g % 4],
         s.state, s.changed, ${net.as.tech.id}, s.checked_in, s.checked_in + interval '5 days',
         case when s.state in ('ready','collected') then s.changed end,
         case when s.state = 'collected' then s.changed end,
         4500, (g % 7) * 650
  from generate_series(1, ${JOBS}) g
  join reels r on r.id = 3 + (g % ${CUSTOMERS})
  cross join lateral (
    select now() - (g * interval '9 minutes') as checked_in,
           case when g < 400 then (array['checked_in','on_bench','waiting_parts','ready']::job_state[])[1 + g % 4]
                else 'collected'::job_state end as state,
           now() - (g * interval '9 minutes') + interval '2 days' as changed
  ) s`);
await state.handle!.db.execute(sql`analyze`);
console.log(
  `seeded ${JOBS.toLocaleString('en-US')} jobs in ${Math.round(performance.now() - started)} ms`,
);

const cases: [string, JobListParams][] = [
  ['first page, newest check-ins', {}],
  ['page 2,000 of 4,000', { page: '2000' }],
  ['open states', { state: 'checked_in,on_bench,waiting_parts,ready' }],
  ['waiting longer than 3 days', { waitingDays: '3' }],
  ['search a customer name', { q: 'Customer 1234 ' }],
  ['search phone digits', { q: '5550042' }],
  ['sorted by customer name', { sort: 'customer', dir: 'asc' }],
  ['checked in during one month', { from: '2026-06-01', to: '2026-06-30' }],
];

describe(`bench list, ${JOBS.toLocaleString('en-US')} jobs in one shop`, () => {
  for (const [name, params] of cases) {
    const q = jobListQuery.parse(params);
    bench(name, async () => void (await listJobs(net.as.tech, q)), {
      iterations: 5,
      warmupIterations: 1,
      time: 0,
    });
  }
});
