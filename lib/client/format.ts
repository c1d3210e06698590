/**
 * Display formatting at the UI edge: SI numbers in, engineering-prefixed text out
 * (e.g. 4.7e-9 F → "4.7 nF"). Nothing here is used for computation.
 */
import { formatEngineering } from '@/lib/circuit/netlist/units';

/**
 * Formats `value` (in the SI base unit `unit`) with an engineering prefix and 3 significant
 * digits, trailing zeros dropped ("4.7 nF"). The prefix choice is the engine's own
 * `formatEngineering`, so the UI and the engine's reports never disagree.
 */
export function formatSi(value: number, unit: string): string {
  if (!Number.isFinite(value)) return `— ${unit}`;
  return formatEngineering(value, unit, 3).replace(/^(-?\d+)(\.\d*?)0+(?=\s)/, (_m, int: string, frac: string) => int + (frac === '.' ? '' : frac));
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
    case 'changed_since_approval':
      return 'Changed since approval';
    default:
      return status;
  }
}

/** Human label for the state of a review request. */
export function reviewStateLabel(state: string): string {
  switch (state) {
    case 'open':
      return 'Waiting for a decision';
    case 'approved':
      return 'Approved';
    case 'changes_requested':
      return 'Changes asked for';
    case 'withdrawn':
      return 'Withdrawn';
    case 'superseded':
      return 'Replaced by a newer request';
    default:
      return state;
  }
}

/** Human label for the state of a fork offered back to its parent. */
export function offerStateLabel(state: string): string {
  switch (state) {
    case 'open':
      return 'Waiting for the parent\u2019s owner';
    case 'accepted':
      return 'Accepted';
    case 'declined':
      return 'Declined';
    case 'withdrawn':
      return 'Withdrawn';
    default:
      return state;
  }
}

/** A user's display name: their name, or their e-mail when they have not given one. */
export function personName(user: { name: string; email: string }): string {
  return user.name || user.email;
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
