/**
 * The simulated scale, run in the foreground by the start script:
 *   node_modules/.bin/tsx fakes/scale/server.ts
 * Its port comes from FAKE_SCALE_PORT (see README.md).
 */
import { createScaleFake, portFromEnv, type ScaleFake } from './app.js';

let fake: ScaleFake;
try {
  fake = await createScaleFake({ port: portFromEnv(), log: (line) => console.log(line) });
  console.log(`[fake-scale] simulated scale streaming on ${fake.url}/stream (controls at ${fake.url}/)`);
} catch (err) {
  console.error('[fake-scale] could not start:', (err as Error).message);
  process.exit(1);
}

let stopping = false;
async function stop(signal: NodeJS.Signals) {
  if (stopping) return;
  stopping = true;
  const force = setTimeout(() => process.exit(1), 3_000);
  force.unref();
  await fake.close();
  console.log(`[fake-scale] stopped on ${signal}`);
  process.exit(0);
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
