/**
 * Reader for the common SPICE netlist subset (Berkeley SPICE 3 card syntax): title line, R, C,
 * D, V, I element cards, `.model NAME D(...)`, `+` continuation lines, `*` comment lines, `;` and
 * `$ ` inline comments, `.end`. Other dot-cards, and ngspice `.control … .endc` blocks, are kept
 * verbatim in `ignored` and reported as warnings. Every problem is reported with its 1-based source line; nothing here throws on bad
 * input.
 *
 * Limits (hostile input): at most {@link MAX_NETLIST_CHARS} characters, {@link MAX_ELEMENTS}
 * elements and {@link MAX_LOGICAL_LINE_CHARS} characters per logical (joined) card; at most
 * {@link MAX_REPORTED_ISSUES} errors are collected before the parser gives up.
 */
import { GROUND, type DiodeModel, type IgnoredCard, type Netlist, type NetlistElement, type SineSpec } from './types';
import { parseEngineering } from './units';

/** Largest netlist text accepted (characters, about 2 MB). */
export const MAX_NETLIST_CHARS = 2_000_000;
/** Largest number of element cards accepted. */
export const MAX_ELEMENTS = 200_000;
/** Longest logical card (after joining `+` continuations), in characters. */
export const MAX_LOGICAL_LINE_CHARS = 10_000;
/** Errors collected before parsing stops. */
export const MAX_REPORTED_ISSUES = 200;

/** A problem found at a 1-based source line (0 = the whole input). */
export type ParseIssue = { line: number; message: string };

/** Parser outcome: the netlist with warnings, or every error found (each with its line). */
export type ParseResult =
  | { ok: true; netlist: Netlist; warnings: ParseIssue[] }
  | { ok: false; errors: ParseIssue[] };

/** SPICE 3 level-1 diode defaults (see `DiodeModel`). */
export function defaultDiodeModel(name: string): DiodeModel {
  return { name, isA: 1e-14, n: 1, rsOhm: 0, ibvA: 1e-3, cjoF: 0, vjV: 1, m: 0.5, ttS: 0, fc: 0.5 };
}

type NumericModelKey = Exclude<keyof DiodeModel, 'name'>;
const MODEL_PARAMS: Record<string, NumericModelKey> = {
  IS: 'isA',
  N: 'n',
  RS: 'rsOhm',
  BV: 'bvV',
  IBV: 'ibvA',
  CJO: 'cjoF',
  CJ0: 'cjoF',
  CJ: 'cjoF',
  VJ: 'vjV',
  PB: 'vjV',
  M: 'm',
  MJ: 'm',
  TT: 'ttS',
  FC: 'fc',
};

const UNSUPPORTED_LETTERS: Record<string, string> = {
  L: 'inductors (L)',
  K: 'coupled inductors (K)',
  Q: 'bipolar transistors (Q)',
  M: 'MOSFETs (M)',
  J: 'JFETs (J)',
  X: 'subcircuit instances (X)',
  E: 'controlled sources (E)',
  F: 'controlled sources (F)',
  G: 'controlled sources (G)',
  H: 'controlled sources (H)',
  B: 'behavioural sources (B)',
  S: 'switches (S)',
  W: 'switches (W)',
  T: 'transmission lines (T)',
};

interface Card {
  line: number;
  text: string;
  /** Inside an ngspice `.control … .endc` block: kept verbatim, never read as a card. */
  control?: boolean;
}

/** Remove `;` comments and `$` comments (a `$` at the start or after blank space, as in ngspice). */
function stripInline(text: string): string {
  let out = text;
  const semi = out.indexOf(';');
  if (semi >= 0) out = out.slice(0, semi);
  const dollar = out.search(/(^|\s)\$/);
  if (dollar >= 0) out = out.slice(0, dollar);
  return out;
}

/** Split a card into tokens; parentheses and commas act as blanks, `a = b` becomes `a=b`. */
function tokenize(text: string): string[] {
  return text
    .replace(/[(),]/g, ' ')
    .replace(/\s*=\s*/g, '=')
    .trim()
    .split(/\s+/)
    .filter((t) => t.length > 0);
}

function nodeName(token: string): string {
  return token.toLowerCase() === 'gnd' ? GROUND : token;
}

