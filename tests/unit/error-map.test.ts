/**
 * Validation messages in the product's voice: whatever a schema leaves unsaid comes out as a short predicate that
 * reads on after the field's name, never in the validation library's own words.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { fieldLabel, validationSentence } from '../../shared/schemas/error-map';
import { CustomerInputSchema } from '../../shared/schemas/customers';
import { LoginSchema } from '../../shared/schemas/auth';
import { EstimateInputSchema } from '../../shared/schemas/calc';

/** The library's own phrasing, which must never reach a person. */
const RAW = /Invalid input|Too (small|big)|expected|received|Unrecognized|Invalid (string|option|type|element|key)|>=|<=/;

const messages = (schema: z.ZodType, value: unknown) => {
  const r = schema.safeParse(value);
  return r.success ? [] : r.error.issues.map((i) => i.message);
};

describe('the shared validation messages', () => {
  it('word the common cases as we do', () => {
    expect(messages(z.object({ name: z.string() }), {})).toEqual(['is required']);
    expect(messages(z.string().min(1), '')).toEqual(['is required']);
    expect(messages(z.string().min(3), 'ab')).toEqual(['must be at least 3 characters']);
    expect(messages(z.string().max(5), 'abcdefg')).toEqual(['must be at most 5 characters']);
    expect(messages(z.number(), 'twelve')).toEqual(['must be a number']);
    expect(messages(z.number().min(0), -1)).toEqual(['must be at least 0']);
    expect(messages(z.number().positive(), 0)).toEqual(['must be more than 0']);
    expect(messages(z.number().max(40), 41)).toEqual(['must be at most 40']);
    expect(messages(z.array(z.string()).min(1), [])).toEqual(['needs at least 1 item']);
    expect(messages(z.enum(['grand', 'upright']), 'harp')).toEqual(['must be one of grand or upright']);
    expect(messages(z.email(), 'nope')).toEqual(['must be an e-mail address']);
    expect(messages(z.object({ a: z.string() }).strict(), { a: 'x', b: 1 })).toEqual(['has a field we do not use: "b"']);
  });

  it('a schema\u2019s own message still wins', () => {
    expect(messages(z.string().min(1, { message: 'must not be empty' }), '')).toEqual(['must not be empty']);
  });

  it('no input to the product\u2019s schemas, however wrong, gets the library\u2019s raw words', () => {
    const schemas = [CustomerInputSchema, LoginSchema, EstimateInputSchema];
    fc.assert(
      fc.property(fc.constantFrom(...schemas), fc.anything(), (schema, value) => {
        // Field names quoted back from the input are the input's words, not the library's.
        for (const m of messages(schema, value)) expect(m.replace(/"(?:[^"\\]|\\.)*"/g, '""')).not.toMatch(RAW);
      }),
      { numRuns: 2000 },
    );
  });

  it('a server detail is a whole sentence naming the field in words', () => {
    const table: [PropertyKey[], string, string][] = [
      [['lid', 'length'], 'is required', 'The length of the lid is missing.'],
      [['input', 'piece', 'dimensions', 'length'], 'must be a length such as 190 cm', 'The length of the piece must be a length such as 190 cm.'],
      [['stages', 1, 'cutLb'], 'must be more than zero', 'The cut of stage 2 must be more than zero.'],
      [['stages', 1, 'materials', 0, 'material'], 'is required', 'The material of material line 1 of stage 2 is missing.'],
      [['parts'], 'needs at least one part', 'The parts needs at least one part.'],
      [['discountPct'], 'must be at most 40', 'The discount must be at most 40.'],
      [['email'], 'must be an e-mail address', 'The e-mail address must be an e-mail address.'],
      [[], 'must be a set of fields', 'The request must be a set of fields.'],
      [['stages', 2], 'duplicate stage key "grain"', 'Duplicate stage key "grain" (stage 3).'],
      [['date'], 'give the date to book at', 'Give the date to book at (the date).'],
    ];
    for (const [path, message, sentence] of table) expect(validationSentence(path, message)).toBe(sentence);
  });

  it('every sentence starts with a capital, ends with a full stop and never shows a dotted path', () => {
    const key = fc.oneof(fc.constantFrom('stages', 'parts', 'cutLb', 'name', 'piece', 'dimensions', 'length', 'customerId'), fc.nat(30));
    fc.assert(
      fc.property(fc.array(key, { maxLength: 6 }), fc.constantFrom('is required', 'must be a number', 'choose one'), (path, message) => {
        const s = validationSentence(path, message);
        expect(s).toMatch(/^[A-Z].*\.$/);
        expect(s).not.toMatch(/\w\.\w/);
        expect(fieldLabel(path)).not.toMatch(/undefined|NaN/);
      }),
    );
  });
});
