import { createApp } from './app.js';

const port = Number.parseInt(process.env.PORT ?? '3000', 10);
const host = process.env.HOST ?? '127.0.0.1';

const app = createApp();
const server = app.listen(port, host, () => {
  console.log(`Cell-voltage calculator listening on http://${host}:${port} (example study loaded)`);
});

function shutdown(signal: string): void {
  console.log(`${signal} received: closing the server`);
  server.close(() => process.exit(0));
  // Give open keep-alive connections a moment, then exit regardless.
  setTimeout(() => process.exit(0), 5000).unref();
  server.closeIdleConnections?.();
}
process.on('SIGTERM', () => shutdown('SIGTERM'));
process.on('SIGINT', () => shutdown('SIGINT'));
