// Front-end weight: builds the client into a temporary folder and prints the gzipped size of the
// JavaScript the first route loads (the entry chunk and its static imports) against 250 kB.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { gzipSync } from 'node:zlib';
import type { BenchFigure } from './calibration';

const TARGET_KB = 250;

export function runBundleBench(): BenchFigure[] {
  const root = resolve(import.meta.dirname, '..');
  const out = mkdtempSync(join(tmpdir(), 'brimstock-bundle-'));
  try {
    const build = spawnSync(join(root, 'node_modules/.bin/vite'), ['build', '--logLevel', 'error', '--manifest'], { cwd: root, env: { ...process.env, BUILD_OUT_DIR: out }, encoding: 'utf8' });
    if (build.status !== 0) throw new Error(`vite build failed: ${build.stderr}`);
    const manifest = JSON.parse(readFileSync(join(out, '.vite', 'manifest.json'), 'utf8')) as Record<string, { file: string; imports?: string[]; isEntry?: boolean }>;
    const entryKey = Object.keys(manifest).find((k) => manifest[k].isEntry)!;
    const seen = new Set<string>();
    const walk = (key: string) => {
      if (seen.has(key)) return;
      seen.add(key);
      for (const i of manifest[key].imports ?? []) walk(i);
    };
    walk(entryKey);
    const gz = (file: string) => gzipSync(readFileSync(join(out, file))).length;
    const firstKb = [...seen].reduce((s, k) => s + gz(manifest[k].file), 0) / 1024;
    const allJs = readdirSync(join(out, 'assets')).filter((f) => f.endsWith('.js'));
    const largestKb = Math.max(...allJs.map((f) => gz(join('assets', f)))) / 1024;
    return [
      { name: `first route JavaScript (entry + static imports, ${seen.size} chunks, gzipped)`, value: firstKb, unit: 'kB', target: TARGET_KB, pass: 'below', ok: firstKb < TARGET_KB },
      { name: `largest lazy chunk of ${allJs.length} (gzipped)`, value: largestKb, unit: 'kB', target: TARGET_KB, pass: 'below', ok: largestKb < TARGET_KB },
    ];
  } finally {
    rmSync(out, { recursive: true, force: true });
  }
}
