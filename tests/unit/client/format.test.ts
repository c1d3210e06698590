import { describe, expect, it } from 'vitest';
import { formatDateTime, formatSi, offerStateLabel, personName, reviewStateLabel, statusLabel, topologyLabel } from '@/lib/client/format';

// SI prefixes per the BIPM SI Brochure, 9th edition (2019), §3 (from memory): k = 1e3, n = 1e-9, µ = 1e-6.
describe('formatSi', () => {
  it.each([
    [4.7e-9, 'F', '4.7 nF'],
    [2500, 'V', '2.5 kV'],
    [20_000, 'Hz', '20 kHz'],
    [1e-6, 'F', '1 µF'],
    [0.001, 'A', '1 mA'],
    [50, 'Hz', '50 Hz'],
    [-1500, 'V', '-1.5 kV'],
    [0, 'A', '0 A'],
    [1.5e6, 'Ω', '1.5 MΩ'],
  ])('%d %s → %s', (value, unit, text) => {
    expect(formatSi(value, unit)).toBe(text);
  });

  it('rounds to three significant digits and moves up a prefix when rounding reaches 1000', () => {
    expect(formatSi(999.96, 'V')).toBe('1 kV');
    expect(formatSi(999.4, 'V')).toBe('999 V');
    expect(formatSi(12_345, 'V')).toBe('12.3 kV');
  });

  it('does not print NaN or Infinity as numbers', () => {
    expect(formatSi(Number.NaN, 'V')).toBe('— V');
    expect(formatSi(Number.POSITIVE_INFINITY, 'V')).toBe('— V');
  });
});

describe('labels', () => {
  it('formats an ISO time in UTC', () => {
    expect(formatDateTime('2026-12-02T00:53:00.000Z')).toBe('2 Dec 2026, 00:53 UTC');
    expect(formatDateTime('not a date')).toBe('not a date');
  });
  it('names statuses and topologies', () => {
    expect(statusLabel('in_review')).toBe('In review');
    expect(topologyLabel('full-wave')).toBe('Full-wave ladder');
    expect(topologyLabel(null)).toBe('Not recognised');
  });
  it('names every design status, including changed since approval', () => {
    expect(statusLabel('changed_since_approval')).toBe('Changed since approval');
    expect(statusLabel('changes_requested')).toBe('Changes requested');
    expect(statusLabel('draft')).toBe('Draft');
  });
  it('names review and offer states and people', () => {
    expect(reviewStateLabel('superseded')).toBe('Replaced by a newer request');
    expect(reviewStateLabel('changes_requested')).toBe('Changes asked for');
    expect(offerStateLabel('accepted')).toBe('Accepted');
    expect(personName({ name: '', email: 'a@b.test' })).toBe('a@b.test');
    expect(personName({ name: 'Ada Vale', email: 'a@b.test' })).toBe('Ada Vale');
  });
});
