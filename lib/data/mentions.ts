/**
 * Mentions in plain-text comments: `@Full Name` names a member of the design's team. Names may
 * hold spaces, so after each `@` the longest member name that follows (compared without regard
 * to case) wins, and it must end where a word ends (`@Ann` does not match inside `@Annette`).
 * An `@` glued to a letter or digit before it (an e-mail address) starts no mention.
 *
 * Pure and free of server imports: the server stores the ids it finds, and the client may use
 * the same spans to highlight mentions while typing or reading.
 */

/** A person who may be mentioned. */
export interface Mentionable {
  id: string;
  name: string;
}

/** One mention in a text: `text.slice(start, end)` is `@` plus the name as written. */
export interface MentionSpan {
  start: number;
  end: number;
  userId: string;
}

const WORD_CHAR = /[\p{L}\p{N}_]/u;

/** Every mention in `text`, in order, with the longest member name at each `@`. */
export function findMentions(text: string, people: readonly Mentionable[]): MentionSpan[] {
  const candidates = people
    .map((p) => ({ id: p.id, name: p.name.trim().replace(/\s+/g, ' '), folded: p.name.trim().replace(/\s+/g, ' ').toLocaleLowerCase() }))
    .filter((p) => p.name.length > 0)
    .sort((a, b) => b.name.length - a.name.length);
  const spans: MentionSpan[] = [];
  let at = text.indexOf('@');
  while (at !== -1) {
    const before = at > 0 ? text[at - 1] : '';
    let next = at + 1;
    if (!before || !WORD_CHAR.test(before)) {
      for (const p of candidates) {
        const end = at + 1 + p.name.length;
        if (text.slice(at + 1, end).toLocaleLowerCase() !== p.folded) continue;
        const after = text[end];
        if (after !== undefined && WORD_CHAR.test(after)) continue;
        spans.push({ start: at, end, userId: p.id });
        next = end;
        break;
      }
    }
    at = text.indexOf('@', next);
  }
  return spans;
}

/** The distinct ids mentioned in `text`, in order of first mention. */
export function mentionedIds(text: string, people: readonly Mentionable[]): string[] {
  return [...new Set(findMentions(text, people).map((s) => s.userId))];
}
