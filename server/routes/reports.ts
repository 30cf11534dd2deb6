import { PeriodSchema } from '@shared/schemas/reports';
import { secureRouter, type RouteInfo } from '../http/guard';
import { parseOr400 } from '../http/problem';
import { estimateAccuracy } from '../services/costing/job-costing';
import { capacityReport } from '../services/reports/capacity-report';
import { accountingCsv, accuracyCsv, capacityCsv, moneyCsv, quotesCsv } from '../services/reports/exports';
import { accountingLines, moneyReport } from '../services/reports/money-report';
import { quotesReport } from '../services/reports/quotes-report';
import { csvResponse } from './stock';

/** The business's figures: the owner only. */

/** The owner's reports, each for a chosen period, as JSON and as CSV safe to open in a spreadsheet. */
export function reportRoutes(table: RouteInfo[]) {
  const r = secureRouter('/api/reports', table);
  r.get('/quotes', 'readReports', async (req, res) => {
    res.json(await quotesReport(parseOr400(PeriodSchema, req.query)));
  });
  r.get('/quotes.csv', 'readReports', async (req, res) => {
    const p = parseOr400(PeriodSchema, req.query);
    csvResponse(res, `quotes-${p.from}-${p.to}`, quotesCsv(await quotesReport(p)));
  });
  r.get('/capacity', 'readReports', async (req, res) => {
    res.json(await capacityReport(parseOr400(PeriodSchema, req.query)));
  });
  r.get('/capacity.csv', 'readReports', async (req, res) => {
    const p = parseOr400(PeriodSchema, req.query);
    csvResponse(res, `capacity-${p.from}-${p.to}`, capacityCsv(await capacityReport(p)));
  });
  r.get('/estimate-accuracy', 'readReports', async (req, res) => {
    res.json(await estimateAccuracy(parseOr400(PeriodSchema, req.query)));
  });
  r.get('/estimate-accuracy.csv', 'readReports', async (req, res) => {
    const p = parseOr400(PeriodSchema, req.query);
    csvResponse(res, `estimate-accuracy-${p.from}-${p.to}`, accuracyCsv(await estimateAccuracy(p)));
  });
  r.get('/money', 'readReports', async (req, res) => {
    res.json(await moneyReport(parseOr400(PeriodSchema, req.query)));
  });
  r.get('/money.csv', 'readReports', async (req, res) => {
    const p = parseOr400(PeriodSchema, req.query);
    csvResponse(res, `money-${p.from}-${p.to}`, moneyCsv(await moneyReport(p)));
  });
  /** Invoices, credit notes, payments and refunds of the period, for the bookkeeping. */
  r.get('/accounting.csv', 'readReports', async (req, res) => {
    const p = parseOr400(PeriodSchema, req.query);
    csvResponse(res, `accounting-${p.from}-${p.to}`, accountingCsv(await accountingLines(p)));
  });

  return [r.router];
}
