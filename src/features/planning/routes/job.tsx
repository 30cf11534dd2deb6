/**
 * One job: where it sits on the board and why not sooner, planned against actual stage by stage, its sessions with
 * what really happened, and for the planner booking, moving or cancelling it.
 */
import { AlertTriangle, ArrowDownRight, ArrowLeft, ArrowUpRight, Ban, CircleCheck, CircleDot, Clock3, Minus } from 'lucide-react';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import type { JobDetail, StagePlanVsActual } from '@shared/schemas/planning';
import { can } from '@shared/roles';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Card, PageHeader } from '@/components/card';
import { TextField } from '@/components/field';
import { Spinner } from '@/components/spinner';
import { paths, pathTo } from '@/config/paths';
import { useMe } from '@/lib/me';
import { formatMoney, todayIso } from '@/lib/format';
import { JobCostingCard } from '../components/job-costing-card';
import { JobEndCards } from '../components/job-end-card';
import { useBoard } from '../api/board';
import { useCancelJob, useJob, useUpdateJob } from '../api/jobs';
import { BookingForm } from '../components/booking-form';
import { OverbookingList, WhyNotSooner } from '../components/consequences';
import { JobStateBadge } from '../components/job-state-badge';
import { MarkDoneDialog, type SessionToMark } from '../components/mark-done-dialog';
import { dateTime, hoursText, restText, toMinutes } from '../lib/time';

function Difference({ estimated, actual }: { estimated: number; actual: number }) {
  if (estimated <= 0) return <span className="text-walnut-400">—</span>;
  const pct = Math.round(((actual - estimated) / estimated) * 100);
  if (Math.abs(pct) < 3) {
    return (
      <span className="inline-flex items-center gap-1 text-walnut-600">
        <Minus className="h-3.5 w-3.5" aria-hidden /> on estimate
      </span>
    );
  }
  const over = pct > 0;
  const Icon = over ? ArrowUpRight : ArrowDownRight;
  return (
    <span className={`inline-flex items-center gap-1 font-medium ${over ? 'text-brick-700' : 'text-moss-700'}`}>
      <Icon className="h-3.5 w-3.5" aria-hidden /> {Math.abs(pct)} % {over ? 'over' : 'under'}
    </span>
  );
}

function datesText(row: StagePlanVsActual): string {
  if (!row.plannedStart) return 'not booked';
  return `${dateTime(row.plannedStart)} → ${dateTime(row.plannedEnd)}`;
}

