/**
 * Short words and colours for the engine status and the stress flags, shared by the hover cards
 * and the panel so both say the same thing.
 */
import type { EngineStatus } from '@/lib/editor/types';
import type { CheckStatus, StatusTone } from './panel-model';

export const ENGINE_STATUS_TEXT: Record<EngineStatus, string> = {
  idle: 'waiting',
  compiling: 'compiling',
  solving: 'solving',
  solved: 'solved',
  'cannot-solve': 'cannot solve',
};

/** Text colour per stress flag: hazard red past the limit, copper when tight, teal when fine. */
export const CHECK_TONE: Record<CheckStatus, string> = {
  over: 'text-hazard-100 bg-hazard-700/40',
  tight: 'text-copper-100 bg-copper-800/40',
  ok: 'text-lagoon-100',
  unrated: 'text-ink-400',
};

export const CHECK_WORD: Record<CheckStatus, string> = {
  over: 'over limit',
  tight: 'tight',
  ok: 'ok',
  unrated: 'no rating',
};

export const STATUS_TONE_CLASS: Record<StatusTone, string> = {
  busy: 'border-copper-600 text-copper-100',
  current: 'border-lagoon-600 text-lagoon-100',
  stale: 'border-copper-600 text-copper-100',
  failed: 'border-hazard-700 text-hazard-100 bg-hazard-700/20',
  idle: 'border-ink-600 text-ink-200',
};
