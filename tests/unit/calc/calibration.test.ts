/**
 * Calibration of the preset systems against common practice (docs/references.md, [PRACTICE]):
 * a full repolish of a grand about 190 cm (6 ft 3 in) long is about 30 coats and about 70 hours of work.
 */
import { describe, expect, it } from 'vitest';
import { estimate } from '../../../shared/calc';
import type { TemplateKey } from '../../../shared/schemas/calc';
import { DEMO_CATALOG } from '../../fixtures/catalog';

const run = (template: TemplateKey, system: string, dimensions: Record<string, string> = {}) =>
  estimate({ piece: { template, dimensions }, system, startDate: '2025-03-03' }, DEMO_CATALOG).totals;

const within = (value: number, target: number, pct: number): void => {
  expect(value).toBeGreaterThanOrEqual(target * (1 - pct / 100));
  expect(value).toBeLessThanOrEqual(target * (1 + pct / 100));
};

describe('full repolish of the default grand, 6 ft 3 in (common practice)', () => {
  const grand = run('grand', 'full-repolish', { length: '6 ft 3 in' });

  it('is about 30 coats (±15 %)', () => within(grand.coats, 30, 15));
  it('is about 70 labour hours (±15 %)', () => within(grand.labourHours, 70, 15));

  it('the smallest input of the brief gives the same', () => {
    const smallest = estimate({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish' }, DEMO_CATALOG, { today: '2025-03-03' }).totals;
    expect(smallest).toEqual(grand);
  });

  it('re-body takes far less: under 60 % of the hours and half the coats (common practice)', () => {
    const reBody = run('grand', 're-body', { length: '6 ft 3 in' });
    expect(reBody.labourHours).toBeLessThan(0.6 * grand.labourHours);
    expect(reBody.coats).toBeLessThanOrEqual(grand.coats / 2);
  });

  it('revive takes far less again: under 20 % of the hours (common practice)', () => {
    const revive = run('grand', 'revive', { length: '6 ft 3 in' });
    expect(revive.labourHours).toBeLessThan(0.2 * grand.labourHours);
    expect(revive.coats).toBeLessThan(run('grand', 're-body', { length: '6 ft 3 in' }).coats);
  });

  it('an upright full repolish sits well below the grand: under 75 % of the hours (common practice)', () => {
    const upright = run('upright', 'full-repolish');
    expect(upright.labourHours).toBeLessThan(0.75 * grand.labourHours);
    expect(upright.areaM2).toBeLessThan(grand.areaM2);
  });

  it('a bigger grand takes longer and a baby grand less', () => {
    expect(run('grand', 'full-repolish', { length: '9 ft' }).labourHours).toBeGreaterThan(grand.labourHours);
    expect(run('grand', 'full-repolish', { length: '4 ft 8 in' }).labourHours).toBeLessThan(grand.labourHours);
  });
});