function StagesTable({ job }: { job: JobDetail }) {
  return (
    <div className="overflow-x-auto">
      <table className="min-w-full text-sm">
        <caption className="sr-only">Planned against actual, by stage</caption>
        <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
          <tr>
            <th scope="col" className="px-3 py-2">Stage</th>
            <th scope="col" className="px-3 py-2 text-right">Sessions done</th>
            <th scope="col" className="px-3 py-2 text-right">Estimated (h)</th>
            <th scope="col" className="px-3 py-2 text-right">Actual (h)</th>
            <th scope="col" className="px-3 py-2">Against the estimate</th>
            <th scope="col" className="px-3 py-2">Planned when booked</th>
            <th scope="col" className="px-3 py-2">Ends now / ended</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {job.stages.map((s) => {
            const late = s.plannedEnd && (s.actualEnd ?? s.currentEnd) && toMinutes((s.actualEnd ?? s.currentEnd)!) > toMinutes(s.plannedEnd);
            return (
              <tr key={s.stage}>
                <td className="px-3 py-2 font-medium text-walnut-900">{s.name}</td>
                <td className="num px-3 py-2 text-right">
                  {s.sessionsDone} of {s.sessions}
                </td>
                <td className="num px-3 py-2 text-right">{hoursText(s.estimatedHours)}</td>
                <td className="num px-3 py-2 text-right">{s.sessionsDone ? hoursText(s.actualHours) : '—'}</td>
                <td className="px-3 py-2">{s.sessionsDone ? <Difference estimated={s.estimatedDoneHours} actual={s.actualHours} /> : <span className="text-walnut-400">not started</span>}</td>
                <td className="num px-3 py-2 whitespace-nowrap text-walnut-700">{datesText(s)}</td>
                <td className="num px-3 py-2 whitespace-nowrap">
                  {s.actualEnd ? (
                    <span className="inline-flex items-center gap-1">
                      <CircleCheck className="h-3.5 w-3.5 text-moss-700" aria-label="ended" /> {dateTime(s.actualEnd)}
                    </span>
                  ) : (
                    dateTime(s.currentEnd)
                  )}
                  {late && (
                    <span className="ml-1.5 inline-flex items-center gap-0.5 text-xs font-medium text-brick-700">
                      <Clock3 className="h-3 w-3" aria-hidden /> later than planned
                    </span>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

function SessionsTable({ job, canMark, onMark }: { job: JobDetail; canMark: boolean; onMark: (s: SessionToMark) => void }) {
  const next = job.sessions.find((s) => !s.done);
  const onBoard = job.state === 'booked' || job.state === 'in-progress';
  return (
    <div className="overflow-x-auto">
      <table className="min-w-full text-sm">
        <caption className="sr-only">Sessions</caption>
        <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
          <tr>
            <th scope="col" className="px-3 py-2">Session</th>
            <th scope="col" className="px-3 py-2">Planned</th>
            <th scope="col" className="px-3 py-2">Polisher</th>
            <th scope="col" className="px-3 py-2">State</th>
            <th scope="col" className="px-3 py-2">Actual</th>
            <th scope="col" className="px-3 py-2">Notes</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-parchment-200">
          {job.sessions.map((s) => (
            <tr key={s.id} className={s.id === next?.id && onBoard ? 'bg-amber-50/60' : ''}>
              <td className="min-w-52 px-3 py-2">
                <span className="font-medium text-walnut-900">{s.label}</span>
                <span className="num block text-xs text-walnut-500">{hoursText(s.handsOnHours)} hands-on · rest {restText(s.restHours)}</span>
              </td>
              <td className="num px-3 py-2 whitespace-nowrap">
                {s.start ? `${dateTime(s.start)} → ${s.end!.slice(0, 10) === s.start.slice(0, 10) ? s.end!.slice(11) : dateTime(s.end!)}` : '—'}
                {s.restUntil && s.restHours > 0 && <span className="block text-xs text-walnut-500">rest until {dateTime(s.restUntil)}</span>}
                {s.baselineStart && s.start !== s.baselineStart && !s.done && <span className="block text-xs text-amber-800">was {dateTime(s.baselineStart)}</span>}
              </td>
              <td className="px-3 py-2 whitespace-nowrap">{s.polisher?.name ?? '—'}</td>
              <td className="px-3 py-2 whitespace-nowrap">
                {s.done ? (
                  <span className="inline-flex items-center gap-1 text-moss-700">
                    <CircleCheck className="h-4 w-4" aria-hidden /> Done
                  </span>
                ) : s.id === next?.id && onBoard ? (
                  canMark ? (
                    <Button size="sm" variant="accent" onClick={() => onMark({ jobId: job.id, jobNumber: job.number, sessionId: s.id, label: s.label, end: s.end!, handsOnHours: s.handsOnHours })}>
                      <CircleCheck className="h-3.5 w-3.5" aria-hidden /> Mark done
                    </Button>
                  ) : (
                    <span className="inline-flex items-center gap-1 text-amber-800">
                      <CircleDot className="h-4 w-4" aria-hidden /> Next
                    </span>
                  )
                ) : (
                  <span className="text-walnut-500">Planned</span>
                )}
              </td>
              <td className="num px-3 py-2 whitespace-nowrap">
                {s.done ? (
                  <>
                    {dateTime(s.actualEnd)} · {hoursText(s.actualHours ?? 0)}
                    <span className="block text-xs text-walnut-500">
                      {s.temperatureC} °C · {s.humidityPct} % RH
                    </span>
                  </>
                ) : (
                  '—'
                )}
              </td>
              <td className="min-w-56 px-3 py-2 text-walnut-700">
                {s.notes}
                {s.materialsUsed && <span className="block text-xs text-walnut-600">Materials: {s.materialsUsed}</span>}
                {s.problem && (
                  <span className="mt-0.5 flex items-start gap-1 text-xs font-medium text-brick-700">
                    <AlertTriangle className="mt-0.5 h-3.5 w-3.5 shrink-0" aria-hidden /> Problem: {s.problem}
                  </span>
                )}
                {s.doneBy && <span className="block text-xs text-walnut-500">by {s.doneBy.name}</span>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function RoomNeed({ job }: { job: JobDetail }) {
  const update = useUpdateJob(job.id);
  const [value, setValue] = useState(String(job.roomUnit === 'bays' ? job.bays : job.areaM2));
  const bays = job.roomUnit === 'bays';
  return (
    <form
      className="flex items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        update.mutate(bays ? { bays: Number(value) } : { areaM2: Number(value) });
      }}
    >
      <TextField
        label={bays ? 'Bays it takes' : 'Rack area it takes (m²)'}
        type="number"
        step={bays ? '1' : '0.01'}
        min={bays ? '1' : '0.01'}
        value={value}
        onChange={(e) => setValue(e.target.value)}
        error={update.error?.message}
        hint={bays ? undefined : 'The piece\u2019s largest face, from the estimate; change it if it stands differently.'}
      />
      <Button type="submit" variant="secondary" busy={update.isPending}>
        Save
      </Button>
    </form>
  );
}

export function JobPage() {
  const id = Number(useParams().jobId);
  const job = useJob(id);
  const me = useMe();
  const role = me.data?.role;
  const board = useBoard(undefined, 1);
  const cancel = useCancelJob();
  const [marking, setMarking] = useState<SessionToMark | null>(null);

  if (job.isPending) return <Spinner label="Opening the job…" />;
  if (job.isError) return <Alert tone="error" title="The job could not be opened">{job.error.message}</Alert>;
  const j = job.data;
  const canPlan = can(role, 'planRoom');
  const canMark = can(role, 'recordProgress');
  const bookable = canPlan && (j.state === 'unbooked' || j.state === 'booked');
  const room = board.data?.room ?? { temperatureC: 20, humidityPct: 55, unit: j.roomUnit };
  const today = board.data?.today ?? todayIso();

  return (
    <div className="space-y-6">
      <Link to={paths.planning} className="inline-flex items-center gap-1 text-sm text-walnut-600 hover:text-walnut-900">
        <ArrowLeft className="h-4 w-4" aria-hidden /> Planning board
      </Link>
      <PageHeader
        title={`${j.number} · ${j.title}`}
        description={
          <span className="inline-flex flex-wrap items-center gap-2">
            <JobStateBadge state={j.state} />
            <span>
              {j.customer.name} · estimate{' '}
              <Link className="underline" to={pathTo.estimate(j.estimate.id)}>
                {j.estimate.number}
              </Link>{' '}
              revision {j.estimate.revision} · quote {j.quote.number}
              {can(role, 'takePayments') ? (
                <>
                  {' · '}
                  <Link className="underline" to={pathTo.account(j.quote.id)}>
                    account
                  </Link>
                </>
              ) : null}
            </span>
          </span>
        }
        actions={
          canPlan &&
          j.state !== 'finished' &&
          j.state !== 'cancelled' && (
            <Button
              variant="ghost"
              busy={cancel.isPending}
              onClick={() => window.confirm(`Cancel ${j.number}? Its places in the drying room and its polishers' hours are freed.`) && cancel.mutate(j.id)}
            >
              <Ban className="h-4 w-4" aria-hidden /> Cancel job
            </Button>
          )
        }
      />
      {cancel.isError && <Alert tone="error" title="Not cancelled">{cancel.error.message}</Alert>}

      <dl className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
        {[
          ['In the drying room', j.roomStart ? `${dateTime(j.roomStart)} → ${dateTime(j.roomEnd)}` : 'not booked'],
          ['Takes', j.roomUnit === 'bays' ? `${j.bays} bay${j.bays === 1 ? '' : 's'}` : `${j.areaM2} m² of rack`],
          ['Sessions done', `${j.sessionsDone} of ${j.sessionsTotal}`],
          ['Hands-on hours', `${hoursText(j.estimatedHours)} estimated · ${j.sessionsDone ? hoursText(j.actualHours) : '—'} actual`],
          ...(j.agreed
            ? [
                ['Agreed total', formatMoney(j.agreed.total, j.agreed.currency)],
                ['Deposit', formatMoney(j.agreed.deposit, j.agreed.currency)],
                ['Balance due on collection', formatMoney(j.agreed.balance, j.agreed.currency)],
              ]
            : []),
        ].map(([label, value]) => (
          <div key={label} className="rounded-xl border border-parchment-200 bg-white px-4 py-3 shadow-card" data-fact={label}>
            <dt className="text-xs font-semibold tracking-wide text-walnut-500 uppercase">{label}</dt>
            <dd className="num mt-0.5 font-semibold text-walnut-900">{value}</dd>
          </div>
        ))}
      </dl>

      {j.overbooking && (j.overbooking.room.length > 0 || j.overbooking.polishers.length > 0) && (
        <Card
          title={
            <span className="inline-flex items-center gap-2 text-brick-700">
              <AlertTriangle className="h-5 w-5" aria-hidden /> {j.forced ? 'Booked over capacity' : 'Overbooked after a slip'}
            </span>
          }
        >
          <OverbookingList overbooking={j.overbooking} unit={j.roomUnit} />
        </Card>
      )}

      <div className="grid grid-cols-1 gap-6 xl:grid-cols-2">
        <Card title="Why it could not start sooner">
          {j.startMode === 'earliest' ? (
            <WhyNotSooner reasons={j.whyNotSooner} />
          ) : j.startMode === 'date' ? (
            <p className="text-sm text-walnut-600">Booked on a date the planner chose{j.bookedBy ? ` (${j.bookedBy.name})` : ''}, not at the earliest start.</p>
          ) : (
            <p className="text-sm text-walnut-600">Not booked yet.</p>
          )}
          {j.bookedAt && <p className="mt-3 text-xs text-walnut-500">Booked {new Date(j.bookedAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })}{j.bookedBy ? ` by ${j.bookedBy.name}` : ''}.</p>}
        </Card>
        {bookable ? (
          <Card title={j.state === 'unbooked' ? 'Book this job' : 'Move this job'}>
            <div className="space-y-4">
              {j.state === 'unbooked' && <RoomNeed job={j} />}
              <BookingForm jobId={j.id} today={today} unit={j.roomUnit} kept={j.keptPolisherId ? 'a polisher' : null} />
            </div>
          </Card>
        ) : (
          <Card title="Notes">
            <p className="text-sm whitespace-pre-line text-walnut-700">{j.notes || 'No notes on this job.'}</p>
          </Card>
        )}
      </div>

      <JobEndCards jobId={j.id} />

      {can(role, 'readCosting') && <JobCostingCard jobId={j.id} />}

      <Card title="Planned against actual, by stage">
        <StagesTable job={j} />
      </Card>

      <Card title="Sessions">
        <SessionsTable job={j} canMark={canMark} onMark={setMarking} />
      </Card>

      <MarkDoneDialog session={marking} climate={room} unit={j.roomUnit} onClose={() => setMarking(null)} />
    </div>
  );
}
