import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import { notFound } from '../../lib/errors.js';
import {
  createCustomerSchema,
  customerSearchSchema,
  heavyCaseSchema,
  importBatchSchema,
  instrumentSearchSchema,
  intakeSchema,
  serialCheckSchema,
  timelineQuerySchema,
} from '../../../shared/schemas/registry.js';
import {
  checkSerial,
  createCustomer,
  exportInstrumentsCsv,
  getInstrument,
  getTimeline,
  importInstruments,
  intake,
  searchInstruments,
  searchCustomers,
  setHeavyCase,
} from './service.js';

export const registryRouter = Router();

/** An id in the path that is not a uuid names nothing, so it is "not found" rather than a database error. */
const instrumentId = (value: unknown) => {
  const parsed = z.uuid().safeParse(value);
  if (!parsed.success) throw notFound('That instrument');
  return parsed.data;
};

registryRouter.get('/api/instruments/search', requireActor, async (req, res) => {
  const input = instrumentSearchSchema.parse(req.query);
  res.json({ results: await searchInstruments(actorOf(req), input) });
});

registryRouter.get('/api/instruments/export.csv', requireActor, async (req, res) => {
  const input = instrumentSearchSchema.parse(req.query);
  const csv = await exportInstrumentsCsv(actorOf(req), input);
  const stamp = new Date().toISOString().slice(0, 10);
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="instruments-${stamp}.csv"`);
  // a byte-order mark tells spreadsheet programs the file is UTF-8 (makers' names carry accents)
  res.send(`\uFEFF${csv}\r\n`);
});

registryRouter.get('/api/instruments/serial-check', requireActor, async (req, res) => {
  const input = serialCheckSchema.parse(req.query);
  res.json(await checkSerial(actorOf(req), input));
});

registryRouter.post('/api/instruments/import', requireActor, async (req, res) => {
  const batch = importBatchSchema.parse(req.body);
  res.json(await importInstruments(actorOf(req), batch));
});

registryRouter.get('/api/instruments/:id', requireActor, async (req, res) => {
  res.json(await getInstrument(actorOf(req), instrumentId(req.params.id)));
});

registryRouter.patch('/api/instruments/:id/heavy-case', requireActor, async (req, res) => {
  const { heavyCase } = heavyCaseSchema.parse(req.body);
  res.json(await setHeavyCase(actorOf(req), instrumentId(req.params.id), heavyCase));
});

registryRouter.get('/api/instruments/:id/timeline', requireActor, async (req, res) => {
  const { kinds } = timelineQuerySchema.parse(req.query);
  res.json({ items: await getTimeline(actorOf(req), instrumentId(req.params.id), kinds) });
});

registryRouter.get('/api/customers', requireActor, async (req, res) => {
  const input = customerSearchSchema.parse(req.query);
  res.json({ customers: await searchCustomers(actorOf(req), input) });
});

registryRouter.post('/api/customers', requireActor, async (req, res) => {
  const input = createCustomerSchema.parse(req.body);
  res.status(201).json({ customer: await createCustomer(actorOf(req), input) });
});

registryRouter.post('/api/intake', requireActor, async (req, res) => {
  const input = intakeSchema.parse(req.body);
  const result = await intake(actorOf(req), input);
  res.status(result.replayed ? 200 : 201).json(result);
});
