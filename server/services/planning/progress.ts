/** Progress: a session marked done with what really happened, and a slip moving the rest of the job. */
import { type Sequelize } from 'sequelize';
import { fromMinutes, toMinutes } from '@shared/calc';
import { shiftRemaining } from '@shared/calc/planning';
import { type SessionDoneInput, type SessionDoneResult } from '@shared/schemas/planning';
import { problems } from '../../http/problem';
import { Job } from '../../models';
import { audit } from '../audit';
import {
  isOverbooked,
  loadBoardJobs,
  loadPlanning,
  localNow,
  lockBoard,
  overbookingDto,
  toBooked,
  writePlan,
} from '../planning-context';
import { sessionLabel, sessionsOf } from './mapping';
import { getJob } from './read';
import { cannotPlan } from './booking';
import { MaterialsUsedSchema } from '@shared/schemas/stock';
import { recordSessionUse } from '../stock/ledger';

/** Minutes a finish time may lie ahead of the server's clock (a browser clock slightly fast). */
const FINISH_GRACE_MIN = 5;

/**
 * Marks the next open session of a job done with what really happened. When it finished later than planned, the
 * sessions after it are laid again from its actual end plus its rest (the engine's shiftRemaining), and whatever
 * that overbooks is recorded on the job.
 */
export async function markSessionDone(sequelize: Sequelize, actorId: number, jobId: number, sessionId: number, input: SessionDoneInput): Promise<SessionDoneResult> {
  // A session cannot have finished in the future. A few minutes' grace covers a browser clock a little ahead.
  const latest = fromMinutes(toMinutes(localNow()) + FINISH_GRACE_MIN);
  if (input.actualEnd > latest) {
    throw problems.badRequest('finish_in_future', `actualEnd: ${input.actualEnd} is in the future; a session is marked done once it has finished`, 'actualEnd');
  }
  const shift = await sequelize.transaction(async (transaction) => {
    await lockBoard(transaction);
    const job = await Job.findByPk(jobId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!job) throw problems.notFound('Job');
    const sessions = await sessionsOf(jobId, transaction);
    const session = sessions.find((s) => s.id === sessionId);
    if (!session) throw problems.notFound('Session');
    if (job.state !== 'booked' && job.state !== 'in-progress') {
      throw problems.conflict('job_not_on_board', job.state === 'unbooked' ? `Job ${job.number} is not booked yet: book it first.` : `Job ${job.number} is ${job.state}.`);
    }
    if (session.done) throw problems.conflict('session_done', `${sessionLabel(session)} is already marked done.`);
    const open = sessions.find((s) => !s.done)!;
    if (open.id !== session.id) {
      throw problems.conflict('earlier_session_open', `${sessionLabel(open)} comes first: mark it done before ${sessionLabel(session)}.`);
    }
    const plannedEnd = toMinutes(session.plannedEnd!);
    const actualEnd = toMinutes(input.actualEnd);
    session.set({
      done: true,
      actualEnd: input.actualEnd,
      actualHours: input.actualHours.toFixed(2),
      temperatureC: input.temperatureC.toFixed(1),
      humidityPct: input.humidityPct.toFixed(1),
      notes: input.notes,
      materialsUsed: input.materialsUsed || null,
      problem: input.problem || null,
      doneBy: actorId,
      doneAt: new Date(),
    });
    await session.save({ transaction });
    if (input.materials?.length) await recordSessionUse(transaction, actorId, job, session, MaterialsUsedSchema.parse(input.materials));

    let result: SessionDoneResult['shift'] = null;
    const doneCount = session.idx + 1;
    if (actualEnd > plannedEnd && doneCount < sessions.length) {
      const planning = await loadPlanning(transaction, true);
      const { booked } = await loadBoardJobs(localNow().slice(0, 10), transaction);
      const shifted = shiftRemaining(toBooked(job, sessions), doneCount, actualEnd, booked, planning.ctx);
      if (!shifted.ok) throw cannotPlan(shifted.problem);
      const moved = await writePlan(sessions, shifted.plan, false, transaction);
      const overbooking = overbookingDto(shifted.overbooking, planning.names);
      await job.update({ roomEnd: fromMinutes(shifted.plan.room.end), ...(isOverbooked(overbooking) ? { overbooking } : {}) }, { transaction });
      result = { slipMin: actualEnd - plannedEnd, moved, roomEnd: job.roomEnd, overbooking };
    }
    const finished = doneCount === sessions.length;
    // The last session finished late: the piece rests in the room that much longer.
    const lastRest = actualEnd + session.restMin;
    const longer = finished && job.roomEnd !== null && lastRest > toMinutes(job.roomEnd) ? { roomEnd: fromMinutes(lastRest) } : {};
    await job.update({ state: finished ? 'finished' : 'in-progress', ...(finished ? { finishedAt: new Date() } : {}), ...longer }, { transaction });
    await audit(
      {
        userId: actorId,
        action: 'job.session-done',
        entityType: 'job',
        entityId: jobId,
        after: { session: sessionLabel(session), actualEnd: input.actualEnd, actualHours: input.actualHours, ...(input.problem ? { problem: input.problem } : {}), estimatedHours: Number(session.estimatedHours), slipMin: Math.max(0, actualEnd - plannedEnd), moved: result?.moved ?? 0 },
      },
      transaction,
    );
    return result;
  });
  return { job: await getJob(jobId), shift };
}
