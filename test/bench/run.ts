/**
 * `npm run bench`: runs the detection and headroom-report benchmarks
 * (test/bench/detection.bench.ts, report.bench.ts, imported dynamically so a
 * missing one is noted, not fatal) and the stamping benchmark, prints a table
 * and writes docs/benchmarks.md.
 */
import { cpus, loadavg } from 'node:os';
import { writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { BenchSection } from './api';
import { benchStamp } from './stamp.bench';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

/**
 * Other engineers' benchmarks, imported dynamically (variable specifiers: a
 * missing file must neither stop type-checking nor the run; it is noted).
 */
const OPTIONAL: { specifier: string; fn: string; title: string }[] = [
  { specifier: './detection.bench.ts', fn: 'benchDetection', title: 'Kick detection' },
  { specifier: './report.bench.ts', fn: 'benchReport', title: 'Headroom report' },
];

async function optionalSection(o: (typeof OPTIONAL)[number]): Promise<BenchSection> {
  try {
    const mod = (await import(o.specifier)) as Record<string, unknown>;
    const run = mod[o.fn];
    if (typeof run !== 'function') throw new Error(`test/bench/${o.specifier.slice(2)} has no ${o.fn}()`);
    return await (run as () => Promise<BenchSection>)();
  } catch (e) {
    const err = e as NodeJS.ErrnoException;
    const why = err.code === 'ERR_MODULE_NOT_FOUND' ? `test/bench/${o.specifier.slice(2)} is missing` : `failed: ${String(err.message).split('\n')[0]}`;
    return { title: o.title, rows: [{ name: `${o.fn}()`, value: 'not run', note: why }] };
  }
}

function table(section: BenchSection): string {
  const lines = [`## ${section.title}`, '', '| measure | value | note |', '|---|---:|---|'];
  for (const r of section.rows) lines.push(`| ${r.name} | ${r.value} | ${r.note ?? ''} |`);
  return lines.join('\n');
}

const started = new Date();
const loadBefore = loadavg()[0];
const sections: BenchSection[] = [];
for (const o of OPTIONAL) sections.push(await optionalSection(o));
sections.push(await benchStamp());

const cpu = cpus();
const machine = `${cpu[0]?.model ?? 'unknown CPU'}, ${cpu.length} cores, Node ${process.version}`;
const load = `1-minute load average ${loadBefore.toFixed(2)} at the start, ${loadavg()[0].toFixed(2)} at the end (other work on the machine inflates wall times; CPU times are this process's own)`;
const md = [
  '# Benchmarks',
  '',
  'Written by `npm run bench` (test/bench/run.ts); do not edit by hand.',
  '',
  `- Date: ${started.toISOString()}`,
  `- Machine: ${machine}`,
  `- Load: ${load}`,
  '',
  ...sections.map(table).flatMap((t) => [t, '']),
].join('\n');

for (const s of sections) {
  console.log(`\n${s.title}`);
  const width = Math.max(...s.rows.map((r) => r.name.length));
  for (const r of s.rows) console.log(`  ${r.name.padEnd(width)}  ${r.value.padStart(12)}  ${r.note ?? ''}`);
}
writeFileSync(join(root, 'docs/benchmarks.md'), md);
console.log(`\n${machine}\n${load}\nwrote docs/benchmarks.md`);
