/**
 * Timing of the estimator engine: median and p90 of estimate() for the default grand (the same input object each
 * call, as the editor passes an unchanged input, and a new object each call, as after a keystroke or on the server,
 * where the input is checked again) and for a 200-part piece (called again with the same part objects, as the editor
 * does for parts that did not change, and with every part a new object), and of the coat calendar for a 60-session
 * schedule, the engine's beside their targets. Figures only, no pass/fail.
 * Run: node --import tsx tests/bench/calc.bench.ts
 */
import { estimate } from '../../shared/calc';
import { compileCalendar, scheduleSessions, toMinutes } from '../../shared/calc/calendar';
import type { SessionRequest } from '../../shared/calc/calendar';
import type { EstimateInput, PartInput } from '../../shared/schemas/calc';
import { DEMO_CATALOG } from '../fixtures/catalog';

function measure(label: string, run: () => unknown, warmUp = 200, samples = 1000, targetMs?: number): void {
  for (let i = 0; i < warmUp; i++) run();
  const times: number[] = [];
  for (let i = 0; i < samples; i++) {
    const t = performance.now();
    run();
    times.push(performance.now() - t);
  }
  times.sort((a, b) => a - b);
  const at = (q: number): number => times[Math.min(times.length - 1, Math.floor(q * times.length))] as number;
  const target = targetMs === undefined ? '' : `   target ≤ ${targetMs} ms: ${at(0.5) <= targetMs ? 'met' : 'not met'} (median)`;
  console.log(`${label.padEnd(44)} median ${at(0.5).toFixed(3)} ms   p90 ${at(0.9).toFixed(3)} ms   (${samples} runs)${target}`);
}

/** The default grand, built afresh: every object in it new. */
const freshGrand = (): EstimateInput => ({ piece: { template: 'grand', dimensions: { length: '6 ft 3 in' } }, system: 'full-repolish', startDate: '2025-03-03' });
const grand = freshGrand();

const shapes: PartInput['shape'][] = [
  { kind: 'rectangle', length: '600 mm', width: '18 in' },
  { kind: 'turned-leg', topDiameter: 90, bottomDiameter: 60, length: '70 cm' },
  { kind: 'ellipse', length: 500, width: 300 },
  { kind: 'band', outline: '2.4 m', height: 90 },
];
const parts: PartInput[] = Array.from({ length: 200 }, (_, i) => ({
  name: `Part ${i + 1}`,
  shape: shapes[i % shapes.length] as PartInput['shape'],
  faces: i % 3 === 0 ? 2 : 1,
  edges: i % 5 === 0,
  count: 1 + (i % 4),
  species: ['mahogany', 'maple', 'walnut', 'ebonised'][i % 4],
  complexity: (['flat', 'moulded', 'carved', 'fretwork'] as const)[i % 4],
}));
const big: EstimateInput = { piece: { parts }, system: 'full-repolish', startDate: '2025-03-03' };

const cal = compileCalendar(DEMO_CATALOG.calendar);
const sessions: SessionRequest[] = Array.from({ length: 60 }, (_, i) => ({
  stage: 'body', stageKind: 'body', session: i + 1, handsOnMin: 60 + ((i * 37) % 400), restMin: (12 + (i % 3) * 12) * 60,
}));
const start = toMinutes('2025-03-03T08:00');

console.log(`Node ${process.version}`);
measure('estimate(): default grand, full repolish', () => estimate(grand, DEMO_CATALOG), 200, 1000, 0.15);
// The same grand as a new input object each call (as after a keystroke, or on the server): the input is checked again.
measure('estimate(): default grand, new input object', () => estimate(freshGrand(), DEMO_CATALOG), 200, 1000, 0.15);
measure('estimate(): 200-part piece, full repolish', () => estimate(big, DEMO_CATALOG), 20, 200, 1);
// The same piece with every part a new object (as if every part had changed): nothing about the parts is remembered.
measure('estimate(): 200 parts, all new objects', () => estimate({ ...big, piece: { parts: parts.map((p) => ({ ...p })) } }, DEMO_CATALOG), 20, 200);
measure('calendar: 60 sessions', () => scheduleSessions(sessions, cal, start));
