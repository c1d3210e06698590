/**
 * Display formatting at the UI edge: SI numbers in, engineering-prefixed text out
 * (e.g. 4.7e-9 F → "4.7 nF"). Nothing here is used for computation.
 */

const PREFIXES: [number, string][] = [
  [1e12, 'T'],
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

/** Formats `value` (in the SI base unit `unit`) with an engineering prefix and 3 significant digits. */
export function formatSi(value: number, unit: string): string {
  if (!Number.isFinite(value)) return `— ${unit}`;
  if (value === 0) return `0 ${unit}`;
  const abs = Math.abs(value);
  const entry = PREFIXES.find(([scale]) => abs >= scale * 0.9995) ?? PREFIXES[PREFIXES.length - 1];
  const scaled = value / entry[0];
  const text = Number(scaled.toPrecision(3)).toString();
  return `${text} ${entry[1]}${unit}`;
}

const dateTime = new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'UTC' });

/** An ISO timestamp as a short UTC date and time, e.g. "2 Dec 2026, 00:53 UTC". */
export function formatDateTime(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : `${dateTime.format(d)} UTC`;
}

/** Human label for a design status code. */
export function statusLabel(status: string): string {
  switch (status) {
    case 'draft':
      return 'Draft';
    case 'in_review':
      return 'In review';
    case 'approved':
      return 'Approved';
    case 'changes_requested':
      return 'Changes requested';
    default:
      return status;
  }
}

/** Human label for a recognised topology. */
export function topologyLabel(topology: string | null): string {
  switch (topology) {
    case 'half-wave':
      return 'Half-wave ladder';
    case 'full-wave':
      return 'Full-wave ladder';
    case 'symmetric':
      return 'Symmetric pair';
    case 'custom':
      return 'Custom';
    case null:
      return 'Not recognised';
    default:
      return topology;
  }
}
