/**
 * Planning the drying room and the polishers across jobs: pure functions over plain data (the booked jobs are a
 * list; removing one frees its places).
 */
export { planJob, findEarliestStart, toPlan } from './search';
export { bookAt, shiftRemaining } from './book';
export { occupancy } from './occupancy';
export { jobFromCoatCalendar } from './convert';
export { PlanningError, dateOf, dayNumber, roomNeed, roomCapacity } from './context';
export {
  RoomCapacitySchema, PolisherSchema, PlanningContextSchema, JobSessionSchema, NewJobSchema, SegmentSchema, PlannedSessionSchema,
  JobPlanSchema,
} from './types';
export type {
  RoomCapacity, Polisher, PlanningContext, JobSession, NewJob, PlanSegment, PlannedSession, JobPlan, BookedJob, PlanProblem,
  PlanProblemCode, PlanResult, WhyNot, WhyNotCode, EarliestStart, RoomOverbooking, PolisherOverbooking, Overbooking,
  ForcedBooking, PolisherDay, DayOccupancy, DayRef,
} from './types';
