/**
 * The board as a timeline: one column per day, rows for the drying room's bays and for the polishers. A job is a
 * bar across the bays it takes for its whole time in the room: solid blocks are its hands-on sessions, the striped
 * stretches between them its rests. Closed days are hatched, today is a line, and an overbooked day carries a
 * triangle and the word "over" (never colour alone).
 */
import { AlertTriangle, Check } from 'lucide-react';
import type { CSSProperties, ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { BoardJob, PlanningBoard } from '@shared/schemas/planning';
import { paths } from '@/config/paths';
import { assignLanes } from '../lib/lanes';
import { clock, dateTime, dayLabel, hoursText, MIN_PER_DAY, toMinutes, weekday } from '../lib/time';

const LABEL = 'w-44 shrink-0';
const HATCH: CSSProperties = { backgroundImage: 'repeating-linear-gradient(135deg, rgba(127,83,57,0.13) 0 2px, transparent 2px 7px)' };
const OVER_HATCH: CSSProperties = { backgroundImage: 'repeating-linear-gradient(45deg, rgba(162,59,36,0.22) 0 3px, transparent 3px 7px)' };
const REST: CSSProperties = { backgroundImage: 'repeating-linear-gradient(135deg, #f2d28b 0 4px, #fdf7ea 4px 8px)' };

/** Tones for telling jobs apart on the polishers' rows; each block also carries the job's number. */
const TONES = ['#513323', '#9d5b19', '#7f5339', '#bf7720', '#3a2418', '#85301d', '#66412c', '#7d4418'];
/** Done work: moss, striped, so it differs from planned work by shape as well as colour. */
const DONE: CSSProperties = { backgroundColor: '#4f6b3a', backgroundImage: 'repeating-linear-gradient(90deg, rgba(255,255,255,0.35) 0 1px, transparent 1px 4px)' };

export function jobPath(id: number): string {
  return paths.planningJob.replace(':jobId', String(id));
}

function shortNumber(number: string): string {
  return number.replace(/^JOB-\d{4}-0*/, '#');
}

interface Scale {
  start: number;
  span: number;
}

function pct(scale: Scale, local: string): number {
  return Math.min(100, Math.max(0, ((toMinutes(local) - scale.start) / scale.span) * 100));
}

function place(scale: Scale, a: string, b: string): CSSProperties {
  const l = pct(scale, a);
  return { left: `${l}%`, width: `${Math.max(0.2, pct(scale, b) - l)}%` };
}

function Row({ label, sub, children, tone = 'plain', testId }: { label: ReactNode; sub?: ReactNode; children: ReactNode; tone?: 'plain' | 'over'; testId?: string }) {
  return (
    <div className="flex border-b border-parchment-200 last:border-b-0" data-testid={testId}>
      <div className={`${LABEL} sticky left-0 z-20 flex flex-col justify-center border-r border-parchment-200 bg-white px-3 py-1`}>
        <span className={`text-sm font-medium ${tone === 'over' ? 'text-brick-700' : 'text-walnut-800'}`}>{label}</span>
        {sub && <span className="text-xs text-walnut-500">{sub}</span>}
      </div>
      <div className="relative min-h-11 flex-1" style={tone === 'over' ? OVER_HATCH : undefined}>
        {children}
      </div>
    </div>
  );
}

/** A job's bar in one of its bay rows; the rows after its first repeat it for the eye only. */
function JobBar({ job, scale, tone, bay }: { job: BoardJob; scale: Scale; tone: string; bay: { n: number; of: number } }) {
  const from = Math.max(toMinutes(job.roomStart!), scale.start);
  const to = Math.min(toMinutes(job.roomEnd!), scale.start + scale.span);
  const span = Math.max(1, to - from);
  const rel = (local: string) => Math.min(100, Math.max(0, ((toMinutes(local) - from) / span) * 100));
  const done = job.state === 'finished';
  return (
    <Link
      to={jobPath(job.id)}
      className={`absolute inset-y-1 z-10 flex flex-col overflow-hidden rounded-md border-2 bg-white shadow-sm transition-shadow hover:shadow-md focus-visible:z-30 ${job.forced ? 'border-dashed border-brick-600' : 'border-walnut-300'}`}
      style={place(scale, job.roomStart!, job.roomEnd!)}
      title={`${job.number} ${job.title} (${job.customer.name}): in the drying room ${dateTime(job.roomStart)} to ${dateTime(job.roomEnd)}; ${job.sessionsDone} of ${job.sessionsTotal} sessions done${job.forced ? '; booked over capacity' : ''}`}
      data-testid={bay.n === 0 ? `job-bar-${job.id}` : `job-bar-${job.id}-bay-${bay.n + 1}`}
      {...(bay.n > 0 ? { 'aria-hidden': true, tabIndex: -1 } : {})}
    >
      <span className="flex h-4 items-center gap-1 truncate bg-parchment-100 px-1.5 text-[11px] font-semibold leading-4 text-walnut-900">
        {job.forced && <AlertTriangle className="h-3 w-3 shrink-0 text-brick-700" aria-label="forced" />}
        {done && <Check className="h-3 w-3 shrink-0 text-moss-700" aria-label="finished" />}
        <span className="truncate">
          {shortNumber(job.number)} · {job.title}
          {bay.of > 1 && ` (bay ${bay.n + 1} of ${bay.of})`}
        </span>
      </span>
      <span className="relative flex-1" style={REST}>
        {job.sessions.flatMap((s) =>
          s.segments
            .filter((g) => toMinutes(g.end) > from && toMinutes(g.start) < to)
            .map((g, i) => (
              <span
                key={`${s.id}-${i}`}
                className="absolute inset-y-0.5 rounded-sm"
                style={{ left: `${rel(g.start)}%`, width: `${Math.max(1.5, rel(g.end) - rel(g.start))}%`, ...(s.done ? DONE : { background: tone }) }}
              />
            )),
        )}
      </span>
    </Link>
  );
}

export function Timeline({ board }: { board: PlanningBoard }) {
  const scale: Scale = { start: toMinutes(board.from), span: board.days.length * MIN_PER_DAY };
  const bays = board.room.mode === 'bays';
  const { placed, count } = assignLanes(board.jobs.map((j) => ({ ...j, start: j.roomStart!, end: j.roomEnd!, rows: bays ? Math.max(1, j.bays) : 1 })));
  const rows = Math.max(count, bays ? board.room.capacity : 1);
  const tone = new Map(board.jobs.map((j, i) => [j.id, TONES[i % TONES.length]!]));
  const weeks = board.days.filter((d, i) => i === 0 || weekday(d.date) === 0);
  const nowPct = pct(scale, board.now);
  const showNow = toMinutes(board.now) >= scale.start && toMinutes(board.now) < scale.start + scale.span;
  const dayOffs = (daysOff: readonly string[]) => board.days.filter((d) => daysOff.includes(d.date));

  return (
    <figure aria-label={`Planning board from ${dayLabel(board.from)} to ${dayLabel(board.to)}`} className="overflow-x-auto">
      <div className="relative pb-4" style={{ minWidth: `calc(11rem + ${board.days.length * 17}px)` }}>
        {/* Day columns behind every row: closed days hatched, Mondays ruled, overbooked days edged. */}
        <div className="pointer-events-none absolute inset-y-0 right-0 left-44 z-0 flex" aria-hidden>
          {board.days.map((d) => (
            <div
              key={d.date}
              className={`h-full flex-1 ${weekday(d.date) === 0 ? 'border-l border-walnut-200' : 'border-l border-parchment-100'} ${d.date === board.today ? 'bg-amber-50' : ''}`}
              style={d.open ? undefined : HATCH}
            />
          ))}
        </div>
        {showNow && (
          <div className="pointer-events-none absolute inset-y-0 right-0 left-44 z-30" aria-hidden>
            <div className="absolute inset-y-0 w-0.5 bg-amber-500" style={{ left: `${nowPct}%` }} />
          </div>
        )}

        <div className="relative z-10">
          {/* Weeks */}
          <div className="flex border-b border-parchment-200 bg-parchment-50/90">
            <div className={`${LABEL} sticky left-0 z-20 border-r border-parchment-200 bg-parchment-50 px-3 py-1.5 text-xs font-semibold tracking-wide text-walnut-600 uppercase`}>Week of</div>
            <div className="relative h-7 flex-1">
              {weeks.map((d) => (
                <span key={d.date} className="absolute top-1.5 truncate pl-1 text-xs font-semibold text-walnut-700" style={{ left: `${pct(scale, d.date)}%`, width: `${(7 / board.days.length) * 100}%` }}>
                  {dayLabel(d.date).replace(/^\w+ /, '')}
                </span>
              ))}
            </div>
          </div>
          {/* Days */}
          <div className="flex border-b border-parchment-200 bg-parchment-50/90">
            <div className={`${LABEL} sticky left-0 z-20 border-r border-parchment-200 bg-parchment-50 px-3 py-1 text-xs text-walnut-600`}>Day</div>
            <div className="flex flex-1">
              {board.days.map((d) => (
                <div key={d.date} className={`flex-1 py-0.5 text-center text-[10px] leading-3 ${d.date === board.today ? 'font-bold text-amber-800' : d.open ? 'text-walnut-700' : 'text-walnut-400'}`} title={`${dayLabel(d.date)}${d.open ? '' : ' (closed)'}`}>
                  <span className="block">{'MTWTFSS'[weekday(d.date)]}</span>
                  <span className="num block">{Number(d.date.slice(8, 10))}</span>
                </div>
              ))}
            </div>
          </div>
          {/* Room use per day, with overbooked days flagged in words and a shape */}
          <div className="flex border-b border-walnut-200 bg-white" data-testid="room-load">
            <div className={`${LABEL} sticky left-0 z-20 border-r border-parchment-200 bg-white px-3 py-1`}>
              <span className="block text-sm font-medium text-walnut-800">Room in use</span>
              <span className="block text-xs text-walnut-500">peak of {board.room.capacity} {board.room.unit}</span>
            </div>
            <div className="flex h-11 flex-1 items-end">
              {board.days.map((d) => {
                const polisherOver = d.polishers.filter((p) => p.over);
                const fill = Math.min(1, d.room.capacity > 0 ? d.room.peak / d.room.capacity : 0);
                const title = `${dayLabel(d.date)}: drying room ${Math.round(d.room.peak * 100) / 100} of ${d.room.capacity} ${d.room.unit}${d.room.over ? ' (over capacity)' : ''}${polisherOver.length ? `; ${polisherOver.length} polisher${polisherOver.length > 1 ? 's' : ''} over their hours` : ''}`;
                return (
                  <div key={d.date} className="relative flex h-full flex-1 flex-col items-center justify-end px-px" title={title} data-overbooked={d.overbooked || undefined}>
                    {d.overbooked ? (
                      <span className="absolute top-0 flex flex-col items-center text-brick-700">
                        <AlertTriangle className="h-3 w-3" aria-hidden />
                        <span className="text-[8px] font-bold leading-none uppercase">over</span>
                      </span>
                    ) : null}
                    {!d.overbooked && d.room.peak > 0 && <span className="num text-[9px] leading-3 text-walnut-600">{Math.round(d.room.peak * 10) / 10}</span>}
                    <span className={`w-full rounded-t-sm ${d.room.over ? 'bg-brick-600' : 'bg-amber-300'}`} style={{ height: `${Math.max(d.room.peak > 0 ? 8 : 0, fill * 45)}%` }} />
                  </div>
                );
              })}
            </div>
          </div>

          <SectionHead>Drying room · {board.room.capacity} {board.room.unit}</SectionHead>
          {Array.from({ length: rows }, (_, lane) => {
            const over = bays && lane >= board.room.capacity;
            const label = over ? (
              <span className="inline-flex items-center gap-1">
                <AlertTriangle className="h-3.5 w-3.5" aria-hidden /> Over capacity
              </span>
            ) : bays ? (
              `Bay ${lane + 1}`
            ) : (
              `Rack row ${lane + 1}`
            );
            return (
              <Row key={lane} label={label} tone={over ? 'over' : 'plain'} testId={`bay-row-${lane + 1}`}>
                {placed
                  .filter((p) => p.lanes.includes(lane))
                  .map((p) => (
                    <JobBar key={p.item.id} job={p.item} scale={scale} tone={tone.get(p.item.id)!} bay={{ n: p.lanes.indexOf(lane), of: p.lanes.length }} />
                  ))}
              </Row>
            );
          })}

          <SectionHead>Polishers</SectionHead>
          {board.polishers.length === 0 && (
            <Row label="No polisher">
              <span className="absolute inset-0 flex items-center px-3 text-sm text-walnut-500">Add a polisher below to book jobs.</span>
            </Row>
          )}
          {board.polishers.map((p) => (
            <Row key={p.id} label={p.name} sub={`${hoursText(p.hoursPerDay)} a day`} testId={`polisher-row-${p.id}`}>
              {dayOffs(p.daysOff).map((d) => (
                <span key={d.date} className="absolute inset-y-0 flex items-center justify-center text-[9px] font-semibold text-walnut-500 uppercase" style={{ ...place(scale, d.date, `${d.date}T23:59`), ...HATCH }} title={`${p.name} away on ${dayLabel(d.date)}`}>
                  off
                </span>
              ))}
              {board.days.map((d) => {
                const load = d.polishers.find((x) => x.polisherId === String(p.id));
                return load?.over ? (
                  <span key={d.date} className="absolute top-0 z-20 flex items-center text-brick-700" style={{ left: `${pct(scale, d.date)}%` }} title={`${p.name} on ${dayLabel(d.date)}: ${hoursText(load.usedMin / 60)} of ${hoursText(load.availableMin / 60)} (over)`}>
                    <AlertTriangle className="h-3 w-3" aria-label="over their hours" />
                  </span>
                ) : null;
              })}
              {board.jobs.flatMap((j) =>
                j.sessions
                  .filter((s) => s.polisherId === p.id)
                  .flatMap((s) =>
                    s.segments
                      .filter((g) => toMinutes(g.end) > scale.start && toMinutes(g.start) < scale.start + scale.span)
                      .map((g, i) => (
                        <Link
                          key={`${s.id}-${i}`}
                          to={jobPath(j.id)}
                          className="absolute inset-y-2 z-10 flex items-center justify-center overflow-hidden rounded-sm text-[9px] font-semibold text-parchment-50"
                          style={{ ...place(scale, g.start, g.end), ...(s.done ? DONE : { background: tone.get(j.id) }) }}
                          title={`${j.number} ${j.title}: ${s.label}, ${dateTime(g.start)} to ${clock(g.end)}${s.done ? ' (done)' : ''}`}
                        >
                          {s.done ? <Check className="h-2.5 w-2.5" aria-label="done" /> : <span className="truncate px-px">{shortNumber(j.number)}</span>}
                        </Link>
                      )),
                  ),
              )}
            </Row>
          ))}
        </div>
        {showNow && (
          <span className="pointer-events-none absolute bottom-0 z-40 -translate-x-1/2 rounded-t bg-amber-500 px-1.5 text-[10px] font-bold text-walnut-950 uppercase" style={{ left: `calc(11rem + (100% - 11rem) * ${nowPct / 100})` }}>
            Now
          </span>
        )}
      </div>
    </figure>
  );
}

function SectionHead({ children }: { children: ReactNode }) {
  return (
    <div className="flex border-b border-parchment-200 bg-parchment-100/95">
      <div className="sticky left-0 px-3 py-1 text-xs font-semibold tracking-wide text-walnut-700 uppercase">{children}</div>
    </div>
  );
}

/** The key to the board's marks, in words. */
export function TimelineLegend() {
  const item = (mark: ReactNode, text: string) => (
    <li className="inline-flex items-center gap-1.5">
      {mark}
      {text}
    </li>
  );
  return (
    <ul className="flex flex-wrap items-center gap-x-5 gap-y-1.5 text-xs text-walnut-700" aria-label="Key to the board">
      {item(<span className="h-3 w-5 rounded-sm bg-walnut-700" />, 'hands-on session')}
      {item(<span className="h-3 w-5 rounded-sm" style={DONE} />, 'session done')}
      {item(<span className="h-3 w-5 rounded-sm border border-amber-300" style={REST} />, 'resting in the drying room')}
      {item(<span className="h-3 w-5 rounded-sm border-2 border-dashed border-brick-600" />, 'booked over capacity')}
      {item(<span className="h-3 w-5 rounded-sm border border-parchment-200" style={HATCH} />, 'closed day or day off')}
      {item(<AlertTriangle className="h-3.5 w-3.5 text-brick-700" />, 'overbooked day')}
      {item(<span className="h-3 w-0.5 bg-amber-500" />, 'now')}
    </ul>
  );
}
