// The second physics: `@kinespec/lumped-rig` (a lumped-parameter gear pair with time-varying mesh stiffness
// integrated in time, bearing impacts after a published cyclostationary model, machines of its own; it shares no
// code with @kinespec/signatures or @kinespec/simulator). Loaded by a dynamic import: "not available" when absent.
import type { Corpus, LabelledCase } from '../corpus.js';

/** The seed of the corpus the goals are judged on. */
export const LUMPED_RIG_SEED = 13;

interface LumpedRigModule {
  generateCorpus(options: { seed: number; count?: number; quick?: boolean }): Iterable<LabelledCase> | AsyncIterable<LabelledCase> | Promise<LabelledCase[]>;
}

/** The package, or why it cannot be loaded (absent until its branch is merged). */
export async function loadLumpedRig(): Promise<{ module: LumpedRigModule } | { module: null; reason: string }> {
  // A variable specifier keeps the type checker and bundlers from requiring the package to exist.
  const specifier = '@kinespec/lumped-rig';
  try {
    const module = (await import(specifier)) as Partial<LumpedRigModule>;
    if (typeof module.generateCorpus !== 'function') return { module: null, reason: `${specifier} has no generateCorpus export` };
    return { module: module as LumpedRigModule };
  } catch (err) {
    const code = (err as { code?: string }).code;
    if (code === 'ERR_MODULE_NOT_FOUND' || code === 'MODULE_NOT_FOUND' || /Cannot find (module|package)|Failed to (resolve|load)/i.test(String(err))) {
      return { module: null, reason: `${specifier} is not installed (not available in this checkout)` };
    }
    return { module: null, reason: `${specifier} failed to load: ${err instanceof Error ? err.message : String(err)}` };
  }
}

export function lumpedRigCorpus(): Corpus {
  return {
    id: 'lumped-rig',
    title: 'second physics: @kinespec/lumped-rig (lumped-parameter gear pair, cyclostationary bearing impacts; speed not given)',
    source: '@kinespec/lumped-rig generateCorpus({ seed: 13 }) (physics written apart from packages/signatures and packages/simulator)',
    async load(options) {
      const loaded = await loadLumpedRig();
      if (loaded.module === null) return { available: false, reason: loaded.reason };
      const produced = await loaded.module.generateCorpus({ seed: LUMPED_RIG_SEED, quick: options.quick });
      const cases = (async function* () {
        for await (const c of produced as AsyncIterable<LabelledCase>) {
          // The package's cases carry speedGiven: false; keep whatever it states, and tag each with its machine.
          yield { ...c, id: `lumped-rig/${c.id}`, tags: { machine: c.machine.id, ...(c.tags ?? {}) } };
        }
      })();
      return { available: true, cases };
    },
  };
}
