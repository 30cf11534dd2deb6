/** Why a job could not start sooner, and what a booking overbooks: both in words, day by day. */
import { AlertTriangle, CalendarX2, Clock, DoorClosed, Users } from 'lucide-react';
import type { WhyNot } from '@shared/calc/planning/types';
import type { OverbookingDto } from '@shared/schemas/planning';
import { dateTime, dayLabel, daysBetween, hoursText } from '../lib/time';

const WHY_ICON = { 'closed-date': DoorClosed, 'non-working-day': CalendarX2, 'polishers-busy': Users, 'too-late-in-day': Clock, 'room-full': AlertTriangle } as const;

/** The engine writes times as "2027-01-25 15:15": here they read as the rest of the page does. */
function readable(text: string): string {
  return text.replace(/(\d{4}-\d{2}-\d{2}) (\d{2}:\d{2})/g, (_m, d: string, t: string) => dateTime(`${d}T${t}`));
}

function range(from: string, to: string): string {
  return from === to ? dayLabel(from) : `${dayLabel(from)} to ${dayLabel(to)}`;
}

const STRUCTURAL: readonly WhyNot['code'][] = ['closed-date', 'non-working-day'];
const body = (r: WhyNot) => r.text.replace(/^[^:]*: /, '');

interface Reason {
  from: string;
  to: string;
  code: WhyNot['code'];
  text: string;
  /** Weekends or closed days fell inside the run. */
  spansClosed: boolean;
}

/**
 * The engine gives one line per run of days with the same reason, so a full room over three weeks reads as three
 * lines broken by weekends. Runs with the same reason, only weekends or closed days between them, become one line.
 */
function compact(reasons: readonly WhyNot[]): Reason[] {
  const out: Reason[] = [];
  let i = 0;
  while (i < reasons.length) {
    const r = reasons[i]!;
    if (STRUCTURAL.includes(r.code)) {
      out.push({ from: r.from, to: r.to, code: r.code, text: body(r), spansClosed: false });
      i++;
      continue;
    }
    let last = i;
    for (let j = i + 1; j < reasons.length; j++) {
      const next = reasons[j]!;
      if (STRUCTURAL.includes(next.code)) continue;
      if (body(next) !== body(r)) break;
      last = j;
    }
    out.push({ from: r.from, to: reasons[last]!.to, code: r.code, text: body(r), spansClosed: last > i });
    i = last + 1;
  }
  return out;
}

/** The engine's reasons, with the dates written out and the reason's own words kept. */
export function WhyNotSooner({ reasons, empty }: { reasons: readonly WhyNot[]; empty?: string }) {
  if (reasons.length === 0) return <p className="text-sm text-walnut-600">{empty ?? 'Nothing stood in the way: it starts at the first opening.'}</p>;
  return (
    <ul className="space-y-1.5 text-sm" aria-label="Why it could not start sooner">
      {compact(reasons).map((r) => {
        const Icon = WHY_ICON[r.code];
        return (
          <li key={`${r.from}-${r.code}`} className="flex gap-2">
            <Icon className="mt-0.5 h-4 w-4 shrink-0 text-walnut-500" aria-hidden />
            <span>
              <span className="font-medium text-walnut-900">{range(r.from, r.to)}:</span> <span className="text-walnut-700">{readable(r.text)}</span>
              {r.spansClosed && <span className="text-walnut-500"> (weekends and closed days in between)</span>}
            </span>
          </li>
        );
      })}
    </ul>
  );
}

/** Consecutive days with the same overbooking, merged into one line. */
function runsOf(lines: readonly { date: string; text: string }[]): { from: string; to: string; days: number; text: string }[] {
  const byText = new Map<string, string[]>();
  for (const l of lines) byText.set(l.text, [...(byText.get(l.text) ?? []), l.date]);
  const out: { from: string; to: string; days: number; text: string }[] = [];
  for (const [text, dates] of byText) {
    const sorted = [...new Set(dates)].sort();
    let from = sorted[0]!;
    let prev = from;
    let days = 1;
    for (const d of sorted.slice(1)) {
      if (daysBetween(prev, d) === 1) {
        prev = d;
        days++;
        continue;
      }
      out.push({ from, to: prev, days, text });
      from = d;
      prev = d;
      days = 1;
    }
    out.push({ from, to: prev, days, text });
  }
  return out.sort((a, b) => a.from.localeCompare(b.from) || a.text.localeCompare(b.text));
}

export function OverbookingList({ overbooking, unit }: { overbooking: OverbookingDto; unit: string }) {
  const lines = [
    ...overbooking.room.map((r) => ({ date: r.date, text: `drying room ${round(r.peak)} of ${round(r.capacity)} ${unit}, ${round(r.over)} ${unit} over` })),
    ...overbooking.polishers.map((p) => ({
      date: p.date,
      text: `${p.polisherName}: ${[p.overMin > 0 ? `${hoursText(p.usedMin / 60)} of ${hoursText(p.availableMin / 60)}, ${hoursText(p.overMin / 60)} over` : '', p.clashMin > 0 ? `two sessions at once for ${hoursText(p.clashMin / 60)}` : ''].filter(Boolean).join('; ')}`,
    })),
  ];
  if (lines.length === 0) return null;
  return (
    <ul className="space-y-1 text-sm" aria-label="Overbooked days">
      {runsOf(lines).map((l) => (
        <li key={`${l.from}-${l.text}`} className="flex gap-2 text-brick-700">
          <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden />
          <span>
            <span className="font-semibold">{l.days === 1 ? dayLabel(l.from) : `${dayLabel(l.from)} to ${dayLabel(l.to)} (${l.days} days)`}</span> — over: {l.text}
          </span>
        </li>
      ))}
    </ul>
  );
}

function round(n: number): number {
  return Math.round(n * 100) / 100;
}