/** Parse SPICE netlist text into the typed model (see the module header for the subset). */
export function parseNetlist(text: string): ParseResult {
  const errors: ParseIssue[] = [];
  const warnings: ParseIssue[] = [];
  if (typeof text !== 'string') return { ok: false, errors: [{ line: 0, message: 'netlist must be text' }] };
  if (text.length > MAX_NETLIST_CHARS) {
    return {
      ok: false,
      errors: [{ line: 0, message: `netlist is ${text.length} characters; the limit is ${MAX_NETLIST_CHARS}` }],
    };
  }
  const physical = text.split(/\r\n|\r|\n/);
  const title = (physical[0] ?? '').trim();

  // Join `+` continuations onto the card before them, skipping comment and blank lines between.
  const cards: Card[] = [];
  let ended = false;
  let inControl = false;
  for (let i = 1; i < physical.length && !ended; i++) {
    const raw = physical[i];
    const lineNo = i + 1;
    const trimmed = raw.trim();
    if (trimmed.length === 0 || trimmed.startsWith('*')) continue;
    const lowered = trimmed.toLowerCase();
    if (inControl || lowered === '.control') {
      if (trimmed.length <= MAX_LOGICAL_LINE_CHARS) cards.push({ line: lineNo, text: trimmed, control: true });
      inControl = lowered !== '.endc';
      continue;
    }
    if (trimmed.startsWith('+')) {
      const last = cards[cards.length - 1];
      if (!last) {
        errors.push({ line: lineNo, message: 'continuation line "+" has no card before it' });
        continue;
      }
      if (last.text.length + trimmed.length > MAX_LOGICAL_LINE_CHARS) {
        errors.push({ line: last.line, message: `card is longer than ${MAX_LOGICAL_LINE_CHARS} characters` });
        last.text = '';
        continue;
      }
      last.text += ' ' + stripInline(trimmed.slice(1));
      continue;
    }
    if (trimmed.length > MAX_LOGICAL_LINE_CHARS) {
      errors.push({ line: lineNo, message: `line is longer than ${MAX_LOGICAL_LINE_CHARS} characters` });
      cards.push({ line: lineNo, text: '' });
      continue;
    }
    const body = stripInline(trimmed);
    if (body.trim().toLowerCase() === '.end') {
      ended = true;
      continue;
    }
    cards.push({ line: lineNo, text: body });
    if (errors.length >= MAX_REPORTED_ISSUES) break;
  }

  const elements: NetlistElement[] = [];
  const models: Record<string, DiodeModel> = {};
  const modelLines: Record<string, number> = {};
  const ignored: IgnoredCard[] = [];
  const names = new Map<string, number>();

  const fail = (line: number, message: string) => {
    errors.push({ line, message });
  };

  const value = (line: number, token: string | undefined, what: string, name: string): number | null => {
    if (token === undefined) {
      fail(line, `${name}: missing ${what}`);
      return null;
    }
    const v = parseEngineering(token);
    if (v === null) fail(line, `${name}: bad ${what} "${token.slice(0, 40)}"`);
    return v;
  };

  for (const card of cards) {
    if (errors.length >= MAX_REPORTED_ISSUES) break;
    if (card.control) {
      ignored.push({ line: card.line, text: card.text });
      if (card.text.toLowerCase() === '.control') warnings.push({ line: card.line, message: '.control block ignored' });
      continue;
    }
    const tokens = tokenize(card.text);
    if (tokens.length === 0) continue;
    const head = tokens[0];
    const line = card.line;
    if (head.startsWith('.')) {
      const dot = head.toLowerCase();
      if (dot === '.model') parseModel(tokens, line, models, modelLines, fail, warnings, ignored, card.text);
      else if (dot === '.subckt' || dot === '.include' || dot === '.lib') {
        fail(line, `${dot} is not supported: write the circuit flat with R, C, D, V and I cards`);
      } else {
        ignored.push({ line, text: card.text.trim() });
        warnings.push({ line, message: `${head} card ignored` });
      }
      continue;
    }
    const letter = head[0].toUpperCase();
    const name = head;
    if (!'RCDVI'.includes(letter)) {
      const what = UNSUPPORTED_LETTERS[letter];
      fail(line, what ? `${name}: ${what} are not supported (R, C, D, V and I only)` : `${name}: unknown element letter "${head[0]}"`);
      continue;
    }
    if (elements.length >= MAX_ELEMENTS) {
      fail(line, `more than ${MAX_ELEMENTS} elements`);
      break;
    }
    const key = name.toUpperCase();
    const prev = names.get(key);
    if (prev !== undefined) {
      fail(line, `${name}: duplicate element name (first defined on line ${prev})`);
      continue;
    }
    if (tokens.length < 3) {
      fail(line, `${name}: missing node${tokens.length < 2 ? 's' : ''} (needs two)`);
      continue;
    }
    const n1 = nodeName(tokens[1]);
    const n2 = nodeName(tokens[2]);
    if (n1 === n2) {
      fail(line, `${name}: both terminals on the same node "${n1}"`);
      continue;
    }
    const nodes: [string, string] = [n1, n2];
    const rest = tokens.slice(3);
    const before = errors.length;
    let element: NetlistElement | null = null;
    switch (letter) {
      case 'R': {
        const v = value(line, rest[0], 'resistance', name);
        if (v !== null) element = { kind: 'R', name, nodes, resistanceOhm: v, line };
        extra(rest.slice(1), line, name, warnings);
        break;
      }
      case 'C': {
        const v = value(line, rest[0], 'capacitance', name);
        let initialV: number | undefined;
        const more: string[] = [];
        for (const t of rest.slice(1)) {
          if (t.toUpperCase().startsWith('IC=')) {
            const ic = value(line, t.slice(3) || undefined, 'initial condition IC', name);
            if (ic !== null) initialV = ic;
          } else more.push(t);
        }
        extra(more, line, name, warnings);
        if (v !== null) element = { kind: 'C', name, nodes, capacitanceF: v, line, ...(initialV !== undefined ? { initialV } : {}) };
        break;
      }
      case 'D': {
        const model = rest[0];
        if (model === undefined) {
          fail(line, `${name}: missing model name`);
          break;
        }
        let area: number | undefined;
        const more: string[] = [];
        for (const t of rest.slice(1)) {
          if (area === undefined && !t.includes('=') && /^[+-]?[\d.]/.test(t)) {
            const a = value(line, t, 'area factor', name);
            if (a !== null) {
              if (a <= 0) fail(line, `${name}: area factor must be greater than zero`);
              else area = a;
            }
          } else more.push(t);
        }
        extra(more, line, name, warnings);
        element = { kind: 'D', name, nodes: [n1, n2], model, line, ...(area !== undefined ? { area } : {}) };
        break;
      }
      case 'V':
      case 'I': {
        const src = parseSourceSpec(rest, line, name, fail, warnings);
        if (src) {
          element =
            letter === 'V'
              ? { kind: 'V', name, nodes, dcV: src.dc, line, ...(src.sine ? { sine: src.sine } : {}) }
              : { kind: 'I', name, nodes, dcA: src.dc, line, ...(src.sine ? { sine: src.sine } : {}) };
        }
        break;
      }
    }
    if (element && errors.length === before) {
      names.set(key, line);
      elements.push(element);
    } else if (errors.length === before) {
      fail(line, `${name}: could not read the card`);
    } else {
      names.set(key, line);
    }
  }

  for (const el of elements) {
    if (el.kind === 'D' && !models[el.model.toUpperCase()]) {
      fail(el.line ?? 0, `${el.name}: unknown model "${el.model}" (no .model ${el.model} D(...) card)`);
    }
  }
  if (errors.length === 0 && elements.length === 0) fail(0, 'netlist has no elements');
  if (errors.length > 0) {
    errors.sort((a, b) => a.line - b.line);
    return { ok: false, errors: errors.slice(0, MAX_REPORTED_ISSUES) };
  }
  if (/^[RCDVI]\S*\s+\S+\s+\S+\s+\S+/i.test(title)) {
    warnings.unshift({ line: 1, message: 'the first line is the title (SPICE convention); it looks like an element card and was not read as one' });
  }
  return { ok: true, netlist: { title, elements, models, ignored }, warnings };
}

