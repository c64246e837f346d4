/**
 * Local S3-compatible storage for Cupel's photos: s3rver, bound to loopback, keeping its objects
 * under $FAKE_DATA_DIR/s3. The app talks to it with the ordinary S3 SDK, path-style.
 */
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import S3rver from 's3rver';

function required(name: string): string {
  const value = process.env[name];
  if (!value) {
    console.error(`[fake-s3] ${name} is not set (the start script exports it)`);
    process.exit(1);
  }
  return value;
}

const port = Number(required('S3_PORT'));
if (!Number.isInteger(port) || port <= 0 || port > 65535) {
  console.error(`[fake-s3] S3_PORT must be a port number, got ${process.env.S3_PORT}`);
  process.exit(1);
}
const bucket = required('S3_BUCKET');
const directory = path.join(required('FAKE_DATA_DIR'), 's3');
mkdirSync(directory, { recursive: true });

const server = new S3rver({
  address: '127.0.0.1',
  port,
  directory,
  silent: true,
  // Path-style addressing only: with vhost buckets on, a Host header could select a bucket.
  vhostBuckets: false,
  configureBuckets: [{ name: bucket }],
});

let stopping = false;
async function stop(signal: NodeJS.Signals) {
  if (stopping) return;
  stopping = true;
  try {
    await server.close();
    console.log(`[fake-s3] stopped on ${signal}`);
    process.exit(0);
  } catch (err) {
    console.error('[fake-s3] could not stop cleanly', err);
    process.exit(1);
  }
}
process.on('SIGTERM', stop);
process.on('SIGINT', stop);

server.run().then(
  (address) => console.log(`[fake-s3] ready on http://${address.address}:${address.port}, bucket ${bucket}, data in ${directory}`),
  (err: unknown) => {
    console.error('[fake-s3] could not start', err);
    process.exit(1);
  },
);
