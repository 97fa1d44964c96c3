/**
 * `npm run bench`: runs the detection benchmark (E1's, test/bench/detection.bench.ts,
 * imported dynamically so a missing one is noted, not fatal) and the stamping
 * benchmark, prints a table and writes docs/benchmarks.md.
 */
import { cpus, loadavg } from 'node:os';
import { writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { benchStamp, type BenchSection } from './stamp.bench';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

async function detectionSection(): Promise<BenchSection> {
  try {
    // A variable specifier: the file is E1's and may not exist yet, which must not stop type-checking.
    const specifier = './detection.bench.ts';
    const mod = (await import(specifier)) as { benchDetection?: () => Promise<BenchSection> };
    if (typeof mod.benchDetection !== 'function') throw new Error('test/bench/detection.bench.ts has no benchDetection()');
    return await mod.benchDetection();
  } catch (e) {
    const err = e as NodeJS.ErrnoException;
    const why = err.code === 'ERR_MODULE_NOT_FOUND' ? 'test/bench/detection.bench.ts is missing' : `failed: ${String(err.message).split('\n')[0]}`;
    return { title: 'Kick detection', rows: [{ name: 'detection benchmark', value: 'not run', note: why }] };
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
sections.push(await detectionSection());
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
