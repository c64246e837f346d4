/**
 * The simulated scale: a balance's serial output, streamed over HTTP on 127.0.0.1, so the ticket screen's
 * scale control and the browser test read exactly what a balance would send.
 *
 *   GET  /stream  text lines ended by CR LF, one every intervalMs, for as long as the client reads
 *   GET  /pan     what is on the pan (JSON)
 *   PUT  /pan     put a load on it: { value, unit, layout, motion, load, raw, settleMs } (any subset)
 *   GET  /        a small page to do the same by hand in the demo
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { LAYOUTS, SimulatedBalance, type PanUpdate } from './balance.js';

export interface ScaleFakeOptions {
  /** 0 picks a free port. */
  port: number;
  /** How often the balance prints a line. Default 200 ms, about what a balance in continuous output does. */
  intervalMs?: number;
  log?: (line: string) => void;
}

export interface ScaleFake {
  url: string;
  balance: SimulatedBalance;
  close(): Promise<void>;
}

export const DEFAULT_SCALE_PORT = 12112;

const CORS = {
  'access-control-allow-origin': '*',
  'access-control-allow-methods': 'GET, PUT, OPTIONS',
  'access-control-allow-headers': 'content-type',
};

export async function createScaleFake(options: ScaleFakeOptions): Promise<ScaleFake> {
  const balance = new SimulatedBalance();
  const intervalMs = options.intervalMs ?? 200;
  const timers = new Set<NodeJS.Timeout>();

  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    if (req.method === 'OPTIONS') {
      res.writeHead(204, CORS).end();
    } else if (req.method === 'GET' && url.pathname === '/stream') {
      res.writeHead(200, { ...CORS, 'content-type': 'text/plain; charset=us-ascii', 'cache-control': 'no-store', 'x-content-type-options': 'nosniff' });
      const send = () => res.write(`${balance.line()}\r\n`);
      send();
      const timer = setInterval(send, intervalMs);
      timers.add(timer);
      const stop = () => {
        clearInterval(timer);
        timers.delete(timer);
      };
      req.on('close', stop);
      res.on('error', stop);
    } else if (url.pathname === '/pan' && req.method === 'GET') {
      json(res, 200, balance.state);
    } else if (url.pathname === '/pan' && (req.method === 'PUT' || req.method === 'POST')) {
      readBody(req).then(
        (body) => {
          try {
            balance.set(JSON.parse(body || '{}') as PanUpdate);
            options.log?.(`[fake-scale] pan: ${JSON.stringify(balance.state)}`);
            json(res, 200, balance.state);
          } catch (err) {
            json(res, 400, { error: (err as Error).message });
          }
        },
        (err: Error) => json(res, 413, { error: err.message }),
      );
    } else if (req.method === 'GET' && url.pathname === '/') {
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' }).end(PAGE);
    } else {
      json(res, 404, { error: 'not found' });
    }
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, '127.0.0.1', () => resolve());
  });
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    balance,
    close: () =>
      new Promise<void>((resolve) => {
        for (const t of timers) clearInterval(t);
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

function json(res: http.ServerResponse, status: number, body: unknown) {
  res.writeHead(status, { ...CORS, 'content-type': 'application/json' }).end(JSON.stringify(body));
}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    let body = '';
    req.on('data', (chunk: Buffer) => {
      body += chunk.toString('utf8');
      if (body.length > 4096) {
        reject(new Error('body too large'));
        req.destroy();
      }
    });
    req.on('end', () => resolve(body));
    req.on('error', reject);
  });
}

export function portFromEnv(env: NodeJS.ProcessEnv = process.env): number {
  const raw = env.FAKE_SCALE_PORT;
  if (raw === undefined || raw === '') return DEFAULT_SCALE_PORT;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 65535) throw new Error(`FAKE_SCALE_PORT must be a port number, got ${raw}`);
  return n;
}

const PAGE = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Cupel simulated scale</title>
<style>body{font:16px system-ui;margin:2rem;max-width:40rem}label{display:block;margin:.5rem 0}pre{background:#eee;padding:.5rem;font-size:1.4rem}</style></head>
<body><h1>Simulated scale</h1><p>A stand-in for the counter's balance, for tests and the demo. Connect it on a ticket with <b>Connect simulated scale</b>.</p>
<pre id="line">…</pre>
<form id="f"><label>Weight <input name="value" value="12.345" pattern="\\d+(\\.\\d+)?"></label>
<label>Unit <select name="unit"><option>g</option><option>ct</option><option>dwt</option><option>ozt</option><option>gr</option><option>oz</option></select></label>
<label>Layout <select name="layout">${LAYOUTS.map((l) => `<option>${l}</option>`).join('')}</select></label>
<label>Load <select name="load"><option>in-range</option><option>overload</option><option>underload</option></select></label>
<label><input type="checkbox" name="motion"> keeps moving (never settles)</label>
<button>Put on the pan</button></form>
<script>
const f=document.getElementById('f');
f.onsubmit=async(e)=>{e.preventDefault();const d=new FormData(f);
await fetch('/pan',{method:'PUT',headers:{'content-type':'application/json'},body:JSON.stringify({value:d.get('value'),unit:d.get('unit'),layout:d.get('layout'),load:d.get('load'),motion:d.get('motion')==='on',raw:null})});};
(async()=>{const r=(await fetch('/stream')).body.getReader();const t=new TextDecoder();let b='';
for(;;){const {value,done}=await r.read();if(done)break;b+=t.decode(value);const parts=b.split('\\r\\n');b=parts.pop();if(parts.length)document.getElementById('line').textContent=parts.at(-1);}})();
</script></body></html>`;
