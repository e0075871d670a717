/**
 * The load generator of `npm run bench:api`, run in its own worker thread so that sending and
 * parsing 5,000 requests does not queue behind the server on the same event loop (as a separate
 * load tool would). Plain JavaScript with node:http only; workerData names the target, and the
 * answer posted back is { latencies, failures, seconds }.
 */
import http from 'node:http';
import { parentPort, workerData } from 'node:worker_threads';

const { port, path, cookie, requests, clients, maxLoadMs } = workerData;
const agent = new http.Agent({ keepAlive: true, maxSockets: clients });

function get() {
  return new Promise((resolve, reject) => {
    const req = http.request({ host: '127.0.0.1', port, method: 'GET', path, agent, headers: { accept: 'application/json', cookie } }, (res) => {
      res.on('data', () => {});
      res.on('end', () => resolve(res.statusCode ?? 0));
    });
    req.setTimeout(10_000, () => req.destroy(new Error('request timed out after 10 s')));
    req.on('error', reject);
    req.end();
  });
}

// Warm-up (JIT, connection pool, keep-alive sockets), not counted.
await Promise.all(Array.from({ length: clients }, get));

const latencies = [];
const failures = {};
let next = 0;
const deadline = Date.now() + maxLoadMs;
const began = performance.now();
async function client() {
  while (next < requests && Date.now() < deadline) {
    next += 1;
    const t0 = performance.now();
    try {
      const status = await get();
      latencies.push(performance.now() - t0);
      if (status !== 200) failures[`HTTP ${status}`] = (failures[`HTTP ${status}`] ?? 0) + 1;
    } catch (err) {
      const key = err instanceof Error ? err.message : String(err);
      failures[key] = (failures[key] ?? 0) + 1;
    }
  }
}
await Promise.all(Array.from({ length: clients }, client));
const seconds = (performance.now() - began) / 1000;
agent.destroy();
parentPort.postMessage({ latencies, failures, seconds });
