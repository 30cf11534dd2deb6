/**
 * Marking a session done: when it finished, the hands-on hours it took, the day's temperature and humidity, and
 * notes. A session finished late moves the rest of the job; the dialog says how far.
 */
import { useId, useState } from 'react';
import { nowLocal } from '@shared/time';
import { SessionDoneSchema, type SessionDoneResult } from '@shared/schemas/planning';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/field';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useAddJobPhoto, useMarkDone } from '../api/jobs';
import { useSessionMaterials } from '../api/session-materials';
import { draftLines, MaterialsUsedFields, type MaterialUseDraft } from './materials-used';
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
    const now = nowLocal();
    return session.end < now ? session.end : now;
  });
  const [actualHours, setActualHours] = useState(String(session.handsOnHours));
  const [temperatureC, setTemperature] = useState(String(climate.temperatureC));
  const [humidityPct, setHumidity] = useState(String(climate.humidityPct));
  const [notes, setNotes] = useState('');
  const [materialsUsed, setMaterialsUsed] = useState('');
  const prefill = useSessionMaterials(session.jobId, session.sessionId);
  const [useChanges, setUseChanges] = useState<Record<number, Partial<MaterialUseDraft>>>({});
  const uses = draftLines(prefill.data ?? [], useChanges);
  const [hadProblem, setHadProblem] = useState(false);
  const [problem, setProblem] = useState('');
  const [photo, setPhoto] = useState<File | null>(null);
  const [photoError, setPhotoError] = useState<string>();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [result, setResult] = useState<SessionDoneResult | null>(null);
  const mark = useMarkDone();
  const addPhoto = useAddJobPhoto();
  const notesId = useId();
  const materialsId = useId();
  const problemId = useId();
  const photoId = useId();
  const area = (invalid: boolean) =>
    `block w-full rounded-md border bg-white px-3 py-2 text-base text-walnut-900 focus:border-amber-500 focus:ring-2 focus:ring-amber-200 focus:outline-none sm:text-sm ${invalid ? 'border-brick-600' : 'border-walnut-200'}`;

  const submit = async () => {
    const parsed = SessionDoneSchema.safeParse({
      actualEnd,
      actualHours: actualHours === '' ? undefined : Number(actualHours),
      temperatureC: temperatureC === '' ? undefined : Number(temperatureC),
      humidityPct: humidityPct === '' ? undefined : Number(humidityPct),
      notes,
      materialsUsed: materialsUsed.trim() || undefined,
      problem: hadProblem ? problem : undefined,
      materials: uses.map((u) => ({ materialId: u.materialId, packId: u.packId, packs: u.packs === '' ? undefined : Number(u.packs) })),
    });
    if (hadProblem && !problem.trim()) {
      setErrors({ ...(parsed.success ? {} : zodFieldErrors(parsed.error)), problem: 'is required: say what went wrong' });
      return;
    }
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    let done: SessionDoneResult;
    try {
      done = await mark.mutateAsync({ jobId: session.jobId, sessionId: session.sessionId, ...parsed.data });
    } catch (err) {
      setErrors(serverFieldErrors(err));
      return;
    }
    // The session is saved; the photo follows. If it cannot be sent, the session stays done and the dialog says so.
    if (photo) {
      try {
        await addPhoto.mutateAsync({ jobId: session.jobId, file: photo, caption: `${session.jobNumber}, ${session.label}` });
      } catch (err) {
        setPhotoError(err instanceof Error ? err.message : 'The photo could not be sent.');
      }
    }
    setResult(done);
  };

  return (
    <Dialog title={`Mark done: ${session.label}`} open onClose={onClose}>
      {result ? (
        <div className="space-y-3">
          <Alert tone="info" title={`${session.label} is done`}>
            {result.job.state === 'finished' ? `${result.job.number} is finished: every session is done.` : `${result.job.sessionsDone} of ${result.job.sessionsTotal} sessions of ${result.job.number} done.`}
            {photo && !photoError && ' The photo is with the piece\u2019s photos.'}
          </Alert>
          {photoError && (
            <Alert tone="warning" title="The session is saved, the photo is not">
              {photoError} Add it again from the piece\u2019s page.
            </Alert>
          )}
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
          <div className="grid grid-cols-1 gap-3 sm:grid-cols-3">
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
              className={area(Boolean(errors.notes))}
              placeholder="How the session went: the rubber, the build, anything to watch next time."
            />
            {errors.notes && (
              <p className="flex items-center gap-1 text-sm text-brick-700" role="alert">
                <span aria-hidden>▲</span> {errors.notes}
              </p>
            )}
          </div>
          <div className="space-y-1">
            <label htmlFor={materialsId} className="block text-sm font-medium text-walnut-800">
              Materials used (optional)
            </label>
            <textarea
              id={materialsId}
              rows={2}
              value={materialsUsed}
              onChange={(e) => setMaterialsUsed(e.target.value)}
              aria-invalid={errors.materialsUsed ? true : undefined}
              className={area(Boolean(errors.materialsUsed))}
              placeholder="e.g. 250 mL of 1.5 lb cut, a pinch of pumice, a drop of oil"
            />
            {errors.materialsUsed && (
              <p className="flex items-center gap-1 text-sm text-brick-700" role="alert">
                <span aria-hidden>▲</span> {errors.materialsUsed}
              </p>
            )}
          </div>
          <MaterialsUsedFields lines={uses} errors={errors} onChange={(materialId, patch) => setUseChanges((c) => ({ ...c, [materialId]: { ...c[materialId], ...patch } }))} />
          <label className="flex min-h-11 items-center gap-3 text-sm font-medium text-walnut-800">
            <input type="checkbox" checked={hadProblem} onChange={(e) => setHadProblem(e.target.checked)} className="h-5 w-5 accent-amber-600" />
            Something went wrong
          </label>
          {hadProblem && (
            <div className="space-y-1">
              <label htmlFor={problemId} className="block text-sm font-medium text-walnut-800">
                What went wrong
              </label>
              <textarea
                id={problemId}
                rows={2}
                value={problem}
                onChange={(e) => setProblem(e.target.value)}
                aria-invalid={errors.problem ? true : undefined}
                className={area(Boolean(errors.problem))}
                placeholder="e.g. blush on the lid after the third coat; cut through on the front edge"
              />
              {errors.problem && (
                <p className="flex items-center gap-1 text-sm text-brick-700" role="alert">
                  <span aria-hidden>▲</span> {errors.problem}
                </p>
              )}
            </div>
          )}
          <div className="space-y-1">
            <label htmlFor={photoId} className="block text-sm font-medium text-walnut-800">
              Photo of the work (optional)
            </label>
            {/* On a phone or tablet `capture` opens the back camera straight away. */}
            <input
              id={photoId}
              type="file"
              accept="image/jpeg,image/png,image/webp"
              capture="environment"
              onChange={(e) => setPhoto(e.target.files?.[0] ?? null)}
              className="block w-full max-w-full text-sm text-walnut-700 file:mr-3 file:min-h-11 file:rounded-md file:border file:border-walnut-200 file:bg-parchment-100 file:px-3 file:py-2 file:text-sm file:font-medium file:text-walnut-800"
            />
            <p className="text-xs text-walnut-500">It joins the photos of the piece, captioned with this session.</p>
          </div>
          {mark.error && !Object.keys(errors).length && (
            <Alert tone="error" title="Not saved">
              {mark.error.message}
            </Alert>
          )}
          <div className="flex flex-col-reverse gap-2 sm:flex-row sm:justify-end">
            <Button variant="ghost" onClick={onClose}>
              Cancel
            </Button>
            <Button type="submit" variant="accent" busy={mark.isPending || addPhoto.isPending}>
              Mark done
            </Button>
          </div>
        </form>
      )}
    </Dialog>
  );
}
