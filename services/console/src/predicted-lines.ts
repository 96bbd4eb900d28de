import type { Evidence, Hypothesis } from './api-types.js';

// Turns a hypothesis's evidence into the markers drawn over a spectrum, grouped into families:
// harmonics of one rate ("1×", "3×BPFO") and sidebands around a carrier ("GMF−1×", "BPFI+fs").

export type LineFamily = 'harmonic' | 'sideband' | 'other';

export interface PredictedLine {
  /** position on the chart's x axis: hertz, or orders on an order spectrum */
  x: number;
  frequencyHz: number;
  label: string;
  family: LineFamily;
  /** the rate a harmonic family multiplies, or the carrier a sideband family sits around */
  familyName: string;
  harmonic: number | null;
  matched: boolean;
  /** another line of the model falls within the matching tolerance: the peak cannot be told apart */
  ambiguous: boolean;
  ambiguousWith: string[];
  predicted: number;
  measured: number | null;
  snrDb: number | null;
}

// A sideband names its carrier, a sign and an offset ("GMF hs-mesh − 1× input", "GMF-1×",
// "BPFI + fs", "2×GMF±2×"). A hyphen inside a component id ("ls-mesh", "fan-de") is not a sign: a
// hyphen counts only with spaces around it or when a multiple (digits then ×) follows.
const sidebandPattern = /^(.*?\S)\s*([±+\u2212]|\s-\s|-(?=\s*\d+(?:\.\d+)?\s*[×x*]))\s*(.+)$/i;
const harmonicPattern = /^(\d+(?:\.\d+)?)\s*[×x*]\s*(.*)$/i;

export function classifyLabel(label: string): { family: LineFamily; familyName: string; harmonic: number | null } {
  const text = label.trim();
  const side = sidebandPattern.exec(text);
  if (side) return { family: 'sideband', familyName: side[1]!.trim(), harmonic: null };
  const harm = harmonicPattern.exec(text);
  if (harm) {
    const base = harm[2]!.trim();
    return { family: 'harmonic', familyName: base === '' ? 'shaft' : base, harmonic: Number(harm[1]) };
  }
  // a bare rate with an optional component: "BPFO", "GMF ls-mesh", "BSF input-de"
  if (/^[a-z][\w.-]*(\s+[\w.-]+)?$/i.test(text)) return { family: 'harmonic', familyName: text, harmonic: 1 };
  return { family: 'other', familyName: text, harmonic: null };
}

type EvidenceWithHints = Evidence & { family?: unknown; harmonic?: unknown; order?: unknown; ambiguousWith?: unknown };

/**
 * @param toX maps a line's frequency to the chart axis (identity for Hz, f / speedHz for orders)
 */
export function predictedLines(hypothesis: Hypothesis | null | undefined, toX: (frequencyHz: number, e: Evidence) => number = (f) => f): PredictedLine[] {
  if (!hypothesis) return [];
  return hypothesis.evidence
    .filter((e) => Number.isFinite(e.frequencyHz))
    .map((e: EvidenceWithHints) => {
      const guess = classifyLabel(e.label ?? '');
      // Structured hints from the analysis win over what the label says.
      const family: LineFamily = e.family === 'harmonic' || e.family === 'sideband' ? e.family : guess.family;
      return {
        x: toX(e.frequencyHz, e),
        frequencyHz: e.frequencyHz,
        label: e.label ?? '',
        family,
        familyName: guess.familyName,
        harmonic: typeof e.harmonic === 'number' ? e.harmonic : guess.harmonic,
        matched: e.matched === true,
        ambiguous: e.ambiguous === true,
        ambiguousWith: Array.isArray(e.ambiguousWith) ? e.ambiguousWith.filter((x): x is string => typeof x === 'string') : [],
        predicted: e.predicted,
        measured: e.measured,
        snrDb: e.snrDb,
      };
    })
    .sort((a, b) => a.x - b.x);
}

/** Family captions for the legend: "harmonics of BPFO (4)", "sidebands around GMF (6)". */
export function familyCaptions(lines: readonly PredictedLine[]): string[] {
  const counts = new Map<string, number>();
  for (const line of lines) {
    const caption = line.family === 'harmonic' ? `harmonics of ${line.familyName}` : line.family === 'sideband' ? `sidebands around ${line.familyName}` : line.familyName;
    counts.set(caption, (counts.get(caption) ?? 0) + 1);
  }
  return [...counts].map(([caption, n]) => `${caption} (${n})`);
}

/** Which chart a hypothesis's lines belong on. */
export function chartForDomain(domain: Hypothesis['domain'] | undefined): 'spectrum' | 'envelope' | 'order' {
  return domain === 'envelope' ? 'envelope' : domain === 'order' ? 'order' : 'spectrum';
}
