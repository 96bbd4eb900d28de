import { componentLines, defaultHarmonics, shaftRatios, type ComponentLine, type LineFamily, type MachineModel } from '@kinespec/kinematics';
import type { CatalogueLine } from './ambiguity.js';
import { modelKey } from './model-key.js';

/** A catalogue line with what the scoring asks of it: a bearing line (envelope only), a shaft harmonic. */
export type CatalogueEntry = CatalogueLine & { bearing: boolean; shaftHarmonic: boolean };

/** Reference lines that are no vibration of their own: synchronous speed, slip, pole pass, hunting-tooth and assembly-phase rates. */
const REFERENCE_FAMILIES: ReadonlySet<string> = new Set(['synchronous-speed', 'slip', 'pole-pass', 'hunting-tooth', 'assembly-phase']);

/** The catalogue's own options: every family at its default harmonics, mesh sidebands 1–3, bearing sidebands ±1. */
const CATALOGUE_OPTIONS = { sidebands: 3, bearingSidebands: 1 } as const;

/** Lines every running machine shows: 1× and 2× of each shaft, mesh frequencies 1–3×, blade pass 1–2×, 2× line frequency. */
const RUNNING_HARMONICS: Partial<Record<LineFamily, number>> = { 'shaft-harmonic': 2, 'gear-mesh': 3, 'blade-pass': 2, 'line-frequency': 1 };

const BEARING_DEFECT_FAMILIES: ReadonlySet<string> = new Set(['bearing-bpfo', 'bearing-bpfi', 'bearing-bsf', 'bearing-ftf']);

/**
 * A model's catalogue at unit speed, kept per model: @kinespec/kinematics componentLines builds a formula string for
 * every line, which costs more than the rest of a line's scoring, and the catalogue is asked for three times per
 * analysis. At a speed s, a line that is a fixed order o of the reference shaft lies at o·s, the very product
 * componentLines forms (its orders do not depend on the speed); twice line frequency does not move; a belt's pass
 * frequency (an order computed through the belt speed) is read from componentLines at s itself, belts only.
 */
interface Template {
  /** The lines at unit speed in componentLines' order, reference families left out; null when the shortcut does not hold. */
  lines: ComponentLine[] | null;
  ratio: Map<string, number>;
  bearingShaft: Map<string, string>;
  beltLines: number;
}

const templates = new Map<string, Template>();
const TEMPLATES_KEPT = 256;

function templateOf(model: MachineModel): Template {
  const key = modelKey(model);
  let t = templates.get(key);
  if (!t) {
    t = buildTemplate(model);
    if (templates.size >= TEMPLATES_KEPT) templates.delete(templates.keys().next().value!);
    templates.set(key, t);
  }
  return t;
}

function buildTemplate(model: MachineModel): Template {
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const bearingShaft = new Map(model.bearings.map((b) => [b.id, b.shaft]));
  const atUnitSpeed = catalogueAt(model, 1);
  // The shortcut needs every line either a fixed order (belts aside) or twice line frequency, and the same lines at
  // any speed: checked against the catalogue at the nominal speed.
  const nominal = catalogueAt(model, model.speed.nominalRpm / 60);
  const holds =
    atUnitSpeed.every((l) => (l.scalesWithSpeed ? true : l.family === 'line-frequency') && (l.family !== 'belt-pass' || l.scalesWithSpeed)) &&
    nominal.length === atUnitSpeed.length &&
    nominal.every((l, i) => {
      const u = atUnitSpeed[i]!;
      const sameLine = l.label === u.label && l.family === u.family && l.component === u.component && l.harmonic === u.harmonic;
      const sameOrder = l.family === 'belt-pass' || !l.scalesWithSpeed || l.order === u.order;
      const sameFixed = l.scalesWithSpeed || l.frequencyHz === u.frequencyHz;
      return sameLine && sameOrder && sameFixed;
    });
  const beltLines = atUnitSpeed.filter((l) => l.family === 'belt-pass').length;
  return { lines: holds ? atUnitSpeed : null, ratio, bearingShaft, beltLines };
}

function catalogueAt(model: MachineModel, speedHz: number): ComponentLine[] {
  return componentLines(model, speedHz, CATALOGUE_OPTIONS).filter((l) => !REFERENCE_FAMILIES.has(l.family));
}

