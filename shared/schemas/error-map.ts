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
