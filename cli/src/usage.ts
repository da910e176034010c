// Help texts for `ampnote --help` and `ampnote <command> --help`.
import { CHARTS } from '../../shared/src/charts/descriptors';
import { CAUTION } from '../../shared/src/protocol/panelData';
import { wrapWords } from './wrap';

const wrap = (text: string) => wrapWords(text).join('\n');

const OVERVIEW = `ampnote — checks amplifier design-intent files (.ampnote) from the terminal

Usage:
  ampnote check FILE|FOLDER...   [--format text|json|sarif] [--config FILE] [-o FILE] [--quiet]
  ampnote analyze FILE           [--design NAME] [--json] [--config FILE] [-o FILE]
  ampnote report FILE -o OUT.html [--design NAME] [--config FILE] [--quiet]
  ampnote solve FILE             [--design NAME] [--json] [--write] [--config FILE] [-o FILE]
  ampnote sweep FILE             [--design NAME] [--param NAME --from X --to Y] [--points N]
                                 [--json | --csv] [--config FILE] [-o FILE]
  ampnote --help | ampnote COMMAND --help
  ampnote --version

Exit status: 0 no error-level finding, 1 at least one error-level finding,
             2 bad usage, an unreadable input or an output that could not be written.

${wrap(CAUTION)}
See docs/cli.md for every option and the JSON shapes.
`;

const CHECK = `Usage: ampnote check FILE|FOLDER... [options]

Checks every design in the given files. Folders are searched recursively for *.ampnote files
(node_modules and folders whose name starts with '.' are skipped).

Options:
  -f, --format FORMAT   text (default): one line per finding, file:line:col: severity code: message
                        json:  the findings as JSON (schemaVersion 1, see docs/cli.md)
                        sarif: a SARIF 2.1.0 log for code-scanning tools
  -c, --config FILE     JSON file of check thresholds (keys as the editor settings ampnote.checks.*)
  -o, --output FILE     write the output to FILE instead of standard output
  -q, --quiet           no progress line and no summary
  -h, --help            this help

The summary, the JSON (\`caution\`) and the SARIF run (properties.caution) carry this caution:
${wrap(CAUTION)}
`;

const ANALYZE = `Usage: ampnote analyze FILE [options]

Prints the exact small-signal results of each design, nominal and every corner: poles and zeros,
DC gain, unity-gain frequency, phase and gain margin, slew, settling, pole participation, the hand
estimates beside the exact values, the worst case and the findings.

Options:
  -d, --design NAME     only this design
      --json            JSON (schemaVersion 1, see docs/cli.md) instead of the text tables
  -c, --config FILE     JSON file of check thresholds
  -o, --output FILE     write the output to FILE instead of standard output
  -q, --quiet           no progress line
  -h, --help            this help
`;

const REPORT = `Usage: ampnote report FILE -o OUT.html [options]

Writes one self-contained HTML page (no network access needed to open it) with each design's values,
findings and charts (${CHARTS.map((c) => c.title).join(', ')}).

Options:
  -o, --output FILE     the HTML file to write (required)
  -d, --design NAME     only this design
  -c, --config FILE     JSON file of check thresholds
  -q, --quiet           no progress line and no summary
  -h, --help            this help
`;

const SOLVE = `Usage: ampnote solve FILE [options]

Solves each design's free parameters (\`param NAME = VALUE free LOW .. HIGH\`): the least objective
(\`minimize EXPR\`, else the sum of the stages' bias currents, else the sum of the compensation
capacitances) that meets every requirement, closed-loop stability and the default margins in the
nominal design and every corner. Prints each value before and after, the objective, each requirement's
worst value and corner, and the constraints that limit the answer.

Options:
  -d, --design NAME     only this design
      --json            JSON (schemaVersion 1, see docs/cli.md)
      --write           write the solved values into FILE (only the free parameters' values change)
  -c, --config FILE     JSON file of check thresholds (the default margins)
  -o, --output FILE     write the output to FILE instead of standard output
  -q, --quiet           no progress line
  -h, --help            this help

Exit status: 0 every design met (or has no free parameters), 1 a design is infeasible within its
bounds, 2 bad usage or an unreadable input.

${wrap(CAUTION)}
`;

const SWEEP = `Usage: ampnote sweep FILE [options]

Runs each design's sweeps (\`sweep NAME from LOW to HIGH\`), or with --param one sweep of any parameter:
the phase margin, UGF, gain margin, loop DC gain and closed-loop stability at every point and corner, the
lowest of each over the range (the margins' searched for between points), and every requirement judged
over the whole range.

Options:
  -d, --design NAME     only this design
      --param NAME      sweep this parameter instead of the file's own sweeps (needs --from and --to)
      --from X          the lower end, a number with an optional unit (\`1pF\`, \`1e-12\`)
      --to Y            the upper end
      --points N        points per sweep (2 to 2001; default the sweep's own, else 61)
      --json            JSON (schemaVersion 1, see docs/cli.md)
      --csv             CSV: one row per point and corner, units in the header
  -c, --config FILE     JSON file of check thresholds
  -o, --output FILE     write the output to FILE instead of standard output
  -q, --quiet           no progress line
  -h, --help            this help

Exit status: 0 every requirement holds over every range, 1 one fails somewhere or the closed loop is
unstable, 2 bad usage or an unreadable input.

${wrap(CAUTION)}
`;

export function usage(topic?: 'check' | 'analyze' | 'report' | 'solve' | 'sweep'): string {
  switch (topic) {
    case 'check':
      return CHECK;
    case 'analyze':
      return ANALYZE;
    case 'report':
      return REPORT;
    case 'solve':
      return SOLVE;
    case 'sweep':
      return SWEEP;
    case undefined:
      return OVERVIEW;
    default: {
      const never: never = topic;
      return never;
    }
  }
}