function extra(tokens: string[], line: number, name: string, warnings: ParseIssue[]): void {
  if (tokens.length > 0) warnings.push({ line, message: `${name}: extra "${tokens.join(' ').slice(0, 60)}" ignored` });
}

function parseSourceSpec(
  rest: string[],
  line: number,
  name: string,
  fail: (line: number, message: string) => void,
  warnings: ParseIssue[],
): { dc: number; sine?: SineSpec } | null {
  let dc: number | undefined;
  let sine: SineSpec | undefined;
  let ok = true;
  let i = 0;
  const num = (t: string | undefined) => (t === undefined ? null : parseEngineering(t));
  while (i < rest.length) {
    const t = rest[i];
    const up = t.toUpperCase();
    if (up === 'DC') {
      const v = num(rest[i + 1]);
      if (v === null) {
        fail(line, `${name}: DC needs a value${rest[i + 1] ? `, got "${rest[i + 1].slice(0, 40)}"` : ''}`);
        return null;
      }
      if (dc !== undefined) warnings.push({ line, message: `${name}: DC given twice, the last one is used` });
      dc = v;
      i += 2;
    } else if (up === 'SIN') {
      const args: number[] = [];
      let j = i + 1;
      while (j < rest.length && args.length < 6) {
        const v = num(rest[j]);
        if (v === null) {
          if (/^[+-]?[\d.]/.test(rest[j]) || /^[+-]?(nan|inf)/i.test(rest[j])) {
            fail(line, `${name}: bad SIN parameter "${rest[j].slice(0, 40)}"`);
            return null;
          }
          break;
        }
        args.push(v);
        j++;
      }
      if (args.length < 3) {
        fail(line, `${name}: SIN needs at least VO VA FREQ`);
        return null;
      }
      if (!(args[2] > 0)) {
        fail(line, `${name}: SIN frequency must be greater than zero`);
        return null;
      }
      sine = {
        offsetV: args[0],
        amplitude: args[1],
        frequencyHz: args[2],
        delayS: args[3] ?? 0,
        damping: args[4] ?? 0,
        phaseDeg: args[5] ?? 0,
      };
      i = j;
    } else if (up === 'AC') {
      let j = i + 1;
      while (j < rest.length && j <= i + 2 && num(rest[j]) !== null) j++;
      warnings.push({ line, message: `${name}: AC (small-signal) specification ignored` });
      i = j;
    } else if (['PULSE', 'PWL', 'EXP', 'SFFM', 'AM', 'TRNOISE', 'TRRANDOM'].includes(up)) {
      fail(line, `${name}: ${up} sources are not supported (DC and SIN only)`);
      return null;
    } else {
      const v = num(t);
      if (v === null || dc !== undefined) {
        fail(line, `${name}: bad value "${t.slice(0, 40)}"`);
        ok = false;
        break;
      }
      dc = v;
      i += 1;
    }
  }
  if (!ok) return null;
  if (dc === undefined && !sine) {
    fail(line, `${name}: missing value (DC x or SIN(...))`);
    return null;
  }
  return { dc: dc ?? 0, ...(sine ? { sine } : {}) };
}

