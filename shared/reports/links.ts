import type { JobStage, InstrumentFamily } from '../domain.js';
import type { TurnaroundWindow } from './schemas.js';

/**
 * Where each figure leads: the list behind it in the client, and its CSV on the server. The client's
 * report pages carry the report's shop in `scope` (the app's own `shop` parameter is the shop the
 * person is working in, which the reports must not overwrite); the API takes it as `shop`.
 */

export interface JobListFilters {
  shop?: string;
  stage?: JobStage | 'open' | 'bench';
  skill?: string;
  family?: InstrumentFamily;
  readyWithin?: TurnaroundWindow;
  week?: string;
}

function query(params: Record<string, string | number | undefined>): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== '') q.set(k, String(v));
  const s = q.toString();
  return s ? `?${s}` : '';
}

export const reportLinks = {
  dashboard: (shop?: string) => `/dashboard${query({ scope: shop })}`,
  reports: (shop?: string) => `/reports${query({ scope: shop })}`,
  overdue: (shop?: string) => `/reports/overdue${query({ scope: shop })}`,
  transfers: (shop?: string) => `/reports/transfers${query({ scope: shop })}`,
  jobs: ({ shop, ...rest }: JobListFilters) => `/reports/jobs${query({ scope: shop, ...rest })}`,
  /** the job's own page on the job board */
  job: (id: string) => `/jobs/${encodeURIComponent(id)}`,
};

export type CsvReportName = 'open-jobs' | 'overdue' | 'transfers' | 'bench-load' | 'turnaround' | 'weekly-intake' | 'jobs';

export const csvLinks = {
  report: (name: CsvReportName, shop?: string, extra: Record<string, string | number | undefined> = {}) =>
    `/api/reports/${name}.csv${query({ shop, ...extra })}`,
  jobs: ({ shop, ...rest }: JobListFilters) => `/api/reports/jobs.csv${query({ shop, ...rest })}`,
  invoices: (from: string, to: string, shop?: string) => `/api/reports/invoices.csv${query({ shop, from, to })}`,
};
