/**
 * Local stand-ins for the hosted services, started by `npm run app` and `npm test`:
 * - an SMTP catcher (smtp-server + mailparser) on 127.0.0.1:$SMTP_PORT that keeps every mail,
 *   readable on loopback at http://127.0.0.1:$MAIL_HTTP_PORT:
 *     GET /            a plain HTML list of caught mail (newest first) for people
 *     GET /api/messages[?to=ADDRESS]   JSON list (newest first) for tests
 *     DELETE /api/messages             forget everything caught
 * - an S3-compatible object store (s3rver) on 127.0.0.1:$S3_PORT with its files in .data/s3.
 */
import http from 'node:http';
import fs from 'node:fs';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import S3rver from 's3rver';

const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const httpPort = Number(process.env.MAIL_HTTP_PORT ?? 2580);
const s3Port = Number(process.env.S3_PORT ?? 4569);
const dataDir = process.env.KR_DATA ?? path.resolve(import.meta.dirname, '..', '.data');
const bucket = process.env.S3_BUCKET ?? 'kilorung';

interface CaughtMail {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

const mails: CaughtMail[] = [];
let nextId = 1;

const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  logger: false,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((parsed) => {
        const to = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
        mails.push({
          id: nextId++,
          receivedAt: new Date().toISOString(),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to,
          subject: parsed.subject ?? '',
          text: parsed.text ?? '',
          html: typeof parsed.html === 'string' ? parsed.html : '',
        });
        if (mails.length > 2000) mails.shift();
        callback();
      })
      .catch((err: Error) => callback(err));
  },
});

// A client that drops its connection mid-conversation (a test aborting a send, a process exiting)
// surfaces as an 'error' event on the server; unhandled, it would kill the catcher for every later
// test. Log it and keep serving.
smtp.on('error', (err: Error) => console.error(`[fakes] SMTP connection error (ignored): ${err.message}`));

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);
}

const web = http.createServer((req, res) => {
  const url = new URL(req.url ?? '/', `http://127.0.0.1:${httpPort}`);
  if (url.pathname === '/api/messages' && req.method === 'DELETE') {
    mails.length = 0;
    res.writeHead(204).end();
    return;
  }
  const to = url.searchParams.get('to')?.toLowerCase();
  const list = mails.filter((m) => !to || m.to.includes(to)).slice().reverse();
  if (url.pathname === '/api/messages') {
    res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(list));
    return;
  }
  if (url.pathname === '/') {
    const rows = list
      .map((m) => `<article><h2>${escapeHtml(m.subject)}</h2><p>to ${escapeHtml(m.to.join(', '))} · ${m.receivedAt}</p><pre>${escapeHtml(m.text)}</pre></article>`)
      .join('\n');
    res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' }).end(
      `<!doctype html><title>Kilorung mail catcher</title><h1>Caught mail (${list.length})</h1>${rows}`,
    );
    return;
  }
  res.writeHead(404, { 'content-type': 'application/json' }).end(JSON.stringify({ error: { code: 'not_found', message: 'no such page' } }));
});

const s3Dir = path.join(dataDir, 's3');
fs.mkdirSync(s3Dir, { recursive: true });
const s3 = new S3rver({
  address: '127.0.0.1',
  port: s3Port,
  silent: true,
  directory: s3Dir,
  configureBuckets: [{ name: bucket, configs: [] }],
});

await new Promise<void>((resolve) => smtp.listen(smtpPort, '127.0.0.1', resolve));
await new Promise<void>((resolve) => web.listen(httpPort, '127.0.0.1', resolve));
await s3.run();
console.log(`[fakes] SMTP catcher 127.0.0.1:${smtpPort}, caught mail at http://127.0.0.1:${httpPort}, S3 fake http://127.0.0.1:${s3Port} (bucket ${bucket})`);

function stop(): void {
  smtp.close(() => undefined);
  web.close();
  void s3.close().finally(() => process.exit(0));
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
