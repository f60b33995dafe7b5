// A load run from outside: USERS signed-in staff for SECONDS, each sending one request after the
// other with a 70/30 read/write mix (bench list, job page, network comparison, comebacks; check-ins
// and transitions), and the month-close CSV once a minute. Prints requests per second and
// p50/p95/p99 latency. A benchmark: it prints figures and asserts nothing but "no errors".
//   LOAD_BASE=http://127.0.0.1:3000 LOAD_USERS=50 LOAD_SECONDS=60 node tests/production/load.mjs
const base = process.env.LOAD_BASE ?? 'http://127.0.0.1:3000';
const users = Number(process.env.LOAD_USERS ?? 50);
const seconds = Number(process.env.LOAD_SECONDS ?? 60);
const label = process.env.LOAD_LABEL ?? base;
// The app's public origin (NEXTAUTH_URL), when the load goes to one instance behind a balancer.
const origin = process.env.LOAD_ORIGIN ?? base;
const PASSWORD = 'reelwright-demo';

async function signIn(email) {
  const jar = new Map();
  const call = async (path, init = {}) => {
    const response = await fetch(base + path, {
      ...init,
      redirect: 'manual',
      headers: {
        origin,
        cookie: [...jar].map(([k, v]) => `${k}=${v}`).join('; '),
        ...init.headers,
      },
    });
    for (const line of response.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const at = pair.indexOf('=');
      jar.set(pair.slice(0, at), pair.slice(at + 1));
    }
    return response;
  };
  const { csrfToken } = await (await call('/api/auth/csrf')).json();
  await call('/api/auth/callback/credentials', {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ csrfToken, email, password: PASSWORD, json: 'true' }).toString(),
  }).then((r) => r.text());
  return call;
}

const staff = ['lead.marram', 'tech.marram', 'lead.fennel', 'tech.fennel'];
const owner = await signIn('owner@saltwick.test');
const sessions = await Promise.all(staff.map((s) => signIn(`${s}@saltwick.test`)));
const latencies = [];
let errors = 0;
const kinds = new Map();
let n = 0;
const NEXT = { checked_in: 'on_bench', on_bench: 'ready', ready: 'collected' };
const state = new Map();

async function timed(call, path, init) {
  const t0 = performance.now();
  try {
    const response = await call(path, init);
    const text = await response.text();
    if (response.status >= 400) {
      errors += 1;
      const key = `${init?.method ?? 'GET'} ${path.replace(/\d+/g, 'N')} ${response.status}`;
      kinds.set(key, (kinds.get(key) ?? 0) + 1);
    }
    latencies.push(performance.now() - t0);
    return { status: response.status, text };
  } catch {
    errors += 1;
    return null;
  }
}

const post = (body) => ({
  method: 'POST',
  headers: { 'content-type': 'application/json' },
  body: JSON.stringify(body),
});

async function user(u, until) {
  const s = u % sessions.length;
  const call = sessions[s];
  // Each user moves only the jobs it checked in, so no two move one job at once.
  const mine = [];
  while (performance.now() < until) {
    const r = Math.random();
    if (r < 0.25) await timed(call, '/api/jobs');
    else if (r < 0.45 && mine.length) await timed(call, `/api/jobs/${mine[mine.length - 1]}`);
    else if (r < 0.55) await timed(owner, '/api/network/comparison?from=2026-11-01&to=2026-11-30');
    else if (r < 0.7) await timed(call, '/api/comebacks');
    else if (r < 0.85 || !mine.length) {
      const response = await timed(
        call,
        '/api/jobs',
        post({
          customer: { name: `Load Customer ${u}-${n}` },
          reel: { kind: 'spinning', maker: 'Tidewake', model: `Load ${u}-${n}` },
          serviceType: 'tune_up',
          promisedOn: '2026-12-08',
        }),
      );
      if (response?.status === 201) {
        const { id } = JSON.parse(response.text);
        if (id) {
          mine.push(id);
          state.set(id, 'checked_in');
        }
      }
    } else {
      const id = mine[0];
      const to = NEXT[state.get(id)];
      await timed(
        call,
        `/api/jobs/${id}/transitions`,
        post({ to, ...(to === 'ready' && { reason: 'Load run' }) }),
      );
      if (to === 'collected') mine.shift();
      else state.set(id, to);
    }
    n += 1;
  }
}

const t0 = performance.now();
const until = t0 + seconds * 1000;
const csv = setInterval(() => void timed(owner, '/api/month-close/2026-11.csv'), 60_000);
await Promise.all(Array.from({ length: users }, (_, u) => user(u, until)));
clearInterval(csv);
const elapsed = (performance.now() - t0) / 1000;
latencies.sort((a, b) => a - b);
const at = (p) => latencies[Math.min(latencies.length - 1, Math.floor(p * latencies.length))] ?? 0;
console.log(
  `${label}: ${users} users, ${elapsed.toFixed(0)} s: ${(latencies.length / elapsed).toFixed(1)} requests/s, ` +
    `p50 ${at(0.5).toFixed(0)} ms, p95 ${at(0.95).toFixed(0)} ms, p99 ${at(0.99).toFixed(0)} ms, ${errors} errors`,
);
if (kinds.size) console.log('  errors:', JSON.stringify(Object.fromEntries(kinds)));
