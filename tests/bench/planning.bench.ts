/**
 * Speed of the planning engine on a large board: 500 booked jobs of 40 sessions each over about two and a half years, a
 * drying room of 12 bays and 6 polishers. Prints figures only (median and p90 of 20 timed runs after warm-up).
 *
 * Run: node --import tsx tests/bench/planning.bench.ts
 */
import { toMinutes } from '../../shared/calc/calendar';
import { findEarliestStart, occupancy } from '../../shared/calc/planning';
import type { BookedJob, NewJob, PlanningContext } from '../../shared/calc/planning';

function mulberry32(seed: number): () => number {
  let a = seed;
  return () => {
    a = (a + 0x6d2b79f5) | 0;
    let t = Math.imul(a ^ (a >>> 15), 1 | a);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const random = mulberry32(2026);
const int = (lo: number, hi: number): number => lo + Math.floor(random() * (hi - lo + 1));

const ctx: PlanningContext = {
  calendar: {
    workingWeek: (['mon', 'tue', 'wed', 'thu', 'fri'] as const).map((day) => ({ day, open: '08:00', close: '16:30' })),
    closedDates: ['2026-12-24', '2026-12-25', '2027-01-01', '2027-12-24', '2027-12-27', '2028-12-25', '2029-01-01'],
  },
  room: { mode: 'bays', bays: 12 },
  polishers: Array.from({ length: 6 }, (_, i) => ({ id: `polisher-${i + 1}`, hoursPerDay: i % 3 === 2 ? 6 : 7.5 })),
};

/** A 40-session job: short spiriting and bodying sessions, rests from two hours to a day. */
function randomJob(id: string): NewJob {
  return { id, sessions: Array.from({ length: 40 }, () => ({ handsOnMin: int(20, 90), restMin: int(2, 24) * 60 })), bays: int(1, 10) === 1 ? 2 : 1 };
}

const origin = toMinutes('2026-06-01T00:00');
const spanDays = 900;
const booked: BookedJob[] = [];
const buildStart = performance.now();
for (let i = 0; i < 500; i++) {
  const r = findEarliestStart(randomJob(`job-${i}`), booked, ctx, { notBefore: origin + Math.floor((i / 500) * spanDays) * 1440 });
  if (!r.ok) throw new Error(r.problem.text);
  booked.push(r.plan);
}
const buildMs = performance.now() - buildStart;
const lastEnd = Math.max(...booked.map((j) => j.room.end));

function time(label: string, fn: () => unknown, runs = 20, warmUp = 5): void {
  for (let i = 0; i < warmUp; i++) fn();
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    samples.push(performance.now() - t0);
  }
  samples.sort((a, b) => a - b);
  const at = (q: number): number => samples[Math.min(samples.length - 1, Math.ceil(q * samples.length) - 1)] as number;
  console.log(`${label.padEnd(58)} median ${at(0.5).toFixed(2).padStart(8)} ms   p90 ${at(0.9).toFixed(2).padStart(8)} ms`);
}

const sessions = booked.reduce((t, j) => t + j.sessions.length, 0);
console.log(`board: ${booked.length} jobs, ${sessions} sessions, ${ctx.room.mode === 'bays' ? ctx.room.bays : 0} bays, ${ctx.polishers.length} polishers`);
console.log(`board span: ${new Date(origin * 60_000).toISOString().slice(0, 10)} to ${new Date(lastEnd * 60_000).toISOString().slice(0, 10)} (built in ${buildMs.toFixed(0)} ms)`);

const newJob = randomJob('new-job');
const probe = findEarliestStart(newJob, booked, ctx, { notBefore: origin });
console.log(`new job from the board's first day: ${probe.ok ? `starts ${new Date(probe.plan.room.start * 60_000).toISOString().slice(0, 16)}` : probe.problem.text}, ${probe.whyNotSooner.length} "why not sooner" runs`);

time('findEarliestStart, 40 sessions, from the first day', () => findEarliestStart(newJob, booked, ctx, { notBefore: origin }));
time('findEarliestStart, 40 sessions, from mid-board', () => findEarliestStart(newJob, booked, ctx, { notBefore: origin + 540 * 1440 }));
time('occupancy over 8 weeks', () => occupancy(booked, ctx, '2027-09-06', '2027-10-31'));
