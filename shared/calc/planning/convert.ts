/**
 * From an estimate's coat calendar to a job to plan.
 */
import type { SessionResult } from '../../schemas/calc';
import type { NewJob } from './types';

/**
 * A job to plan from the sessions of an estimate's coat calendar (hands-on and rest hours become minutes).
 *
 * @example jobFromCoatCalendar('job-12', result.calendar.sessions, { bays: 1 })
 */
export function jobFromCoatCalendar(
  id: string,
  sessions: ReadonlyArray<Pick<SessionResult, 'stage' | 'session' | 'handsOnHours' | 'restHours'>>,
  room: { bays?: number; areaM2?: number } = {},
): NewJob {
  return {
    id,
    sessions: sessions.map((s) => ({
      label: `${s.stage} ${s.session}`,
      handsOnMin: Math.round(s.handsOnHours * 60),
      restMin: Math.round(s.restHours * 60),
    })),
    ...room,
  };
}
