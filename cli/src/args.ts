// Command-line parsing: argv → one typed command, or a usage error to print. No I/O here.

export type OutputFormat = 'text' | 'json' | 'sarif';

interface Common {
  /** --config FILE: check thresholds (see docs/cli.md). */
  readonly config?: string;
  /** --quiet: no progress line, no summary. */
  readonly quiet: boolean;
  /** -o/--output FILE: write the result there instead of stdout. */
  readonly output?: string;
}

export type Command =
  | { readonly kind: 'help'; readonly topic?: Subcommand }
  | { readonly kind: 'version' }
  | (Common & { readonly kind: 'check'; readonly paths: readonly string[]; readonly format: OutputFormat })
  | (Common & {
      readonly kind: 'analyze';
      readonly file: string;
      readonly design?: string;
      readonly json: boolean;
    })
  | (Common & {
      readonly kind: 'report';
      readonly file: string;
      readonly design?: string;
      readonly output: string;
    })
  | (Common & {
      readonly kind: 'solve';
      readonly file: string;
      readonly design?: string;
      readonly json: boolean;
      /** --write: put the solved values into the file (only the free parameters' values change). */
      readonly write: boolean;
    })
  | (Common & {
      readonly kind: 'sweep';
      readonly file: string;
      readonly design?: string;
      /** --param NAME --from X --to Y: an ad-hoc sweep of any parameter instead of the file's own. */
      readonly param?: string;
      readonly from?: string;
      readonly to?: string;
      readonly points?: number;
      readonly json: boolean;
      readonly csv: boolean;
    });

export type ParseResult =
  | { readonly ok: true; readonly command: Command }
  | { readonly ok: false; readonly error: string; readonly topic?: Subcommand };

const SUBCOMMANDS = ['check', 'analyze', 'report', 'solve', 'sweep'] as const;
type Subcommand = (typeof SUBCOMMANDS)[number];

/** Options that take a value, by subcommand. Short aliases map to their long name. */
const VALUE_OPTIONS: Record<Subcommand, readonly string[]> = {
  check: ['format', 'config', 'output'],
  analyze: ['design', 'config', 'output'],
  report: ['design', 'config', 'output'],
  solve: ['design', 'config', 'output'],
  sweep: ['design', 'config', 'output', 'param', 'from', 'to', 'points'],
};
const FLAG_OPTIONS: Record<Subcommand, readonly string[]> = {
  check: ['quiet', 'help'],
  analyze: ['json', 'quiet', 'help'],
  report: ['quiet', 'help'],
  solve: ['json', 'write', 'quiet', 'help'],
  sweep: ['json', 'csv', 'quiet', 'help'],
};
const SHORT: Record<string, string> = {
  o: 'output',
  q: 'quiet',
  h: 'help',
  f: 'format',
  d: 'design',
  c: 'config',
};

const FORMATS: readonly OutputFormat[] = ['text', 'json', 'sarif'];

