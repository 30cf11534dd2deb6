/**
 * Message templates as properties: every known placeholder is always filled in, an unknown one is always refused
 * (named), and everything else in the text comes out exactly as typed, stray braces included.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MessageTemplateUpdateSchema, PLACEHOLDERS, renderTemplate, unknownPlaceholders, type PlaceholderValues } from '../../shared/schemas/messages';

/** Text with no placeholder in it: any characters, braces too, as long as no {name} forms. */
const plain = fc.string({ unit: fc.constantFrom('a', 'B', ' ', '\n', '{', '}', '£', '1', '_', '.', 'é', '{ }') }).filter((s) => unknownPlaceholders(s).length === 0 && !/\{[A-Za-z0-9_]+\}/.test(s));
const known = fc.constantFrom(...PLACEHOLDERS);
const values = fc.record(Object.fromEntries(PLACEHOLDERS.map((p) => [p, fc.string({ maxLength: 30 })])) as Record<keyof PlaceholderValues, fc.Arbitrary<string>>);
const unknownName = fc.stringMatching(/^[A-Za-z0-9_]{1,12}$/).filter((n) => !(PLACEHOLDERS as readonly string[]).includes(n));

/** Joins plain pieces so that no placeholder forms across a join (a piece ending in "{" next to a name). */
const sep = (s: string) => s.replace(/\{$/, '{ ').replace(/^\}/, ' }');

describe('message templates', () => {
  it('fills in every known placeholder and leaves the rest of the text exactly as it was', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(plain, known)), plain, values, (parts, tail, v) => {
        const text = parts.map(([p, k]) => `${sep(p)}{${k}}`).join('') + sep(tail);
        const expected = parts.map(([p, k]) => `${sep(p)}${v[k]}`).join('') + sep(tail);
        expect(renderTemplate(text, v)).toBe(expected);
        expect(unknownPlaceholders(text)).toEqual([]);
      }),
    );
  });

  it('fills in once: a value that itself reads like a placeholder is not filled in again', () => {
    fc.assert(
      fc.property(known, known, values, (a, b, v) => {
        const out = renderTemplate(`{${a}}`, { ...v, [a]: `{${b}}` });
        expect(out).toBe(`{${b}}`);
      }),
    );
  });

  it('refuses an unknown placeholder wherever it is, naming it, on the field', () => {
    fc.assert(
      fc.property(plain, unknownName, plain, values, (before, name, after, v) => {
        const text = `${sep(before)}{${name}}${sep(after)}`;
        expect(unknownPlaceholders(text)).toEqual([name]);
        expect(() => renderTemplate(text, v)).toThrow(`{${name}}`);
        const parsed = MessageTemplateUpdateSchema.safeParse({ subject: 'Hello', body: `x${text}` });
        expect(parsed.success).toBe(false);
        expect(parsed.error!.issues[0]!.path).toEqual(['body']);
        expect(parsed.error!.issues[0]!.message).toContain(`{${name}}`);
      }),
    );
  });
});
