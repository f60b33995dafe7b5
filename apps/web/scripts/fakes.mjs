#!/usr/bin/env node
// Local stand-ins for object storage and SMTP, started by `npm run demo` and the end-to-end server:
// an S3-compatible server (s3rver) with the photo bucket and CORS for the browser's direct uploads,
// and an SMTP catcher that keeps what it receives and shows it over HTTP (GET /messages).
//
//   node apps/web/scripts/fakes.mjs
//
// Settings (environment, all optional): FAKES_HOST (127.0.0.1); FAKES_S3=0 / FAKES_SMTP=0 to skip
// one; FAKES_S3_PORT (4569), FAKES_S3_DIR (data/s3), S3_BUCKET (reelwright-photos);
// FAKES_SMTP_PORT (2525), FAKES_MAIL_HTTP_PORT (2580), FAKES_MAIL_KEEP (500 messages).
// A port of 0 takes any free one. FAKES_ENV_FILE: once everything listens, the settings the app
// needs (S3_ENDPOINT, SMTP_URL, MAIL_CATCHER_URL, …) are written there as KEY=value lines.
import { randomUUID } from 'node:crypto';
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { simpleParser } from 'mailparser';
import S3rver from 's3rver';
import { SMTPServer } from 'smtp-server';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');
const host = process.env.FAKES_HOST || '127.0.0.1';
const port = (name, fallback) => {
  const raw = process.env[name];
  const value = raw === undefined || raw === '' ? fallback : Number(raw);
  if (!Number.isInteger(value) || value < 0 || value > 65535) {
    console.error(`fakes: ${name} must be a port number, got "${raw}"`);
    process.exit(2);
  }
  return value;
};
const enabled = (name) => process.env[name] !== '0';

const bucket = process.env.S3_BUCKET || 'reelwright-photos';
const keep = Number(process.env.FAKES_MAIL_KEEP || 500);
const closers = [];
const settings = {};

// s3rver accepts the access key it was started with; its own defaults are S3RVER / S3RVER.
const S3_KEY = 'S3RVER';

// The browser PUTs photos straight to storage from the app's origin, so the bucket allows CORS for
// that; photos are read back through the app, never by the browser from here.
const corsXml = `<CORSConfiguration>
  <CORSRule>
    <AllowedOrigin>*</AllowedOrigin>
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;

async function startS3() {
  const directory = path.resolve(process.env.FAKES_S3_DIR || path.join(root, 'data', 's3'));
  mkdirSync(directory, { recursive: true });
  const server = new S3rver({
    address: host,
    port: port('FAKES_S3_PORT', 4569),
    directory,
    silent: true,
    // Path-style only: the bucket is never taken from the Host header.
    vhostBuckets: false,
    configureBuckets: [{ name: bucket, configs: [corsXml] }],
  });
  // The fake shares the app's host name (another port is the same site), so nothing it serves may
  // be taken for a page: no sniffing, and a sandbox with no script even if opened directly.
  server.middleware.unshift(async (ctx, next) => {
    await next();
    ctx.set('X-Content-Type-Options', 'nosniff');
    ctx.set('Content-Security-Policy', "default-src 'none'; sandbox");
  });
  const address = await server.run();
  closers.push(() => server.close());
  const endpoint = `http://${host}:${address.port}`;
  Object.assign(settings, {
    S3_ENDPOINT: endpoint,
    S3_REGION: 'us-east-1',
    S3_BUCKET: bucket,
    S3_ACCESS_KEY_ID: S3_KEY,
    S3_SECRET_ACCESS_KEY: S3_KEY,
  });
  console.log(
    `fakes: S3-compatible storage on ${endpoint}, bucket "${bucket}", files in ${directory}`,
  );
}

async function startMail() {
  /** Newest last; bounded so a long demo does not grow without end. */
  const messages = [];
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          messages.push({
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            envelope: {
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
              to: session.envelope.rcptTo.map((r) => r.address),
            },
            messageId: mail.messageId ?? null,
            from: mail.from?.text ?? null,
            to: Array.isArray(mail.to)
              ? mail.to.map((a) => a.text).join(', ')
              : (mail.to?.text ?? null),
            subject: mail.subject ?? '',
            date: mail.date ? mail.date.toISOString() : null,
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : null,
          });
          if (messages.length > keep) messages.splice(0, messages.length - keep);
          callback();
        })
        .catch(callback);
    },
  });
  smtp.on('error', (error) => console.error('fakes: SMTP catcher error:', error.message));
  await new Promise((resolve, reject) => {
    smtp.server.once('error', reject);
    smtp.listen(port('FAKES_SMTP_PORT', 2525), host, resolve);
  });
  closers.push(() => new Promise((resolve) => smtp.close(resolve)));

  const web = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://catcher');
    const json = (status, body) => {
      res.writeHead(status, { 'content-type': 'application/json' });
      res.end(JSON.stringify(body));
    };
    if (url.pathname === '/health') return json(200, { ok: true, messages: messages.length });
    if (url.pathname === '/messages' && req.method === 'GET') {
      const to = url.searchParams.get('to')?.toLowerCase();
      const list = messages
        .filter((m) => !to || m.envelope.to.some((a) => a.toLowerCase() === to))
        .slice()
        .reverse();
      return json(200, { messages: list });
    }
    if (url.pathname === '/messages' && req.method === 'DELETE') {
      messages.length = 0;
      return json(200, { messages: [] });
    }
    json(404, { error: 'GET /messages, DELETE /messages or GET /health' });
  });
  await new Promise((resolve, reject) => {
    web.once('error', reject);
    web.listen(port('FAKES_MAIL_HTTP_PORT', 2580), host, resolve);
  });
  closers.push(() => new Promise((resolve) => web.close(resolve)));

  const smtpPort = smtp.server.address().port;
  const webUrl = `http://${host}:${web.address().port}`;
  Object.assign(settings, { SMTP_URL: `smtp://${host}:${smtpPort}`, MAIL_CATCHER_URL: webUrl });
  console.log(`fakes: SMTP catcher on ${host}:${smtpPort}, caught messages at ${webUrl}/messages`);
}

let stopping = false;
async function stop(code = 0) {
  if (stopping) return;
  stopping = true;
  await Promise.allSettled(closers.map((close) => close()));
  console.log('fakes: stopped');
  process.exit(code);
}
process.on('SIGINT', () => stop(0));
process.on('SIGTERM', () => stop(0));
process.on('SIGHUP', () => stop(0));

try {
  if (enabled('FAKES_S3')) await startS3();
  if (enabled('FAKES_SMTP')) await startMail();
} catch (error) {
  console.error(`fakes: could not start: ${error instanceof Error ? error.message : error}`);
  await stop(1);
}

const envFile = process.env.FAKES_ENV_FILE;
if (envFile) {
  const lines = Object.entries(settings).map(([k, v]) => `${k}=${v}`);
  // Written whole and then renamed, so a reader waiting for the file never sees half of it.
  const temporary = `${envFile}.${process.pid}.tmp`;
  writeFileSync(temporary, `${lines.join('\n')}\n`);
  renameSync(temporary, envFile);
}

// Started in the background by a script: leave when that script is gone, so no fake is orphaned.
const parent = process.ppid;
setInterval(() => {
  if (process.ppid !== parent) stop(0);
}, 1_000).unref();
