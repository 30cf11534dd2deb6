/**
 * Marking a session done: when it finished, the hands-on hours it took, the day's temperature and humidity, and
 * notes. A session finished late moves the rest of the job; the dialog says how far.
 */
import { useId, useState } from 'react';
import { localToday } from '@shared/schemas/dates';
import { SessionDoneSchema, type SessionDoneResult } from '@shared/schemas/planning';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useMarkDone } from '../api/jobs';
import { dateTime, durationText, hoursText } from '../lib/time';
import { OverbookingList } from './consequences';

export interface SessionToMark {
  jobId: number;
  jobNumber: string;
  sessionId: number;
  label: string;
  end: string;
  handsOnHours: number;
}

export function MarkDoneDialog({ session, climate, unit, onClose }: { session: SessionToMark | null; climate: { temperatureC: number; humidityPct: number }; unit: string; onClose: () => void }) {
  if (!session) return null;
  return <MarkDoneForm key={session.sessionId} session={session} climate={climate} unit={unit} onClose={onClose} />;
}

function MarkDoneForm({ session, climate, unit, onClose }: { session: SessionToMark; climate: { temperatureC: number; humidityPct: number }; unit: string; onClose: () => void }) {
  // A session cannot be done later than now: the planned end when it has passed, else the present minute.
  const [actualEnd, setActualEnd] = useState(() => {
    const d = new Date();
    const now = `${localToday(d)}T${String(d.getHours()).padStart(2, '0')}:${String(d.getMinutes()).padStart(2, '0')}`;
    return session.end < now ? session.end : now;
  });
  const [actualHours, setActualHours] = useState(String(session.handsOnHours));
  const [temperatureC, setTemperature] = useState(String(climate.temperatureC));
  const [humidityPct, setHumidity] = useState(String(climate.humidityPct));
  const [notes, setNotes] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [result, setResult] = useState<SessionDoneResult | null>(null);
  const mark = useMarkDone();
  const notesId = useId();

  const submit = async () => {
    const parsed = SessionDoneSchema.safeParse({
      actualEnd,
      actualHours: actualHours === '' ? undefined : Number(actualHours),
      temperatureC: temperatureC === '' ? undefined : Number(temperatureC),
      humidityPct: humidityPct === '' ? undefined : Number(humidityPct),
      notes,
    });
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    try {
      setResult(await mark.mutateAsync({ jobId: session.jobId, sessionId: session.sessionId, ...parsed.data }));
    } catch (err) {
      setErrors(serverFieldErrors(err));
    }
  };

  return (
    <Dialog title={`Mark done: ${session.label}`} open onClose={onClose}>
      {result ? (
        <div className="space-y-3">
          <Alert tone="info" title={`${session.label} is done`}>
            {result.job.state === 'finished' ? `${result.job.number} is finished: every session is done.` : `${result.job.sessionsDone} of ${result.job.sessionsTotal} sessions of ${result.job.number} done.`}
          </Alert>
          {result.shift && (
            <Alert tone="warning" title={`Finished ${durationText(result.shift.slipMin)} late`}>
              {result.shift.moved} later session{result.shift.moved === 1 ? '' : 's'} moved; the piece now leaves the drying room {dateTime(result.shift.roomEnd)}.
            </Alert>
          )}
          {result.shift && <OverbookingList overbooking={result.shift.overbooking} unit={unit} />}
          <div className="flex justify-end">
            <Button onClick={onClose}>OK</Button>
          </div>
        </div>
      ) : (
        <form
          className="space-y-3"
          noValidate
          onSubmit={(e) => {
            e.preventDefault();
            void submit();
          }}
        >
          <p className="text-sm text-walnut-600">
            {session.jobNumber}: planned to end {dateTime(session.end)}, {hoursText(session.handsOnHours)} hands-on. A later finish moves the sessions after it.
          </p>
          <TextField label="Finished at" type="datetime-local" value={actualEnd} onChange={(e) => setActualEnd(e.target.value.slice(0, 16))} error={errors.actualEnd} />
          <div className="grid grid-cols-3 gap-3">
            <TextField label="Hands-on hours (h)" type="number" step="0.25" min="0" value={actualHours} onChange={(e) => setActualHours(e.target.value)} error={errors.actualHours} />
            <TextField label="Temperature (°C)" type="number" step="0.5" value={temperatureC} onChange={(e) => setTemperature(e.target.value)} error={errors.temperatureC} />
            <TextField label="Humidity (% RH)" type="number" step="1" min="0" max="100" value={humidityPct} onChange={(e) => setHumidity(e.target.value)} error={errors.humidityPct} />
          </div>
          {Number(humidityPct) > 75 && (
            <Alert tone="warning" title="Damp day">
              Above about 75 % RH shellac may turn milky (blush): note it if it did.
            </Alert>
          )}
          <div className="space-y-1">
            <label htmlFor={notesId} className="block text-sm font-medium text-walnut-800">
              Notes
            </label>
            <textarea
              id={notesId}
              rows={3}
              value={notes}
              onChange={(e) => setNotes(e.target.value)}
              aria-invalid={errors.notes ? true : undefined}
              className={`block w-full rounded-md border bg-white px-3 py-2 text-sm text-walnut-900 focus:border-amber-500 focus:ring-2 focus:ring-amber-200 focus:outline-none ${errors.notes ? 'border-brick-600' : 'border-walnut-200'}`}
              placeholder="How the session went: the rubber, the build, anything to watch next time."
            />
            {errors.notes && (
              <p className="flex items-center gap-1 text-sm text-brick-700" role="alert">
                <span aria-hidden>▲</span> {errors.notes}
              </p>
            )}
          </div>
          {mark.error && !Object.keys(errors).length && (
            <Alert tone="error" title="Not saved">
              {mark.error.message}
            </Alert>
          )}
          <div className="flex justify-end gap-2">
            <Button variant="ghost" onClick={onClose}>
              Cancel
            </Button>
            <Button type="submit" variant="accent" busy={mark.isPending}>
              Mark done
            </Button>
          </div>
        </form>
      )}
    </Dialog>
  );
}
