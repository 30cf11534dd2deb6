/**
 * The planning board: the drying room and the polishers over the weeks ahead, the sessions due today and
 * tomorrow, booking a job, the jobs on the board and the polishers.
 */
import { CUSTODY_LABELS } from '@shared/schemas/job-end';
import { formatDate } from '@/lib/format';
import { AlertTriangle, CalendarDays, ChevronLeft, ChevronRight, CircleCheck, Droplets, Thermometer, Warehouse } from 'lucide-react';
import { useState, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { DueSession, PlanningBoard } from '@shared/schemas/planning';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { useMe } from '@/lib/me';
import { useBoard, useReadyToBook } from '../api/board';
import { BookingForm } from '../components/booking-form';
import { JobStateBadge } from '../components/job-state-badge';
import { MarkDoneDialog, type SessionToMark } from '../components/mark-done-dialog';
import { PolishersCard } from '../components/polishers-card';
import { jobPath, Timeline, TimelineLegend } from '../components/timeline';
import { addDays, clock, dateTime, dayLabel, hoursText, mondayOf } from '../lib/time';


function Fact({ icon, label, children, tone = 'plain' }: { icon: ReactNode; label: string; children: ReactNode; tone?: 'plain' | 'over' | 'good' }) {
  const box = tone === 'over' ? 'border-brick-600/40 bg-brick-100/60 text-brick-700' : tone === 'good' ? 'border-moss-600/30 bg-moss-100/60 text-moss-700' : 'border-parchment-200 bg-white text-walnut-800';
  return (
    <div className={`flex items-center gap-3 rounded-xl border px-4 py-3 shadow-card ${box}`}>
      <span className="shrink-0 opacity-80">{icon}</span>
      <div>
        <p className="text-xs font-semibold tracking-wide uppercase">{label}</p>
        <p className="num text-lg font-semibold">{children}</p>
      </div>
    </div>
  );
}

function OverbookedDays({ board }: { board: PlanningBoard }) {
  const names = new Map(board.polishers.map((p) => [String(p.id), p.name]));
  const days = board.days.filter((d) => d.overbooked);
  if (days.length === 0) return null;
  return (
    <div className="mt-4 rounded-lg border border-brick-600/40 bg-brick-100/50 px-4 py-3">
      <p className="mb-1 flex items-center gap-2 text-sm font-semibold text-brick-700">
        <AlertTriangle className="h-4 w-4" aria-hidden /> Overbooked: {days.length} day{days.length === 1 ? '' : 's'} in these weeks
      </p>
      <ul className="grid gap-x-6 gap-y-0.5 text-sm text-brick-700 sm:grid-cols-2" aria-label="Overbooked days in these weeks">
        {days.map((d) => (
          <li key={d.date}>
            <span className="font-semibold">{dayLabel(d.date)}</span> —{' '}
            {[
              d.room.over ? `drying room ${Math.round(d.room.peak * 100) / 100} of ${d.room.capacity} ${d.room.unit}` : '',
              ...d.polishers.filter((p) => p.over).map((p) => `${names.get(p.polisherId) ?? 'a polisher'} ${hoursText(p.usedMin / 60)} of ${hoursText(p.availableMin / 60)}`),
            ]
              .filter(Boolean)
              .join('; ')}
          </li>
        ))}
      </ul>
    </div>
  );
}

function DueList({ board, canMark, onMark }: { board: PlanningBoard; canMark: boolean; onMark: (s: DueSession) => void }) {
  const groups = (['today', 'tomorrow'] as const).map((day) => ({ day, rows: board.due.filter((d) => d.day === day) }));
  return (
    <div className="space-y-4">
      {groups.map(({ day, rows }) => (
        <div key={day}>
          <h3 className="mb-1.5 text-sm font-semibold text-walnut-700">
            {day === 'today' ? 'Today' : 'Tomorrow'}, {dayLabel(day === 'today' ? board.today : addDays(board.today, 1))}
          </h3>
          {rows.length === 0 ? (
            <p className="text-sm text-walnut-500">No session starts {day}.</p>
          ) : (
            <ul className="divide-y divide-parchment-200 rounded-lg border border-parchment-200" aria-label={`Sessions due ${day}`}>
              {rows.map((s) => (
                <li key={s.sessionId} className="flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2">
                  <span className="num w-24 shrink-0 text-sm font-semibold text-walnut-800">
                    {clock(s.start)}–{clock(s.end)}
                  </span>
                  <div className="min-w-0 flex-1">
                    <p className="truncate text-sm font-medium text-walnut-900">
                      <Link to={jobPath(s.jobId)} className="hover:underline">
                        {s.jobNumber}
                      </Link>{' '}
                      · {s.label}
                    </p>
                    <p className="truncate text-xs text-walnut-600">
                      {s.title} · {hoursText(s.handsOnHours)} hands-on · {s.polisher?.name ?? 'no polisher'}
                    </p>
                  </div>
                  {canMark &&
                    (s.next ? (
                      <Button size="sm" variant="secondary" className="min-h-11 w-full sm:min-h-0 sm:w-auto" onClick={() => onMark(s)} aria-label={`Mark ${s.jobNumber} ${s.label} done`}>
                        <CircleCheck className="h-3.5 w-3.5" aria-hidden /> Mark done
                      </Button>
                    ) : (
                      <span className="text-xs text-walnut-500">after the session before</span>
                    ))}
                </li>
              ))}
            </ul>
          )}
        </div>
      ))}
    </div>
  );
}

export function PlanningBoardPage() {
  const me = useMe();
  const role = me.data?.role;
  const [from, setFrom] = useState<string | undefined>(undefined);
  const [weeks, setWeeks] = useState(8);
  const board = useBoard(from, weeks);
  const canPlan = can(role, 'planRoom');
  const ready = useReadyToBook();
  const [marking, setMarking] = useState<SessionToMark | null>(null);

  if (board.isPending) return <Spinner label="Laying out the board…" />;
  if (board.isError) return <Alert tone="error" title="The board could not be loaded">{board.error.message}</Alert>;
  const b = board.data;
  const overbooked = b.days.filter((d) => d.overbooked).length;
  const thisWeek = mondayOf(b.today);
  const dueToday = b.due.filter((d) => d.day === 'today').length;

  return (
    <div className="space-y-6">
      <PageHeader
        title="Planning"
        description={`The drying room and the polishers from ${dayLabel(b.from)} to ${dayLabel(b.to)}: which piece rests in which bay, who rubs which session, and where the weeks are too full.`}
        actions={
          <div className="flex items-center gap-1.5">
            <Button size="sm" variant="secondary" onClick={() => setFrom(addDays(b.from, -7))} aria-label="A week earlier">
              <ChevronLeft className="h-4 w-4" aria-hidden />
            </Button>
            <Button size="sm" variant="secondary" onClick={() => setFrom(undefined)} disabled={b.from === thisWeek}>
              This week
            </Button>
            <Button size="sm" variant="secondary" onClick={() => setFrom(addDays(b.from, 7))} aria-label="A week later">
              <ChevronRight className="h-4 w-4" aria-hidden />
            </Button>
            <label className="ml-2 flex items-center gap-2 text-sm text-walnut-700">
              Show
              <select className="rounded-md border border-walnut-200 bg-white px-2 py-1 text-sm" value={weeks} onChange={(e) => setWeeks(Number(e.target.value))} aria-label="Weeks shown">
                {[4, 8, 12, 16].map((w) => (
                  <option key={w} value={w}>
                    {w} weeks
                  </option>
                ))}
              </select>
            </label>
          </div>
        }
      />

      <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
        <Fact icon={<Warehouse className="h-6 w-6" />} label="Drying room">
          {b.room.capacity} {b.room.unit}
        </Fact>
        <Fact icon={<Thermometer className="h-6 w-6" />} label="Room set to">
          {b.room.temperatureC} °C · <Droplets className="inline h-4 w-4" aria-hidden /> {b.room.humidityPct} % RH
        </Fact>
        <Fact icon={<CalendarDays className="h-6 w-6" />} label="Jobs in these weeks">
          {b.jobs.length} · {dueToday} session{dueToday === 1 ? '' : 's'} today
        </Fact>
        <Fact icon={overbooked ? <AlertTriangle className="h-6 w-6" /> : <CircleCheck className="h-6 w-6" />} label="Overbooked days" tone={overbooked ? 'over' : 'good'}>
          {overbooked ? `${overbooked} over` : 'None'}
        </Fact>
      </div>

      <Card title={`The next ${weeks} weeks`} actions={<TimelineLegend />}>
        <div className={board.isPlaceholderData ? 'opacity-60' : ''}>
          <Timeline board={b} />
        </div>
        <OverbookedDays board={b} />
      </Card>

      <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
        <Card title="Due today and tomorrow">
          <DueList
            board={b}
            canMark={can(role, 'recordProgress')}
            onMark={(s) => setMarking({ jobId: s.jobId, jobNumber: s.jobNumber, sessionId: s.sessionId, label: s.label, end: s.end, handsOnHours: s.handsOnHours })}
          />
        </Card>
        <Card title={canPlan ? 'Book a job' : 'Waiting to be booked'}>
          {ready.isPending ? (
            <Spinner />
          ) : ready.isError ? (
            <Alert tone="error">{ready.error.message}</Alert>
          ) : canPlan ? (
            <BookingForm ready={ready.data} today={b.today} unit={b.room.unit} />
          ) : (
            <ul className="space-y-1 text-sm text-walnut-700">
              {ready.data.jobs.map((j) => (
                <li key={`j${j.id}`}>
                  {j.number} · {j.title} ({j.customer.name})
                </li>
              ))}
              {ready.data.quotes.map((q) => (
                <li key={`q${q.quoteId}`}>
                  Quote {q.quoteNumber} · {q.title} ({q.customer.name}), accepted
                </li>
              ))}
              {ready.data.jobs.length + ready.data.quotes.length === 0 && <li>Nothing is waiting.</li>}
            </ul>
          )}
        </Card>
      </div>

      <Card title="Jobs in these weeks">
        {b.jobs.length === 0 ? (
          <p className="text-sm text-walnut-500">No job is in the drying room in these weeks.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="min-w-full text-sm">
              <caption className="sr-only">Jobs in these weeks</caption>
              <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
                <tr>
                  <th scope="col" className="px-3 py-2">Job</th>
                  <th scope="col" className="px-3 py-2">Piece and customer</th>
                  <th scope="col" className="px-3 py-2">State</th>
                  <th scope="col" className="px-3 py-2">In the drying room</th>
                  <th scope="col" className="px-3 py-2 text-right">Sessions done</th>
                  <th scope="col" className="px-3 py-2 text-right">Hours (est. / actual)</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-parchment-200">
                {b.jobs.map((j) => (
                  <tr key={j.id} className="hover:bg-parchment-50">
                    <td className="px-3 py-2 font-semibold whitespace-nowrap">
                      <Link to={jobPath(j.id)} className="text-walnut-800 hover:underline">
                        {j.number}
                      </Link>
                      {j.forced && (
                        <span className="ml-2 inline-flex items-center gap-1 text-xs font-medium text-brick-700">
                          <AlertTriangle className="h-3 w-3" aria-hidden /> forced
                        </span>
                      )}
                    </td>
                    <td className="px-3 py-2">
                      {j.title}
                      <span className="block text-xs text-walnut-500">{j.customer.name}</span>
                      <span className="block text-xs text-walnut-500" data-testid="board-logistics">
                        {CUSTODY_LABELS[j.custody]} · collection {j.collectionDate ? formatDate(j.collectionDate) : 'to arrange'} · return {j.returnDate ? formatDate(j.returnDate) : 'to arrange'}
                        {j.keptPolisherId ? ' · a polisher is kept on it' : ''}
                      </span>
                    </td>
                    <td className="px-3 py-2">
                      <JobStateBadge state={j.state} />
                    </td>
                    <td className="num px-3 py-2 whitespace-nowrap">
                      {dateTime(j.roomStart)} → {dateTime(j.roomEnd)}
                    </td>
                    <td className="num px-3 py-2 text-right">
                      {j.sessionsDone} of {j.sessionsTotal}
                    </td>
                    <td className="num px-3 py-2 text-right">
                      {hoursText(j.estimatedHours)} / {j.sessionsDone ? hoursText(j.actualHours) : '—'}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>

      <PolishersCard canEdit={canPlan} today={b.today} />

      <MarkDoneDialog session={marking} climate={b.room} unit={b.room.unit} onClose={() => setMarking(null)} />
    </div>
  );
}
