/** `@Full Name` mentions: longest name wins, case does not matter, names end at a word boundary, e-mail addresses are not mentions. */
import { describe, expect, it } from 'vitest';
import { findMentions, mentionedIds } from '@/lib/data/mentions';

const people = [
  { id: 'ann', name: 'Ann' },
  { id: 'annmarie', name: 'Ann Marie' },
  { id: 'annmq', name: 'Ann Marie Quill' },
  { id: 'bo', name: 'Bo Teller' },
  { id: 'blank', name: '   ' },
  { id: 'zoe', name: 'Zoë Ølund' },
];

describe('findMentions', () => {
  it('takes the longest member name after each @, whatever the case', () => {
    expect(mentionedIds('@ann marie quill please check C3', people)).toEqual(['annmq']);
    expect(mentionedIds('@Ann Marie, and @ANN too', people)).toEqual(['annmarie', 'ann']);
    expect(mentionedIds('thanks @Bo Teller.', people)).toEqual(['bo']);
  });

  it('gives the span of each mention as written', () => {
    const text = 'ask @Bo Teller and @Zoë Ølund';
    const spans = findMentions(text, people);
    expect(spans.map((s) => [text.slice(s.start, s.end), s.userId])).toEqual([
      ['@Bo Teller', 'bo'],
      ['@Zoë Ølund', 'zoe'],
    ]);
  });

  it('needs the name to end where a word ends', () => {
    expect(mentionedIds('@Annette is not Ann', people)).toEqual([]);
    // "Ann Marie Q" is not a name; the longest one that ends at a word boundary is "Ann Marie"
    expect(mentionedIds('@Ann Marie Quillon', people)).toEqual(['annmarie']);
    expect(mentionedIds('@Bo', people)).toEqual([]);
  });

  it('ignores an @ inside an e-mail address, a lone @ and blank names', () => {
    expect(mentionedIds('write to lab@Ann or @ alone', people)).toEqual([]);
    expect(mentionedIds('@   x', people)).toEqual([]);
  });

  it('lists each person once, in order of first mention', () => {
    expect(mentionedIds('@Bo Teller @Ann @bo teller', people)).toEqual(['bo', 'ann']);
  });
});
