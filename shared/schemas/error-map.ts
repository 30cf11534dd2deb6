/**
 * The product's voice for validation messages. Every schema names its own message where it has something particular
 * to say ("must be a length such as 190 cm"); whatever a schema leaves unsaid would otherwise come out in the
 * validation library's own words ("Too small: expected string to have >=1 characters"). This map words those cases
 * the way the rest of the product does: a short predicate that reads on after the field's name ("Name is required",
 * "Discount must be at most 40"). Installed once, on import, for the server and the browser alike.
 */
import { z } from 'zod';

type Issue = z.core.$ZodRawIssue;

const KINDS: Record<string, string> = {
  string: 'text',
  number: 'a number',
  int: 'a whole number',
  bigint: 'a whole number',
  boolean: 'yes or no',
  array: 'a list',
  object: 'a set of fields',
  date: 'a date',
};

function count(n: number | bigint, one: string, many = `${one}s`): string {
  return `${n} ${Number(n) === 1 ? one : many}`;
}

function list(values: readonly unknown[]): string {
  const words = values.map((v) => (typeof v === 'string' ? v : JSON.stringify(v)));
  if (words.length <= 1) return words.join('');
  return `${words.slice(0, -1).join(', ')} or ${words.at(-1)}`;
}

/** Our words for an issue the schema gave no message of its own. */
export function plainMessage(issue: Issue): string {
  switch (issue.code) {
    case 'invalid_type':
      if (issue.input === undefined || issue.input === null) return 'is required';
      return `must be ${KINDS[issue.expected] ?? 'of another kind'}`;
    case 'too_small': {
      const min = issue.minimum as number | bigint;
      if (issue.origin === 'string') return Number(min) <= 1 ? 'is required' : `must be at least ${count(min, 'character')}`;
      if (issue.origin === 'array' || issue.origin === 'set') return `needs at least ${count(min, 'item')}`;
      if (issue.origin === 'date') return 'is too early';
      return issue.inclusive ? `must be at least ${min}` : `must be more than ${min}`;
    }
    case 'too_big': {
      const max = issue.maximum as number | bigint;
      if (issue.origin === 'string') return `must be at most ${count(max, 'character')}`;
      if (issue.origin === 'array' || issue.origin === 'set') return `can hold at most ${count(max, 'item')}`;
      if (issue.origin === 'date') return 'is too late';
      return issue.inclusive ? `must be at most ${max}` : `must be less than ${max}`;
    }
    case 'invalid_format':
      if (issue.format === 'email') return 'must be an e-mail address';
      if (issue.format === 'url') return 'must be a web address';
      if (issue.format === 'date' || issue.format === 'datetime') return 'must be a date such as 2026-03-14';
      if (issue.format === 'time') return 'must be a time such as 08:30';
      return 'is not written in a form we can read';
    case 'not_multiple_of':
      return `must be a multiple of ${String(issue.divisor)}`;
    case 'unrecognized_keys':
      // The names come from the request: quoted, a few and short, so a message never carries much of someone's input.
      return `has ${issue.keys.length === 1 ? 'a field' : 'fields'} we do not use: ${list(issue.keys.slice(0, 5).map((k) => JSON.stringify(k.slice(0, 40))))}${issue.keys.length > 5 ? ' and more' : ''}`;
    case 'invalid_value':
      return `must be ${issue.values.length === 1 ? list(issue.values) : `one of ${list(issue.values)}`}`;
    case 'invalid_union':
      return 'is not in a form we can read';
    case 'invalid_key':
    case 'invalid_element':
      return 'holds a value we cannot read';
    default:
      return 'is not valid';
  }
}

z.config({ customError: (issue) => plainMessage(issue) });

/** How people name a field whose key is not already plain words. */
const FIELD_WORDS: Record<string, string> = {
  discountPct: 'discount',
  cutLb: 'cut',
  email: 'e-mail address',
  customerId: 'customer',
  quoteId: 'quote',
  estimateId: 'estimate',
  pieceId: 'piece',
  jobId: 'job',
  q: 'search',
  '(body)': 'request',
  actualEnd: 'actual finish',
  actualStart: 'actual start',
  priceMinor: 'price',
  amountMinor: 'amount',
  polisherRate: 'polisher’s rate',
  sha256: 'file’s fingerprint',
};

/** Lists whose entries are named by their number ("stage 2", "part 1"). */
const ITEM_WORDS: Record<string, string> = {
  stages: 'stage',
  parts: 'part',
  materials: 'material line',
  lines: 'line',
  items: 'item',
  pieces: 'piece',
  options: 'option',
  points: 'point',
  photos: 'photo',
  sessions: 'session',
  rows: 'row',
};

/** Path steps that only group fields and add nothing a person would say. */
const WRAPPERS = new Set(['input', 'dimensions', 'shape', 'pricing', 'body', 'data', 'values']);

function words(key: string): string {
  if (FIELD_WORDS[key]) return FIELD_WORDS[key];
  const plain = key
    .replace(/(Id|Pct|Minor|Lb)$/, '')
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[_-]+/g, ' ')
    .toLowerCase()
    .trim();
  return plain || key;
}

/** Entry i of the list named just before it: "stage 2", "part 1", or "entry 3" when the list has no name. */
function entry(steps: readonly string[], i: number): string {
  const list = i > 0 && !/^\d+$/.test(steps[i - 1]) ? steps[i - 1] : '';
  const noun = list ? (ITEM_WORDS[list] ?? words(list).replace(/s$/, '')) : 'entry';
  return `${noun} ${Number(steps[i]) + 1}`;
}

/** "stages.1.cutLb" → "the cut of stage 2"; "piece.dimensions.length" → "the length of the piece". */
export function fieldLabel(path: readonly PropertyKey[]): string {
  const steps = path.map((p) => (typeof p === 'symbol' ? '' : String(p))).filter(Boolean);
  if (!steps.length) return 'the request';
  // The field itself: the last named step, or an entry of a list named by its number.
  let end = steps.length - 1;
  let field: string;
  if (/^\d+$/.test(steps[end])) {
    field = entry(steps, end);
    end -= end > 0 && !/^\d+$/.test(steps[end - 1]) ? 2 : 1;
  } else {
    field = `the ${words(steps[end])}`;
    end -= 1;
  }
  // What it belongs to: the numbered entries it sits in, or else its nearest plain owner.
  const owners: string[] = [];
  for (let i = end; i >= 0; i -= 1) {
    const step = steps[i];
    if (/^\d+$/.test(step)) {
      owners.push(entry(steps, i));
      if (i > 0 && !/^\d+$/.test(steps[i - 1])) i -= 1;
    } else if (!owners.length && !WRAPPERS.has(step)) {
      owners.push(`the ${words(step)}`);
    }
  }
  return [field, ...owners].join(' of ');
}

/** Words a message may start with that read on after a field's name ("is required", "must be…"). */
const PREDICATE = /^(is|are|must|needs?|has|have|takes|cannot|can|should|may|does|do)\b/;

/**
 * A whole sentence for one validation issue, in the product's voice: "The length of the lid is missing.",
 * "The cut of stage 2 must be more than zero.". Messages that are already sentences of their own keep their words
 * and name the field after them.
 */
export function validationSentence(path: readonly PropertyKey[], message: string): string {
  const label = fieldLabel(path);
  const said = message.trim().replace(/^is required$/, 'is missing').replace(/[.\s]+$/, '');
  const upper = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
  if (PREDICATE.test(said)) return `${upper(label)} ${said}.`;
  return `${upper(said)} (${label}).`;
}
