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
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    parseDocument(text);
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  // Wall time counts time other processes take from this one; process CPU time is steadier on a busy machine.
  const q = (xs: number[], p: number): string =>
    [...xs].sort((a, b) => a - b)[Math.floor(p * (xs.length - 1))]!.toFixed(2);
  console.log(
    `${label}: ${lines} lines, ${diagnostics} diagnostics, ${runs} runs\n` +
      `  wall ms: median ${q(wall, 0.5)} (min ${q(wall, 0)}, p90 ${q(wall, 0.9)})\n` +
      `  CPU ms:  median ${q(cpu, 0.5)} (min ${q(cpu, 0)}, p90 ${q(cpu, 0.9)})`,
  );
}

measure('examples copied into one file', manyDesigns(2000));
measure('one long design', oneLongDesign(2000));
