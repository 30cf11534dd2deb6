/**
 * Booking a job: at the earliest start the board allows, or on a chosen date. The consequences come first (the
 * start found and why not sooner, or what a chosen date overbooks); nothing is booked until the planner confirms.
 */
import { CalendarCheck, CalendarSearch, TriangleRight } from 'lucide-react';
import { useId, useState } from 'react';
import { Link } from 'react-router-dom';
import type { BookingPreview, JobDetail, ReadyToBook } from '@shared/schemas/planning';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { SelectField, TextField } from '@/components/field';
import { ApiError } from '@/lib/api';
import { useBookJob, useCreateJob, usePreviewBooking } from '../api/jobs';
import { dateTime, durationText, toMinutes } from '../lib/time';
import { OverbookingList, WhyNotSooner } from './consequences';
import { jobPath } from './timeline';

type Mode = 'earliest' | 'date';

export function BookingForm({ ready, jobId, today, unit, onBooked, kept }: { ready?: ReadyToBook; jobId?: number; today: string; unit: string; onBooked?: (job: JobDetail) => void; kept?: string | null }) {
  const [overrideKeep, setOverrideKeep] = useState(false);
  const options = [
    ...(ready?.jobs ?? []).map((j) => ({ value: `j:${j.id}`, label: `${j.number} · ${j.title} (${j.customer.name})` })),
    ...(ready?.quotes ?? []).map((q) => ({ value: `q:${q.quoteId}`, label: `Quote ${q.quoteNumber} · ${q.title} (${q.customer.name}), accepted` })),
  ];
  const [choice, setChoice] = useState(jobId ? `j:${jobId}` : (options[0]?.value ?? ''));
  const [mode, setMode] = useState<Mode>('earliest');
  const [notBefore, setNotBefore] = useState('');
  const [start, setStart] = useState('');
  const [preview, setPreview] = useState<BookingPreview | null>(null);
  const [booked, setBooked] = useState<JobDetail | null>(null);
  const create = useCreateJob();
  const previewing = usePreviewBooking();
  const booking = useBookJob();
  const modeName = useId();
  // A job just booked leaves the list: the form then offers the first one still waiting.
  const selected = jobId ? `j:${jobId}` : options.some((o) => o.value === choice) ? choice : (options[0]?.value ?? '');

  const reset = () => {
    setPreview(null);
    setBooked(null);
    previewing.reset();
    booking.reset();
  };

  const body = () => ({ ...(mode === 'earliest' ? { mode, ...(notBefore ? { notBefore } : {}) } : { mode, start }), ...(kept && overrideKeep ? { overrideKeep: true } : {}) });

  const showConsequences = async () => {
    reset();
    let id = jobId ?? Number(selected.slice(2));
    if (!jobId && selected.startsWith('q:')) {
      const job = await create.mutateAsync({ quoteId: id });
      id = job.id;
      setChoice(`j:${job.id}`);
    }
    setPreview(await previewing.mutateAsync({ id, ...body() }));
  };

  const confirm = async () => {
    if (!preview) return;
    const job = await booking.mutateAsync({ id: preview.jobId, ...body(), confirm: preview.overbooked });
    setBooked(job);
    setPreview(null);
    onBooked?.(job);
  };

  const error = create.error ?? previewing.error ?? booking.error;
  const fieldError = (field: string) => (error instanceof ApiError ? error.fieldMessage(field) : undefined);
  if (!jobId && options.length === 0 && !booked) {
    return <p className="text-sm text-walnut-600">No accepted quote or job is waiting to be booked.</p>;
  }

  return (
    <div className="space-y-4">
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          void showConsequences().catch(() => undefined);
        }}
      >
        {!jobId && (
          <SelectField
            label="Job to book"
            value={selected}
            options={options}
            onChange={(e) => {
              setChoice(e.target.value);
              reset();
            }}
            hint="An accepted quote becomes a job when you look at its booking."
          />
        )}
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium text-walnut-800">Start</legend>
          <div className="flex flex-wrap gap-2">
            {(
              [
                ['earliest', 'Earliest start', CalendarSearch],
                ['date', 'On a chosen date', CalendarCheck],
              ] as const
            ).map(([value, label, Icon]) => (
              <label key={value} className={`inline-flex cursor-pointer items-center gap-2 rounded-md border px-3 py-1.5 text-sm ${mode === value ? 'border-amber-500 bg-amber-50 font-semibold text-walnut-900' : 'border-walnut-200 bg-white text-walnut-700'}`}>
                <input
                  type="radio"
                  name={modeName}
                  value={value}
                  checked={mode === value}
                  onChange={() => {
                    setMode(value);
                    reset();
                  }}
                  className="accent-amber-600"
                />
                <Icon className="h-4 w-4" aria-hidden />
                {label}
              </label>
            ))}
          </div>
        </fieldset>
        {mode === 'earliest' ? (
          <TextField
            label="Not before (optional)"
            type="date"
            min={today}
            value={notBefore}
            onChange={(e) => {
              setNotBefore(e.target.value);
              reset();
            }}
            error={fieldError('notBefore')}
            hint="From now when left empty."
          />
        ) : (
          <TextField
            label="Chosen date"
            type="date"
            min={today}
            required
            value={start}
            onChange={(e) => {
              setStart(e.target.value);
              reset();
            }}
            error={fieldError('start')}
            hint="The first session goes at the first opening that day, whatever else is booked."
          />
        )}
        {kept && (
          <label className="flex items-start gap-2 text-sm text-walnut-800">
            <input
              type="checkbox"
              className="mt-1"
              checked={overrideKeep}
              onChange={(e) => {
                setOverrideKeep(e.target.checked);
                reset();
              }}
            />
            <span>
              Override the kept hand: {kept} is kept on this job; let whoever is free do those sessions this time.
            </span>
          </label>
        )}
        <Button type="submit" variant="secondary" busy={create.isPending || previewing.isPending} disabled={mode === 'date' && !start}>
          <TriangleRight className="h-4 w-4" aria-hidden /> {mode === 'earliest' ? 'Find the earliest start' : 'Show the consequences'}
        </Button>
      </form>

      {error && !fieldError('start') && !fieldError('notBefore') && (
        <Alert tone="error" title={booking.error ? 'Not booked' : 'Cannot lay this job'}>
          {error.message}
        </Alert>
      )}

      {preview && (
        <section aria-label="Consequences" className={`space-y-3 rounded-lg border p-4 ${preview.overbooked ? 'border-brick-600/50 bg-brick-100/40' : 'border-amber-300 bg-amber-50/60'}`}>
          <div>
            <p className="text-xs font-semibold tracking-wide text-walnut-600 uppercase">{preview.mode === 'earliest' ? 'Earliest start' : 'If booked on the chosen date'}</p>
            <p className="text-lg font-semibold text-walnut-900" data-testid="preview-start">
              {dateTime(preview.start)}
            </p>
            <p className="num text-sm text-walnut-700">
              In the drying room {dateTime(preview.roomStart)} to {dateTime(preview.roomEnd)} ({durationText(toMinutes(preview.roomEnd) - toMinutes(preview.roomStart))}), {preview.sessions.length} sessions; first with{' '}
              {preview.sessions[0]?.polisher?.name ?? 'nobody yet'}.
            </p>
          </div>
          {preview.mode === 'earliest' ? (
            <div>
              <h3 className="mb-1 text-sm font-semibold text-walnut-800">Why it could not start sooner</h3>
              <WhyNotSooner reasons={preview.whyNotSooner} />
            </div>
          ) : preview.overbooked ? (
            <div className="space-y-2">
              <Alert tone="warning" title={`This date overbooks ${new Set([...preview.overbooking.room.map((r) => r.date), ...preview.overbooking.polishers.map((p) => p.date)]).size} days`}>
                Confirming forces the booking and records the overbooking on the job.
              </Alert>
              <OverbookingList overbooking={preview.overbooking} unit={unit} />
            </div>
          ) : (
            <p className="text-sm text-moss-700">Fits: no day is overbooked.</p>
          )}
          <div className="flex flex-wrap gap-2">
            <Button variant={preview.overbooked ? 'danger' : 'accent'} busy={booking.isPending} onClick={() => void confirm().catch(() => undefined)}>
              <CalendarCheck className="h-4 w-4" aria-hidden />
              {preview.overbooked ? 'Force the booking' : `Book from ${dateTime(preview.start)}`}
            </Button>
            <Button variant="ghost" onClick={reset}>
              Not now
            </Button>
          </div>
        </section>
      )}

      {booked && (
        <Alert tone="info" title={`${booked.number} booked`}>
          In the drying room from {dateTime(booked.roomStart)} to {dateTime(booked.roomEnd)}.{' '}
          <Link className="font-semibold underline" to={jobPath(booked.id)}>
            Open the job
          </Link>
        </Alert>
      )}
    </div>
  );
}
