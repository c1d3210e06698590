import type { APIRequestContext } from '@playwright/test';
import { expect } from './expect';

/** The local mail catcher started by scripts/fakes.ts (JSON of every caught message, newest first). */
const MAIL_CATCHER_URL = process.env.MAIL_CATCHER_URL ?? 'http://127.0.0.1:2580';

interface CaughtMail {
  id: string;
  receivedAt: string;
  to: string[];
  subject: string;
  text: string;
}

/** A fresh address nobody has used, so each run starts from a clean account. */
export function freshEmail(tag: string): string {
  return `e2e-${tag}-${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 8)}@example.test`;
}

/**
 * Waits until a mail to `to` carries a link whose path contains `pathPart`, and returns the
 * newest such link. Polls the catcher (no fixed sleeps).
 */
export async function waitForLink(request: APIRequestContext, to: string, pathPart: string): Promise<string> {
  let link: string | undefined;
  await expect
    .poll(
      async () => {
        const res = await request.get(`${MAIL_CATCHER_URL}/api/messages?to=${encodeURIComponent(to)}`);
        if (!res.ok()) return undefined;
        const mails = (await res.json()) as CaughtMail[];
        for (const m of mails) {
          const found = (m.text.match(/https?:\/\/\S+/g) ?? []).find((u) => u.includes(pathPart));
          if (found) {
            link = found;
            return found;
          }
        }
        return undefined;
      },
      { message: `a mail to ${to} with a link containing ${pathPart}`, timeout: 20_000 },
    )
    .toBeTruthy();
  return link as string;
}
