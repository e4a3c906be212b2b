/**
 * Entry of `npm run bench`: runs the registered benchmark modules and prints their figures with
 * targets. Benchmarks print; they never fail on a slow machine (the exit code is non-zero only
 * when a module throws).
 *
 * Add a module: create tests/bench/<name>.ts exporting a BenchModule and list it in `modules`.
 * Run a subset: `npm run bench -- motion`.
 */
import { availableParallelism, loadavg } from 'node:os';
import type { BenchFigure, BenchModule } from './types';
import { motionBench } from './motion';

const modules: BenchModule[] = [motionBench];

function format(f: BenchFigure): string {
  const value = f.value.toFixed(f.digits ?? 2);
  const status = f.met === undefined ? '' : f.met ? 'met' : 'NOT met';
  return [f.label.padEnd(54), `${value} ${f.unit}`.padStart(20), (f.target ?? '').padStart(14), status.padStart(9)].join('  ');
}

async function main(): Promise<void> {
  const wanted = process.argv.slice(2);
  const selected = wanted.length ? modules.filter((m) => wanted.includes(m.name)) : modules;
  if (selected.length === 0) {
    console.error(`no benchmark module named ${wanted.join(', ')}; known: ${modules.map((m) => m.name).join(', ')}`);
    process.exitCode = 2;
    return;
  }
  const load = loadavg().map((l) => l.toFixed(2)).join(' ');
  console.log(`node ${process.version}, ${process.platform}/${process.arch}, ${availableParallelism()} cores, load average ${load}`);
  console.log('(wall-clock figures: other work on the machine slows them down; rerun on a quiet machine)');
  let met = 0;
  let targets = 0;
  for (const m of selected) {
    console.log(`\n== ${m.name}: ${m.title}`);
    console.log(['figure'.padEnd(54), 'value'.padStart(20), 'target'.padStart(14), 'status'.padStart(9)].join('  '));
    const figures = await m.run();
    for (const f of figures) {
      console.log(format(f));
      if (f.met !== undefined) {
        targets++;
        if (f.met) met++;
      }
    }
  }
  console.log(`\n${met} of ${targets} targets met (figures only; the benchmark never fails on speed)`);
}

main().catch((err: unknown) => {
  console.error(err);
  process.exitCode = 1;
});
