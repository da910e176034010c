// Parse time of a 2,000-line design file: many designs copied from the examples, and one design of 2,000
// lines (a long element network with parameters and corners). Prints the median and spread of repeated runs.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseDocument } from '../shared/src/language';

function manyDesigns(lines: number): string {
  const dir = 'examples';
  const sources = readdirSync(dir)
    .filter((f) => f.endsWith('.ampnote'))
    .sort()
    .map((f) => readFileSync(join(dir, f), 'utf8'));
  const out: string[] = [];
  // Whole designs only, so the file stays valid; it ends within one design's length of `lines`.
  for (let copy = 0; out.length < lines; copy++) {
    const text = sources[copy % sources.length]!.replace(
      /^design (\w+)/m,
      (_, name) => `design ${name}_${copy}`,
    );
    out.push(...text.trimEnd().split('\n'), '');
  }
  return out.join('\n');
}

function oneLongDesign(lines: number): string {
  const out = ['design long_ladder', '  param g = 100 uS', '  param r = 10 kohm', '  param c = 1 pF'];
  const sections = Math.floor((lines - 10) / 4);
  out.push(`  node ${Array.from({ length: sections }, (_, i) => `n${i}`).join(', ')}`);
  out.push('  element gm in -> n0 = g inverting');
  for (let i = 0; i < sections; i++) {
    const next = i + 1 < sections ? `n${i + 1}` : 'gnd';
    out.push(`  element res n${i} ${next} = r * (1 + ${i % 7} / 10)   # section ${i}`);
    out.push(`  element cap n${i} gnd = c / ${1 + (i % 5)}`);
    out.push(`  element res n${i} gnd = 100 * r`);
    out.push(`  # spacer ${i}`);
  }
  out.push(`  output n${sections - 1}`);
  out.push('  require dcgain >= 0 dB');
  out.push('  corner low g = 80 uS, r = 12 kohm');
  out.push('  corner high g = 120 uS, c = 0.8 pF');
  out.push('end');
  return out.join('\n');
}

function measure(label: string, text: string, runs = 41): void {
  const lines = text.split('\n').length;
  let diagnostics = 0;
  for (let i = 0; i < 5; i++) diagnostics = parseDocument(text).diagnostics.length; // warm-up
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    parseDocument(text);
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const q = (p: number): string => times[Math.floor(p * (times.length - 1))]!.toFixed(2);
  console.log(
    `${label}: ${lines} lines, median ${q(0.5)} ms (min ${q(0)}, p90 ${q(0.9)}, max ${q(1)}) over ${runs} runs; ${diagnostics} diagnostics`,
  );
}

measure('examples copied into one file', manyDesigns(2000));
measure('one long design', oneLongDesign(2000));
