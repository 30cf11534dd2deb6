import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { CapacityReport, MoneyReport, QuotesReport } from '@shared/schemas/reports';
import type { EstimateAccuracy } from '@shared/schemas/stock';
import { api, toQuery } from '@/lib/api';

export interface PeriodParams {
  from: string;
  to: string;
}

export const reportKeys = {
  all: ['reports'] as const,
  quotes: (p: PeriodParams) => ['reports', 'quotes', p.from, p.to] as const,
  capacity: (p: PeriodParams) => ['reports', 'capacity', p.from, p.to] as const,
  accuracy: (p: PeriodParams) => ['reports', 'estimate-accuracy', p.from, p.to] as const,
  money: (p: PeriodParams) => ['reports', 'money', p.from, p.to] as const,
};

/** Where each report's CSV is downloaded from, for the period shown. */
export const csvHref = (report: 'quotes' | 'capacity' | 'estimate-accuracy' | 'money' | 'accounting', p: PeriodParams) => `/api/reports/${report}.csv${toQuery({ from: p.from, to: p.to })}`;

export const quotesReportOptions = (p: PeriodParams) =>
  queryOptions({ queryKey: reportKeys.quotes(p), queryFn: ({ signal }) => api<QuotesReport>(`/api/reports/quotes${toQuery({ ...p })}`, { signal }), placeholderData: keepPreviousData });
export const capacityReportOptions = (p: PeriodParams) =>
  queryOptions({ queryKey: reportKeys.capacity(p), queryFn: ({ signal }) => api<CapacityReport>(`/api/reports/capacity${toQuery({ ...p })}`, { signal }), placeholderData: keepPreviousData });
export const accuracyReportOptions = (p: PeriodParams) =>
  queryOptions({ queryKey: reportKeys.accuracy(p), queryFn: ({ signal }) => api<EstimateAccuracy>(`/api/reports/estimate-accuracy${toQuery({ ...p })}`, { signal }), placeholderData: keepPreviousData });
export const moneyReportOptions = (p: PeriodParams) =>
  queryOptions({ queryKey: reportKeys.money(p), queryFn: ({ signal }) => api<MoneyReport>(`/api/reports/money${toQuery({ ...p })}`, { signal }), placeholderData: keepPreviousData });

export const useQuotesReport = (p: PeriodParams, enabled: boolean) => useQuery({ ...quotesReportOptions(p), enabled });
export const useCapacityReport = (p: PeriodParams, enabled: boolean) => useQuery({ ...capacityReportOptions(p), enabled });
export const useAccuracyReport = (p: PeriodParams, enabled: boolean) => useQuery({ ...accuracyReportOptions(p), enabled });
export const useMoneyReport = (p: PeriodParams, enabled: boolean) => useQuery({ ...moneyReportOptions(p), enabled });
