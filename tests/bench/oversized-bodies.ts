/**
 * Oversized bodies before sign-in: six 300 MB forms at once to /login and /forgot-password (three
 * sent chunked, three with their Content-Length), as the hardening review sent them. Figures: each
 * answer's status and time, and the app server's resident memory before, at its peak during the
 * flood (sampled every 50 ms from /proc) and after. Goal: every answer 413, and the server's
 * memory within 100 MB of before. The reference is the issue's own measurement of the unbounded
 * reader on this machine: 4.8 GB at the peak, four 500s, 2–3 GB kept afterwards.
 * Run by `npm run bench -- --only bodies` against the production build; needs BENCH_BASE_URL and BENCH_APP_PID.
 */
import { readFileSync } from "node:fs";
import { request } from "node:http";
import { loadavg } from "node:os";
import { z } from "zod";

const environment = z.object({ BENCH_BASE_URL: z.string().url(), BENCH_APP_PID: z.coerce.number().int().positive() }).parse(process.env);
const BODY_BYTES = 300 * 1024 * 1024;
const CHUNK = Buffer.alloc(64 * 1024, 0x61);

const rssMegabytes = () => Number(/^VmRSS:\s+(\d+) kB/m.exec(readFileSync(`/proc/${environment.BENCH_APP_PID}/status`, "utf8"))![1]) / 1024;

/** Sends one body; resolves with the answer's status (or the socket error's code) and the seconds to it. */
function post(path: string, declared: boolean): Promise<{ status: string; seconds: number }> {
  const started = performance.now();
  const headers: Record<string, string> = { "Content-Type": "application/x-www-form-urlencoded", Origin: environment.BENCH_BASE_URL };
  if (declared) headers["Content-Length"] = String(BODY_BYTES);
  return new Promise((resolve) => {
    const done = (status: string) => resolve({ status, seconds: (performance.now() - started) / 1000 });
    const sending = request(new URL(path, environment.BENCH_BASE_URL), { method: "POST", headers }, (response) => {
      response.resume();
      done(String(response.statusCode));
    });
    sending.on("error", (error: NodeJS.ErrnoException) => done(error.code ?? "error"));
    let sent = 0;
    const write = () => {
      while (sent < BODY_BYTES) {
        sent += CHUNK.length;
        if (!sending.write(CHUNK)) return void sending.once("drain", write);
      }
      sending.end();
    };
    write();
  });
}

const before = rssMegabytes();
let peak = before;
const sampler = setInterval(() => (peak = Math.max(peak, rssMegabytes())), 50);
const load = loadavg().map((value) => value.toFixed(2)).join(" ");
const answers = await Promise.all([0, 1, 2, 3, 4, 5].map((index) => post(index % 2 === 0 ? "/login" : "/forgot-password", index >= 3)));
await new Promise((resolve) => setTimeout(resolve, 2_000));
clearInterval(sampler);
const after = rssMegabytes();
const all413 = answers.every((answer) => answer.status === "413");
console.log(`oversized bodies: 6 × 300 MB to /login and /forgot-password (3 chunked, 3 declared), load average ${load}`);
console.log(`  answers: ${answers.map((answer) => `${answer.status} in ${answer.seconds.toFixed(1)} s`).join(", ")}`);
console.log(`  app RSS: ${before.toFixed(0)} MB before, ${peak.toFixed(0)} MB at the peak, ${after.toFixed(0)} MB after (goal: within 100 MB of before; reference before the bounded reader: 4.8 GB peak, 2–3 GB kept)`);
console.log(`  goal ${all413 && peak - before <= 100 ? "met" : "NOT met"}`);
process.exit(all413 && peak - before <= 100 ? 0 : 1);
