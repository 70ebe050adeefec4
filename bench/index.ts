// `npm run bench [name…]`: runs the benchmarks and prints each figure beside its target.
// Figures are measured here, never asserted by timed unit tests.
import { runCalibrationBench, type BenchFigure } from './calibration';
import { runBundleBench } from './bundle';
import { runBoardBench, runBoardClusterBench } from './board';
import { runIngestBench } from './ingest';

const BENCHES: Record<string, () => BenchFigure[] | Promise<BenchFigure[]>> = {
  calibration: runCalibrationBench,
  bundle: runBundleBench,
  board: runBoardBench,
  'board-cluster': runBoardClusterBench,
  ingest: runIngestBench,
};

function show(f: BenchFigure): string {
  const digits = f.unit === 'ms' ? 3 : f.unit === 'kB' ? 1 : 0;
  const fmt = (v: number) => v.toLocaleString('en-US', { maximumFractionDigits: digits, minimumFractionDigits: digits });
  return `  ${f.ok ? 'PASS' : 'MISS'}  ${f.name}: ${fmt(f.value)} ${f.unit} (target ${f.pass === 'below' ? '<' : '>'} ${fmt(f.target)} ${f.unit})`;
}

const asked = process.argv.slice(2);
const unknown = asked.filter((a) => !(a in BENCHES));
if (unknown.length) {
  console.error(`Unknown bench ${unknown.join(', ')}; choose from ${Object.keys(BENCHES).join(', ')}`);
  process.exit(2);
}
console.log(`Brimstock benchmarks — ${new Date().toISOString()} — Node ${process.version}`);
let missed = 0;
for (const name of asked.length ? asked : Object.keys(BENCHES)) {
  console.log(`\n${name}`);
  const figures = await BENCHES[name]();
  for (const f of figures) console.log(show(f));
  missed += figures.filter((f) => !f.ok).length;
}
console.log(`\n${missed === 0 ? 'every figure met its target' : `${missed} figure(s) missed the target`}`);
