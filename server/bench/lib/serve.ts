/**
 * The app in a process of its own, for benchmarks that measure the server's CPU: the parent forks it,
 * reads the port from the first message, and asks for `process.cpuUsage()` before and after a load.
 */
import './env.js';
import type { AddressInfo } from 'node:net';
import { buildApp } from '../../app.js';

const app = buildApp();
const server = app.listen(0, '127.0.0.1', () => {
  process.send?.({ kind: 'listening', port: (server.address() as AddressInfo).port });
});
server.keepAliveTimeout = 60_000;

process.on('message', (msg: { kind: string }) => {
  if (msg.kind === 'cpu') process.send?.({ kind: 'cpu', usage: process.cpuUsage(), memory: process.memoryUsage().rss });
  if (msg.kind === 'stop') server.close(() => process.exit(0));
});
process.on('disconnect', () => process.exit(0));