export function parseArgs(argv: readonly string[]): ParseResult {
  const [first, ...rest] = argv;
  if (first === undefined) return { ok: true, command: { kind: 'help' } };
  if (first === '--help' || first === '-h' || first === 'help') {
    const topic = rest[0];
    if (topic !== undefined && isSubcommand(topic)) return { ok: true, command: { kind: 'help', topic } };
    return { ok: true, command: { kind: 'help' } };
  }
  if (first === '--version' || first === '-V' || first === 'version')
    return { ok: true, command: { kind: 'version' } };
  if (!isSubcommand(first)) {
    const hint = first.startsWith('-') ? `unknown option '${first}'` : `unknown command '${first}'`;
    return { ok: false, error: `${hint}; expected one of: ${SUBCOMMANDS.join(', ')}` };
  }
  const sub = first;
  const values = new Map<string, string>();
  const flags = new Set<string>();
  const positionals: string[] = [];
  const fail = (error: string): ParseResult => ({ ok: false, error, topic: sub });

  for (let i = 0; i < rest.length; i++) {
    const arg = rest[i]!;
    if (arg === '--') {
      positionals.push(...rest.slice(i + 1));
      break;
    }
    if (arg === '-' || !arg.startsWith('-')) {
      positionals.push(arg);
      continue;
    }
    let name: string;
    let inline: string | undefined;
    if (arg.startsWith('--')) {
      const eq = arg.indexOf('=');
      name = eq < 0 ? arg.slice(2) : arg.slice(2, eq);
      inline = eq < 0 ? undefined : arg.slice(eq + 1);
    } else {
      const long = SHORT[arg.slice(1, 2)];
      if (long === undefined || (arg.length > 2 && !VALUE_OPTIONS[sub].includes(long))) {
        return fail(`unknown option '${arg}' for '${sub}'`);
      }
      name = long;
      inline = arg.length > 2 ? arg.slice(2) : undefined;
    }
    if (VALUE_OPTIONS[sub].includes(name)) {
      const value = inline ?? rest[++i];
      if (value === undefined || value === '') return fail(`option '--${name}' needs a value`);
      if (values.has(name)) return fail(`option '--${name}' given twice`);
      values.set(name, value);
    } else if (FLAG_OPTIONS[sub].includes(name)) {
      if (inline !== undefined) return fail(`option '--${name}' takes no value`);
      flags.add(name);
    } else {
      return fail(`unknown option '--${name}' for '${sub}'`);
    }
  }

  if (flags.has('help')) return { ok: true, command: { kind: 'help', topic: sub } };
  const common = { config: values.get('config'), quiet: flags.has('quiet'), output: values.get('output') };

  switch (sub) {
    case 'check': {
      const format = values.get('format') ?? 'text';
      if (!isFormat(format))
        return fail(`unknown format '${format}'; expected one of: ${FORMATS.join(', ')}`);
      if (positionals.length === 0) return fail(`'check' needs at least one file or folder`);
      return { ok: true, command: { kind: 'check', ...common, paths: positionals, format } };
    }
    case 'analyze': {
      if (positionals.length !== 1)
        return fail(`'analyze' takes exactly one file (got ${positionals.length})`);
      return {
        ok: true,
        command: {
          kind: 'analyze',
          ...common,
          file: positionals[0]!,
          design: values.get('design'),
          json: flags.has('json'),
        },
      };
    }
    case 'report': {
      if (positionals.length !== 1)
        return fail(`'report' takes exactly one file (got ${positionals.length})`);
      const output = values.get('output');
      if (output === undefined) return fail(`'report' needs an output file: -o report.html`);
      return {
        ok: true,
        command: { kind: 'report', ...common, output, file: positionals[0]!, design: values.get('design') },
      };
    }
    case 'solve': {
      if (positionals.length !== 1) return fail(`'solve' takes exactly one file (got ${positionals.length})`);
      return {
        ok: true,
        command: {
          kind: 'solve',
          ...common,
          file: positionals[0]!,
          design: values.get('design'),
          json: flags.has('json'),
          write: flags.has('write'),
        },
      };
    }
    case 'sweep': {
      if (positionals.length !== 1) return fail(`'sweep' takes exactly one file (got ${positionals.length})`);
      if (flags.has('json') && flags.has('csv')) return fail(`'--json' and '--csv' exclude each other`);
      const param = values.get('param');
      const from = values.get('from');
      const to = values.get('to');
      if (param !== undefined && (from === undefined || to === undefined))
        return fail(`'--param' needs '--from' and '--to'`);
      if (param === undefined && (from !== undefined || to !== undefined))
        return fail(`'--from' and '--to' need '--param'`);
      const pointsText = values.get('points');
      const points = pointsText === undefined ? undefined : Number(pointsText);
      if (points !== undefined && !(Number.isInteger(points) && points >= 2 && points <= 2001))
        return fail(`'--points' must be a whole number from 2 to 2001`);
      return {
        ok: true,
        command: {
          kind: 'sweep',
          ...common,
          file: positionals[0]!,
          design: values.get('design'),
          ...(param !== undefined ? { param, from, to } : {}),
          ...(points !== undefined ? { points } : {}),
          json: flags.has('json'),
          csv: flags.has('csv'),
        },
      };
    }
    default: {
      const never: never = sub;
      return never;
    }
  }
}

function isSubcommand(s: string): s is Subcommand {
  return (SUBCOMMANDS as readonly string[]).includes(s);
}

function isFormat(s: string): s is OutputFormat {
  return (FORMATS as readonly string[]).includes(s);
}