/** Every family at 0 but the belt pass, at its default harmonics: the catalogue's belt lines alone. */
const ONLY_BELTS: Record<LineFamily, number> = Object.fromEntries(
  Object.keys(defaultHarmonics).map((f) => [f, f === 'belt-pass' ? defaultHarmonics['belt-pass'] : 0]),
) as Record<LineFamily, number>;

/** The catalogue's lines at speedHz, each with its frequency; the same as catalogueAt(model, speedHz) line for line. */
function linesAt(model: MachineModel, speedHz: number): Array<{ line: ComponentLine; frequencyHz: number }> {
  const t = templateOf(model);
  const fresh = () => catalogueAt(model, speedHz).map((line) => ({ line, frequencyHz: line.frequencyHz }));
  if (!t.lines) return fresh();
  let belts: ComponentLine[] = [];
  if (t.beltLines > 0) {
    belts = componentLines(model, speedHz, { maxHarmonic: ONLY_BELTS, sidebands: 0, bearingSidebands: 0 }).filter((l) => l.family === 'belt-pass');
    if (belts.length !== t.beltLines) return fresh();
  }
  let b = 0;
  return t.lines.map((line) => ({
    line,
    frequencyHz: line.family === 'belt-pass' ? belts[b++]!.frequencyHz : line.scalesWithSpeed ? line.order * speedHz : line.frequencyHz,
  }));
}

/**
 * The component lines a spectrum can hold, for the ambiguity flag: the catalogue without the reference lines that
 * are no vibration of their own (synchronous speed, slip, pole pass, hunting-tooth and assembly-phase rates).
 */
export function catalogueLines(model: MachineModel, speedHz: number): CatalogueEntry[] {
  const t = templateOf(model);
  return linesAt(model, speedHz).map(({ line: l, frequencyHz }) => ({
    frequencyHz,
    component: l.component,
    label: l.label,
    kind: l.componentKind,
    ...(l.componentKind === 'shaft' || l.componentKind === 'rotor' || l.componentKind === 'bearing'
      ? { shaftRatio: t.ratio.get(l.shaft ?? t.bearingShaft.get(l.component) ?? '') }
      : {}),
    bearing: l.componentKind === 'bearing',
    shaftHarmonic: l.family === 'shaft-harmonic',
  }));
}

/** The catalogue holds every running line when its default harmonics reach the running ones. */
const RUNNING_IN_CATALOGUE = Object.entries(RUNNING_HARMONICS).every(([f, h]) => h <= defaultHarmonics[f as LineFamily]);

/** Lines every running machine of the model shows: 1× and 2× of each shaft, mesh frequencies 1–3×, blade pass, 2× line frequency. */
export function runningLines(model: MachineModel, speedHz: number): CatalogueLine[] {
  if (!RUNNING_IN_CATALOGUE) {
    const only = Object.fromEntries(Object.keys(defaultHarmonics).map((f) => [f, RUNNING_HARMONICS[f as LineFamily] ?? 0])) as Record<LineFamily, number>;
    return componentLines(model, speedHz, { maxHarmonic: only, sidebands: 0, bearingSidebands: 0 }).map((l) => ({ frequencyHz: l.frequencyHz, component: l.component, label: l.label }));
  }
  // The running lines are the catalogue's lines of those families up to those harmonics, in the same order.
  return linesAt(model, speedHz)
    .filter(({ line }) => line.harmonic <= (RUNNING_HARMONICS[line.family] ?? 0))
    .map(({ line, frequencyHz }) => ({ frequencyHz, component: line.component, label: line.label }));
}

/** First-order bearing defect lines (BPFO, BPFI, BSF, FTF of every bearing) at speedHz. */
export function bearingDefectLines(model: MachineModel, speedHz: number): Array<{ family: string; frequencyHz: number }> {
  return linesAt(model, speedHz)
    .filter(({ line }) => line.componentKind === 'bearing' && line.harmonic === 1 && BEARING_DEFECT_FAMILIES.has(line.family))
    .map(({ line, frequencyHz }) => ({ family: line.family, frequencyHz }));
}
