import { createReadStream } from 'node:fs';
import Papa from 'papaparse';
import { csvParseOptions } from '@shared/imports';
const path = '/tmp/imp/big.csv';
const delay = Number(process.argv[2] ?? 1);

async function* recordBatches(file: string, options: ReturnType<typeof csvParseOptions>, size: number): AsyncGenerator<string[][]> {
  const input = createReadStream(file, { encoding: 'utf8', highWaterMark: 256 * 1024 });
  let batch: string[][] = [];
  let handle: Papa.Parser | null = null;
  let held = false;
  let done = false;
  let failure: unknown = null;
  let wake: (() => void) | null = null;
  const signal = () => { const w = wake; wake = null; w?.(); };
  Papa.parse(input as never, {
    ...options,
    step: (r: Papa.ParseStepResult<string[]>, p: Papa.Parser) => {
      handle = p;
      batch.push(r.data);
      if (batch.length >= size) { held = true; p.pause(); input.pause(); signal(); }
    },
    complete: () => { done = true; signal(); },
    error: (e: unknown) => { failure = e; done = true; signal(); },
  } as never);
  try {
    for (;;) {
      if (failure) throw failure;
      if (batch.length >= size || (done && batch.length)) {
        const out = batch; batch = [];
        yield out;
        if (held) { held = false; handle!.resume(); if (!held) input.resume(); }
        continue;
      }
      if (done) return;
      await new Promise<void>((r) => (wake = r));
    }
  } finally { if (!done) handle?.abort(); input.destroy(); }
}

const start = performance.now();
let n = 0, maxRss = 0, last: string[] = [];
for await (const b of recordBatches(path, csvParseOptions(','), 2500)) { n += b.length; last = b[b.length - 1]; await new Promise((r) => setTimeout(r, delay)); maxRss = Math.max(maxRss, process.memoryUsage().rss); }
console.log({ n, last, ms: performance.now() - start, maxRssMB: maxRss / 1e6 });
