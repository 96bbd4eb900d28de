// `npm run eval`: diagnoses every corpus (real recordings, the widened and tuned own simulator, the second physics)
// with the real pipeline, prints a block per corpus and the goals, and exits 1 when a goal is missed.
// Flags: see tests/eval/README.md.
import { writeFileSync } from 'node:fs';
import { SOFTWARE_VERSION } from '@kinespec/diagnosis';
import { allCorpora } from './corpora/index.js';
import { runCorpus, type CorpusReport } from './evaluate.js';
import { corpusBlock, summaryBlock } from './report.js';
import { forecastSection } from './forecast/forecast-section.js';

interface Flags {
  corpora: string[];
  json: string | null;
  quick: boolean;
  allCases: boolean;
  list: boolean;
}

const USAGE = 'usage: npm run eval -- [--corpus <id or prefix>[,…]]… [--quick] [--all-cases] [--json <file>] [--list]';

function parseFlags(argv: readonly string[]): Flags {
  const flags: Flags = { corpora: [], json: null, quick: false, allCases: false, list: false };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    const [name, inline] = arg.startsWith('--') && arg.includes('=') ? [arg.slice(0, arg.indexOf('=')), arg.slice(arg.indexOf('=') + 1)] : [arg, undefined];
    const value = () => {
      const v = inline ?? argv[++i];
      if (v === undefined || v.startsWith('--')) throw new Error(`${name} needs a value. ${USAGE}`);
      return v;
    };
    if (name === '--corpus') flags.corpora.push(...value().split(',').filter(Boolean));
    else if (name === '--json') flags.json = value();
    else if (name === '--quick') flags.quick = true;
    else if (name === '--all-cases') flags.allCases = true;
    else if (name === '--list') flags.list = true;
    else if (name === '--help' || name === '-h') {
      console.log(USAGE);
      process.exit(0);
    } else throw new Error(`unknown flag '${arg}'. ${USAGE}`);
  }
  return flags;
}

async function main(): Promise<void> {
  const flags = parseFlags(process.argv.slice(2));
  const corpora = allCorpora();
  if (flags.list) {
    for (const c of corpora) console.log(`${c.id.padEnd(20)} ${c.title}`);
    return;
  }
  const chosen = flags.corpora.length === 0 ? corpora : corpora.filter((c) => flags.corpora.some((p) => c.id === p || c.id.startsWith(p)));
  // the forecast evaluation (tests/eval/forecast/) runs with every corpus, or alone with --corpus forecast
  const withForecast = flags.corpora.length === 0 || flags.corpora.some((p) => 'forecast'.startsWith(p));
  if (chosen.length === 0 && withForecast) {
    if (forecastSection().length > 0) process.exitCode = 1;
    return;
  }
  if (chosen.length === 0) throw new Error(`no corpus matches ${flags.corpora.join(', ')}; known: ${corpora.map((c) => c.id).join(', ')}`);
  console.log(`Kinespec diagnosis evaluation (analysis ${SOFTWARE_VERSION}${flags.quick ? ', --quick subset' : ''}): ${chosen.map((c) => c.id).join(', ')}`);
  const reports: CorpusReport[] = [];
  for (const corpus of chosen) {
    process.stderr.write(`running ${corpus.id} …\n`);
    const report = await runCorpus(corpus, { quick: flags.quick });
    reports.push(report);
    console.log(corpusBlock(report, { allCases: flags.allCases, maxMisses: 25 }).join('\n'));
  }
  const summary = summaryBlock(reports);
  console.log(summary.lines.join('\n'));
  if (flags.json) {
    writeFileSync(flags.json, `${JSON.stringify({ generatedAt: new Date().toISOString(), softwareVersion: SOFTWARE_VERSION, quick: flags.quick, corpora: reports }, null, 1)}\n`);
    console.log(`results written to ${flags.json}`);
  }
  const forecastMissed = withForecast ? forecastSection() : [];
  if (summary.missed > 0 || forecastMissed.length > 0) process.exitCode = 1;
}

main().catch((err: unknown) => {
  console.error(`eval: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 2;
});
