/**
 * Jobs and the board: a job from an accepted quote takes the quoted revision's sessions and rests; booking lays it
 * with the planning engine at the earliest start or at a chosen date (with the overbooking shown first and forced
 * only on confirmation); progress marks sessions done with actual hours, and a slip moves the rest of the job.
 * Every write that takes or frees places runs in one transaction under the board lock, and re-checks there.
 * One job a file: mapping (the API's shapes), read, jobs (make, change, cancel), booking, progress, board.
 */
export { getJob, listJobs } from './read';
export { cancelJob, createJob, EXTRA_SESSION_MAX_HOURS, extraStages, footprintM2, jobStages, unbookedSession, updateJob, type SessionPlan } from './jobs';
export { bookJob, previewBooking } from './booking';
export { markSessionDone } from './progress';
export { getBoard, readyToBook } from './board';