function parseModel(
  tokens: string[],
  line: number,
  models: Record<string, DiodeModel>,
  modelLines: Record<string, number>,
  fail: (line: number, message: string) => void,
  warnings: ParseIssue[],
  ignored: IgnoredCard[],
  text: string,
): void {
  const name = tokens[1];
  const type = tokens[2];
  if (!name || !type) {
    fail(line, '.model needs a name and a type, e.g. .model DX D(IS=1e-14)');
    return;
  }
  if (type.toUpperCase() !== 'D') {
    ignored.push({ line, text: text.trim() });
    warnings.push({ line, message: `.model ${name}: type ${type} ignored (only diode models, type D, are used)` });
    return;
  }
  const key = name.toUpperCase();
  if (modelLines[key] !== undefined) {
    fail(line, `.model ${name}: duplicate model name (first defined on line ${modelLines[key]})`);
    return;
  }
  const model = defaultDiodeModel(name);
  for (const t of tokens.slice(3)) {
    const eq = t.indexOf('=');
    if (eq <= 0) {
      fail(line, `.model ${name}: expected PARAM=value, got "${t.slice(0, 40)}"`);
      continue;
    }
    const param = t.slice(0, eq).toUpperCase();
    const field = MODEL_PARAMS[param];
    const v = parseEngineering(t.slice(eq + 1));
    if (!field) {
      warnings.push({ line, message: `.model ${name}: parameter ${param} ignored` });
      continue;
    }
    if (v === null) {
      fail(line, `.model ${name}: bad value for ${param} "${t.slice(eq + 1, eq + 41)}"`);
      continue;
    }
    model[field] = v;
  }
  modelLines[key] = line;
  models[key] = model;
}
