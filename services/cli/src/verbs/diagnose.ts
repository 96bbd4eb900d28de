import { basename } from 'node:path';
import { analyseRecording, DiagnosisInputError, type RecordingAnalysis } from '@kinespec/diagnosis';
import { recordingWarnings, SignalInputError } from '@kinespec/signal';
import { CliError } from '../cli-error.js';
import { parseFlags, positiveNumber, wholeNumber } from '../flags.js';
import type { CliIo } from '../io.js';
import { loadMachineFile } from '../machine-file.js';
import { channelIndex, decoderHint, loadRecordingFile, recordingFileArgument, withFileNameOnInputErrors, recordingHintFlags } from '../recording-file.js';
import type { Verb } from '../verb.js';

const USAGE =
  'kinespec diagnose <recording> --machine <machine.json> [--point id] [--channel N|name] [--tach-channel N|name] ' +
  '[--pulses-per-rev N] [--speed-rpm N] [--sample-rate-hz F] [--unit g] [--json]';

/**
 * Where the speed came from, in words. The analysis reports 'given' both for a speed the user gave and for the
 * model's nominal speed it fell back to when the spectrum did not show the running lines; the caller knows which.
 */
export function speedSourceText(source: RecordingAnalysis['speedSource'], speedGiven: boolean): string {
  if (source === 'given') return speedGiven ? 'the value given (not found in the spectrum)' : "the model's nominal speed (not found in the spectrum)";
  return source === 'spectrum' ? 'the spectrum' : `the ${source ?? 'model'}`;
}

/** Hypotheses printed after the ones the recording shows. */
const NEXT_COUNT = 3;

function fmt(x: number, digits = 2): string {
  return Number.isFinite(x) ? x.toFixed(digits) : String(x);
}

/** The human summary: speed, overall level and zone, the faults shown with their reasons, then the next three. */
export function formatDiagnosis(
  analysis: RecordingAnalysis,
  context: { file: string; machine: string; speedGiven?: boolean; fileWarnings?: readonly string[] },
): string {
  const lines: string[] = [];
  lines.push(`${context.file}: machine '${context.machine}', point '${analysis.pointId ?? '-'}', ${analysis.domain === 'angle' ? 'angle (order-tracked)' : 'frequency'} domain`);
  if (analysis.speedHz !== null) {
    const unc = analysis.speedUncertaintyHz !== undefined ? ` ± ${fmt(analysis.speedUncertaintyHz * 60, 1)} rpm` : '';
    lines.push(`speed: ${fmt(analysis.speedHz * 60, 1)} rpm (${fmt(analysis.speedHz, 3)} Hz)${unc}, from ${speedSourceText(analysis.speedSource, context.speedGiven ?? false)}`);
  } else {
    lines.push('speed: unknown');
  }
  const o = analysis.overall;
  const zone = o.zone ? `ISO 20816-3 zone ${o.zone}` : 'no ISO zone (the model gives no machine group)';
  const alarm = o.alarmState && o.alarmState !== 'normal' ? `, ${o.alarmState.toUpperCase()} level reached` : '';
  lines.push(`overall: ${fmt(o.velocityRmsMmPerS)} mm/s RMS (${o.bandHz[0]}–${fmt(o.bandHz[1], 0)} Hz), ${zone}${alarm}`);
  lines.push(`acceleration: peak ${fmt(o.accelerationPeak, 3)} ${o.accelerationUnit}, crest factor ${fmt(o.crestFactor)}, kurtosis ${fmt(o.kurtosis)}`);
  const shown = analysis.hypotheses.filter((h) => h.score >= 0.5);
  const rest = analysis.hypotheses.filter((h) => h.score < 0.5).slice(0, NEXT_COUNT);
  const row = (h: RecordingAnalysis['hypotheses'][number]) => `  ${fmt(h.score)}  ${h.fault} in ${h.component}: ${h.reason}`;
  lines.push(shown.length > 0 ? 'faults shown (score >= 0.5):' : 'faults shown (score >= 0.5): none');
  for (const h of shown) lines.push(row(h));
  if (rest.length > 0) {
    lines.push('next:');
    for (const h of rest) lines.push(row(h));
  }
  if (analysis.unexplainedPeaks.length > 0) {
    lines.push(`unexplained peaks: ${analysis.unexplainedPeaks.slice(0, 5).map((p) => `${fmt(p.frequencyHz, 1)} Hz (${fmt(p.snrDb, 0)} dB)`).join(', ')}`);
  }
  for (const w of context.fileWarnings ?? []) lines.push(`note: file: ${w}`);
  for (const w of analysis.warnings) lines.push(`note: ${w}`);
  lines.push('A score supports, and never replaces, the judgement of a qualified engineer on site.');
  return lines.join('\n');
}

export const diagnoseVerb: Verb = {
  name: 'diagnose',
  summary: 'Diagnose a recording against a machine model: running speed, overall level and ISO zone, a scored hypothesis with evidence for every fault candidate',
  usage: USAGE,
  async run(args: string[], io: CliIo): Promise<number> {
    const { values: v, positionals } = parseFlags(
      args,
      {
        machine: { type: 'string' },
        point: { type: 'string' },
        channel: { type: 'string' },
        'tach-channel': { type: 'string' },
        'pulses-per-rev': { type: 'string' },
        'speed-rpm': { type: 'string' },
        ...recordingHintFlags,
        json: { type: 'boolean' },
      },
      USAGE,
    );
    const file = recordingFileArgument(positionals, USAGE);
    if (v.machine === undefined) throw new CliError(`--machine <machine.json> is required (usage: ${USAGE})`);
    const speedRpm = positiveNumber('speed-rpm', v['speed-rpm']);
    const pulsesPerRev = wholeNumber('pulses-per-rev', v['pulses-per-rev'], 1);
    const hint = decoderHint(v['sample-rate-hz'], v.unit);
    const model = loadMachineFile(v.machine, io);
    let fileWarnings: string[] = [];
    const analysis = withFileNameOnInputErrors(
      file,
      () => {
        const recording = loadRecordingFile(file, hint);
        fileWarnings = recordingWarnings(recording.metadata);
        // the CLI takes names or 1-based numbers; analyseRecording takes 0-based indices
        const channel = v.channel === undefined ? undefined : channelIndex(recording, v.channel, 'channel');
        const tachChannel = v['tach-channel'] === undefined ? undefined : channelIndex(recording, v['tach-channel'], 'tach-channel');
        return analyseRecording(recording, {
          model,
          ...(v.point !== undefined ? { pointId: v.point } : {}),
          ...(speedRpm !== undefined ? { speedRpm } : {}),
          ...(channel !== undefined ? { channel } : {}),
          ...(tachChannel !== undefined ? { tachChannel } : {}),
          ...(pulsesPerRev !== undefined ? { pulsesPerRev } : {}),
        });
      },
      [SignalInputError, DiagnosisInputError],
    );
    io.out(v.json ? JSON.stringify({ ...analysis, fileWarnings }, null, 2) : formatDiagnosis(analysis, { file: basename(file), machine: model.id, speedGiven: speedRpm !== undefined, fileWarnings }));
    return 0;
  },
};
