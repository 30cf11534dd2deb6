import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { HttpProblem, plainDetail } from '../../../server/http/problem';

describe('hand-written problem details read as sentences', () => {
  it('turns "field: what is wrong" into the product sentence', () => {
    expect(plainDetail('start: must be today or later')).toBe('The start must be today or later.');
    expect(plainDetail('photos: choose at least one image')).toBe('Choose at least one image (the photos).');
    expect(new HttpProblem(400, 'x', 'Bad request', 'validUntil: must be today or later').detail).toBe('The valid until must be today or later.');
  });

  it('leaves header names and sentences alone', () => {
    expect(plainDetail('Content-Encoding: use gzip, deflate or br, or none.')).toBe('Content-Encoding: use gzip, deflate or br, or none.');
    expect(plainDetail('The quote was already accepted.')).toBe('The quote was already accepted.');
  });

  it('never leaves a detail starting with a lower-case field name and a colon', () => {
    fc.assert(
      fc.property(fc.stringMatching(/^[a-z][A-Za-z]{0,12}$/), fc.stringMatching(/^[a-z][a-z ]{0,30}[a-z]$/), (field, what) => {
        const out = plainDetail(`${field}: ${what}`);
        expect(out).not.toMatch(/^[a-z][A-Za-z0-9.]*: /);
        expect(out).toMatch(/\.$/);
        expect(out.charAt(0)).toBe(out.charAt(0).toUpperCase());
      }),
    );
  });
});
