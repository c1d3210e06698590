/**
 * The local stand-ins the app talks to: the S3 fake through lib/storage (byte-exact round trip,
 * gotcha G11) and the SMTP catcher through lib/mail (the sign-in link readable in plain text).
 */
import { randomBytes } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { deleteObject, getObject, putObject } from '@/lib/storage';
import { sendMail, signInLinkMessage } from '@/lib/mail';
import { freshEmail, mailFor, teardown } from './helpers';

afterAll(teardown);

describe('object storage (S3 fake)', () => {
  it('puts, gets byte-identical, deletes', async () => {
    const key = `tests/${Date.now()}-${Math.random().toString(36).slice(2)}.bin`;
    const bytes = new Uint8Array(randomBytes(300_000));
    await putObject(key, bytes);
    const back = await getObject(key);
    expect(back?.byteLength).toBe(bytes.byteLength);
    expect(Buffer.from(back!).equals(Buffer.from(bytes))).toBe(true);
    await deleteObject(key);
    expect(await getObject(key)).toBeNull();
  });
});

describe('mail (SMTP catcher)', () => {
  it('delivers the sign-in link in the plain-text part', async () => {
    const to = freshEmail('link');
    const url = 'http://127.0.0.1:3000/api/auth/callback/email?token=abc123&email=x';
    await sendMail(signInLinkMessage(to, url));
    let mails: { subject: string; text: string }[] = [];
    for (let i = 0; i < 20 && mails.length === 0; i++) {
      mails = await mailFor(to);
      if (!mails.length) await new Promise((r) => setTimeout(r, 100));
    }
    expect(mails[0].subject).toBe('Your Kilorung sign-in link');
    expect(mails[0].text.split('\n')).toContain(url);
  });
});
