import { describe, expect, it } from 'vitest';
import { TEMPLATE_DEFAULTS } from '../../shared/calc/templates';
import { estimate } from '../../shared/calc';
import { DEMO_CATALOG } from '../fixtures/catalog';

describe('template defaults against piano sizes', () => {
  it('the default grand is a medium grand, 5 ft 6 in to 6 ft 6 in (Piano Buyer "Piano Parts and Sizes")', () => {
    expect(TEMPLATE_DEFAULTS.grand.length).toBeGreaterThanOrEqual((5 * 12 + 6) * 25.4);
    expect(TEMPLATE_DEFAULTS.grand.length).toBeLessThanOrEqual((6 * 12 + 6) * 25.4);
  });

  it('grand width about 5 ft (Blue Book of Pianos) and rim 30–36 cm (from memory)', () => {
    expect(Math.abs(TEMPLATE_DEFAULTS.grand.width as number - 60 * 25.4) / (60 * 25.4)).toBeLessThan(0.05);
    expect(TEMPLATE_DEFAULTS.grand.rimHeight).toBeGreaterThanOrEqual(300);
    expect(TEMPLATE_DEFAULTS.grand.rimHeight).toBeLessThanOrEqual(360);
  });

  it('upright: width about 5 ft, depth 2–2.5 ft (Blue Book of Pianos)', () => {
    expect(Math.abs(TEMPLATE_DEFAULTS.upright.width as number - 60 * 25.4) / (60 * 25.4)).toBeLessThan(0.05);
    expect(TEMPLATE_DEFAULTS.upright.depth).toBeGreaterThanOrEqual(24 * 25.4);
    expect(TEMPLATE_DEFAULTS.upright.depth).toBeLessThanOrEqual(30 * 25.4);
  });

  it('the default upright is a full upright, over 50 in high (Blue Book of Pianos); a studio is 44–45 in', () => {
    expect(TEMPLATE_DEFAULTS.upright.height).toBeGreaterThan(50 * 25.4);
    expect(TEMPLATE_DEFAULTS.upright.height).toBeLessThan(60 * 25.4);
  });
});

describe('a lighter "good polish" schedule: about 20–30 h for an upright, 30–60 h for a grand (a piano restorer\'s published service page, New Zealand; range check)', () => {
  const hours = (template: 'grand' | 'upright'): number =>
    estimate({ piece: { template, ...(template === 'grand' ? { dimensions: { length: '6 ft 3 in' } } : {}) }, system: 're-body', startDate: '2025-03-03' }, DEMO_CATALOG).totals.labourHours;

  it('re-body of the default grand falls in 30–60 h', () => {
    const h = hours('grand');
    expect(h).toBeGreaterThanOrEqual(30);
    expect(h).toBeLessThanOrEqual(60);
  });

  it('re-body of the default upright falls in 20–30 h', () => {
    const h = hours('upright');
    expect(h).toBeGreaterThanOrEqual(20);
    expect(h).toBeLessThanOrEqual(30);
  });
});
