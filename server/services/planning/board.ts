/** The planning board by week and the accepted quotes ready to book. */
import { mondayOf } from '@shared/time';
import { Op } from 'sequelize';
import { occupancy } from '@shared/calc/planning';
import { type BoardJob, type DueSession, type PlanningBoard, type ReadyToBook } from '@shared/schemas/planning';
import { Customer, Estimate, EstimateRevision, Quote, QuoteLine } from '../../models';
import { agreedOf } from '../quotes';
import { addDays, loadBoardJobs, loadPlanning, localNow } from '../planning-context';
import { round, related, sessionLabel, summaryDto } from './mapping';
import { listJobs } from './read';
import { extraStages } from './jobs';

export async function getBoard(q: { from?: string; weeks: number }): Promise<PlanningBoard> {
  const planning = await loadPlanning(undefined, false);
  const now = localNow(planning.settings.timeZone);
  const today = now.slice(0, 10);
  const from = q.from ?? mondayOf(today);
  const to = addDays(from, q.weeks * 7 - 1);
  const { jobs, sessions, booked } = await loadBoardJobs(from < today ? from : today);
  const days = occupancy(booked, planning.ctx, from, to);
  const end = addDays(to, 1);
  const shown = jobs.filter((j) => j.roomStart! < end && j.roomEnd! > from);
  const rel = await related(shown);
  const boardJobs: BoardJob[] = shown.map((j) => {
    const list = sessions.get(j.id) ?? [];
    return {
      ...summaryDto(j, list, rel),
      sessions: list.map((s) => ({
        id: s.id,
        index: s.idx,
        label: sessionLabel(s),
        stageName: s.stageName,
        stageKind: s.stageKind,
        start: s.plannedStart!,
        end: s.plannedEnd!,
        restUntil: s.restUntil!,
        segments: s.segments,
        polisherId: s.polisherId,
        done: s.done,
      })),
    };
  });
  const tomorrow = addDays(today, 1);
  const polisherNames = new Map(planning.polishers.map((p) => [p.id, p.name]));
  const due: DueSession[] = [];
  for (const j of jobs) {
    if (j.state === 'finished') continue;
    const list = sessions.get(j.id) ?? [];
    const next = list.find((s) => !s.done);
    for (const s of list) {
      const day = s.plannedStart?.slice(0, 10);
      if (s.done || (day !== today && day !== tomorrow)) continue;
      due.push({
        day: day === today ? 'today' : 'tomorrow',
        jobId: j.id,
        jobNumber: j.number,
        title: j.title,
        sessionId: s.id,
        label: sessionLabel(s),
        start: s.plannedStart!,
        end: s.plannedEnd!,
        handsOnHours: round(s.handsOnMin / 60),
        polisher: s.polisherId === null ? null : { id: s.polisherId, name: polisherNames.get(s.polisherId) ?? 'former polisher' },
        next: next?.id === s.id,
      });
    }
  }
  due.sort((a, b) => a.start.localeCompare(b.start));
  const room = planning.settings.dryingRoom;
  return {
    from,
    to,
    today,
    now,
    room: {
      mode: room.mode,
      capacity: room.mode === 'bays' ? room.bays : room.rackAreaM2,
      unit: room.mode === 'bays' ? 'bays' : 'm²',
      temperatureC: room.temperatureC,
      humidityPct: room.humidityPct,
    },
    polishers: planning.polishers.map((p) => ({ id: p.id, name: p.name, hoursPerDay: Number(p.hoursPerDay), daysOff: p.daysOff, active: p.active })),
    days,
    jobs: boardJobs,
    due,
  };
}

/** The pieces chosen in accepted quotes that are not a job yet (one row a chosen line), and jobs not yet booked. */
export async function readyToBook(): Promise<ReadyToBook> {
  const lines = await QuoteLine.findAll({
    where: {
      chosen: true,
      id: { [Op.notIn]: Quote.sequelize!.literal(`(SELECT quote_line_id FROM jobs WHERE state <> 'cancelled')`) },
      quoteId: { [Op.in]: Quote.sequelize!.literal(`(SELECT id FROM quotes WHERE state IN ('accepted', 'deposit-paid'))`) },
    },
    order: [['quoteId', 'ASC'], ['position', 'ASC']],
    limit: 200,
  });
  const quotes = await Quote.findAll({ where: { id: lines.map((l) => l.quoteId) } });
  const firstChosen = await QuoteLine.findAll({ where: { quoteId: quotes.map((q) => q.id), chosen: true }, attributes: ['id', 'quoteId', 'position'] });
  const estimates = await Estimate.findAll({ where: { id: lines.map((l) => l.estimateId) }, attributes: ['id', 'number', 'title', 'customerId'] });
  const customers = await Customer.findAll({ where: { id: estimates.map((e) => e.customerId) }, attributes: ['id', 'name'] });
  const revisions = await EstimateRevision.findAll({ where: { id: lines.map((l) => l.revisionId) }, attributes: ['id', 'result'] });
  const unbooked = await listJobs('unbooked');
  const rows = lines.map((l) => {
    const q = quotes.find((x) => x.id === l.quoteId)!;
    const e = estimates.find((x) => x.id === l.estimateId)!;
    const r = revisions.find((x) => x.id === l.revisionId)!.result;
    const first = firstChosen.filter((x) => x.quoteId === q.id).sort((a, b) => a.position - b.position)[0];
    const extras = first?.id === l.id ? extraStages(agreedOf(q)?.extras ?? []) : [];
    return {
      quoteId: q.id,
      quoteLineId: l.id,
      quoteNumber: q.number,
      estimateId: e.id,
      estimateNumber: e.number,
      title: e.title,
      customer: { id: e.customerId, name: customers.find((c) => c.id === e.customerId)?.name ?? '' },
      acceptedAt: q.acceptedAt?.toISOString() ?? null,
      labourHours: round(r.totals.labourHours + extras.reduce((t, x) => t + x.stage.labourHours, 0)),
      sessions: r.calendar.sessions.length + extras.reduce((t, x) => t + x.sessions.length, 0),
      calendarDays: r.totals.calendarDays,
    };
  });
  rows.sort((a, b) => (a.acceptedAt ?? '').localeCompare(b.acceptedAt ?? '') || a.quoteId - b.quoteId);
  return { quotes: rows, jobs: unbooked };
}
