/**
 * `npm start`: serve the page and the API on 127.0.0.1:8080 (HOST and PORT override;
 * BEATFORCE_CORS_ORIGINS sets the CORS allow-list; BEATFORCE_ANSWER_CACHE_MB the answer store's
 * size, 0 for none; BEATFORCE_LOG=1 logs every request).
 * Logs one line with the address; SIGINT or SIGTERM closes the server and exits.
 */
import { scenarioParser } from '../src/scenario.js';
import { VERSION } from '../src/version.js';
import { buildApp } from './app.js';
import { parseOrigins } from './cors.js';

const fail = (message: string): never => {
  process.stderr.write(`beatforce: ${message}\n`);
  process.exit(1);
};

const host = process.env.HOST && process.env.HOST.trim() !== '' ? process.env.HOST.trim() : '127.0.0.1';
const portText = process.env.PORT && process.env.PORT.trim() !== '' ? process.env.PORT.trim() : '8080';
const port = /^\d{1,5}$/.test(portText) && Number(portText) <= 65535 ? Number(portText) : fail(`PORT '${portText}' is not a port; expected a whole number from 0 to 65535`);
let corsOrigins: string[] = [];
try {
  corsOrigins = parseOrigins(process.env.BEATFORCE_CORS_ORIGINS);
} catch (e) {
  fail(`BEATFORCE_CORS_ORIGINS: ${(e as Error).message}`);
}

const cacheText = process.env.BEATFORCE_ANSWER_CACHE_MB?.trim() ?? '';
const cacheMb = cacheText === '' ? undefined : /^\d+(\.\d+)?$/.test(cacheText) && Number(cacheText) <= 65536 ? Number(cacheText) : fail(`BEATFORCE_ANSWER_CACHE_MB '${cacheText}' is not a size; expected megabytes from 0 (no answer store) to 65536`);

const app = buildApp({
  corsOrigins,
  ...(cacheMb === undefined ? {} : { answerCache: cacheMb === 0 ? false : { maxBytes: Math.round(cacheMb * 1024 * 1024) } }),
  logger: process.env.BEATFORCE_LOG === '1' ? { level: 'info' } : false,
});
// A service parses many documents: compile the scenario parser (about 60 ms) before the first request.
scenarioParser();

let closing = false;
const shutdown = (signal: string) => {
  if (closing) return;
  closing = true;
  app.close().then(
    () => {
      process.stdout.write(`beatforce: ${signal}, closed\n`);
      process.exit(0);
    },
    (e: unknown) => fail(`closing: ${String(e)}`),
  );
};
process.on('SIGINT', () => shutdown('SIGINT'));
process.on('SIGTERM', () => shutdown('SIGTERM'));

try {
  await app.listen({ host, port });
} catch (e) {
  fail(`cannot listen on ${host}:${port}: ${(e as NodeJS.ErrnoException).code ?? String(e)}`);
}
const address = app.server.address();
const where = typeof address === 'object' && address ? `http://${address.family === 'IPv6' ? `[${address.address}]` : address.address}:${address.port}` : String(address);
process.stdout.write(`beatforce ${VERSION} listening on ${where} (page at /, API under /api/v1/)${corsOrigins.length > 0 ? `, CORS for ${corsOrigins.join(' ')}` : ''}\n`);
