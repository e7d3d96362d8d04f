import { Router, type Response } from 'express';
import { actorOf, requireActor } from '../../lib/auth.js';
import { jobListQuerySchema, invoiceQuerySchema, reportScopeQuerySchema, type ReportShop } from '../../../shared/reports/schemas.js';
import { localDateIn } from '../../../shared/reports/business-days.js';
import * as reports from './service.js';
import * as exportsCsv from './exports.js';

export const reportsRouter = Router();

/** A file the browser saves: named after the report, the scope and the day, never cached. */
function sendCsv(res: Response, name: string, shops: ReportShop[], csv: string) {
  const scope = shops.length === 1 ? shops[0].code.toLowerCase() : 'all-shops';
  const day = localDateIn(new Date(), shops[0]?.timeZone ?? 'UTC');
  res.set({
    'Content-Type': 'text/csv; charset=utf-8',
    'Content-Disposition': `attachment; filename="benchrelay-${name}-${scope}-${day}.csv"`,
    'Cache-Control': 'no-store',
  });
  res.send(csv);
}

reportsRouter.get('/api/reports/dashboard', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  res.json(await reports.dashboard(actorOf(req), shop));
});

reportsRouter.get('/api/reports/overdue', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  res.json(await reports.overdueList(actorOf(req), shop));
});

reportsRouter.get('/api/reports/transfers', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  res.json(await reports.transferList(actorOf(req), shop));
});

reportsRouter.get('/api/reports/jobs', requireActor, async (req, res) => {
  res.json(await reports.jobList(actorOf(req), jobListQuerySchema.parse(req.query)));
});

// ---- CSV ----
// A file leaves the app and is passed on: every CSV needs `export` on Report (as the invoices always did),
// not only `read`.

reportsRouter.get('/api/reports/open-jobs.csv', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  const scope = await reports.reportScope(actorOf(req), shop, 'export');
  sendCsv(res, 'open-jobs', scope.shops, exportsCsv.openJobsCsv(scope.shops, await reports.openJobsByStage(scope)));
});

reportsRouter.get('/api/reports/overdue.csv', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  const list = await reports.overdueList(actorOf(req), shop, null, 'export');
  sendCsv(res, 'overdue', list.shops, exportsCsv.overdueCsv(list));
});

reportsRouter.get('/api/reports/transfers.csv', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  const list = await reports.transferList(actorOf(req), shop, null, 'export');
  sendCsv(res, 'transfers-in-flight', list.shops, exportsCsv.transfersCsv(list));
});

reportsRouter.get('/api/reports/bench-load.csv', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  const scope = await reports.reportScope(actorOf(req), shop, 'export');
  sendCsv(res, 'bench-load', scope.shops, exportsCsv.benchLoadCsv(scope.shops, await reports.benchLoad(scope)));
});

reportsRouter.get('/api/reports/turnaround.csv', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  const scope = await reports.reportScope(actorOf(req), shop, 'export');
  sendCsv(res, 'turnaround', scope.shops, exportsCsv.turnaroundCsv(scope.shops, await reports.turnaround(scope)));
});

reportsRouter.get('/api/reports/weekly-intake.csv', requireActor, async (req, res) => {
  const { shop } = reportScopeQuerySchema.parse(req.query);
  const scope = await reports.reportScope(actorOf(req), shop, 'export');
  sendCsv(res, 'weekly-intake', scope.shops, exportsCsv.weeklyIntakeCsv(scope.shops, await reports.weeklyIntake(scope)));
});

reportsRouter.get('/api/reports/jobs.csv', requireActor, async (req, res) => {
  const list = await reports.jobList(actorOf(req), jobListQuerySchema.parse(req.query), null, 'export');
  sendCsv(res, 'jobs', list.shops, exportsCsv.jobsCsv(list));
});

reportsRouter.get('/api/reports/invoices.csv', requireActor, async (req, res) => {
  const query = invoiceQuerySchema.parse(req.query);
  const { shops, invoices } = await reports.invoices(actorOf(req), query);
  sendCsv(res, `invoices-${query.from}-to-${query.to}`, shops, exportsCsv.invoicesCsv(invoices));
});
