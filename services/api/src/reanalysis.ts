import type { AnalysisQueue } from './analysis-queue.js';
import type { Sql } from './database.js';
import { problem } from './problems.js';
import { createReanalysis, getReanalysis, listMachineRecordingIds, type MachineRow, type ReanalysisRow } from './store.js';

/*
 * Re-analysis of a machine: every stored recording analysed again against the machine's current model version,
 * as jobs of the analysis queue (analysis-job.ts), one per recording, sent with the request's row in one
 * transaction. Each new analysis becomes current; earlier ones stay with the model and software versions that
 * made them. GET /api/v1/reanalyses/{id} gives the progress.
 */

export async function startReanalysis(
  services: { sql: Sql; queue: AnalysisQueue },
  machine: MachineRow,
  createdBy: string | null,
): Promise<string> {
  const version = machine.currentModelVersion;
  if (version === null) throw problem('no-machine-model', `machine '${machine.machineKey}' has no model version yet`);
  const recordings = await listMachineRecordingIds(services.sql, machine.id);
  const id = await services.sql.begin(async (tx) => {
    const reanalysisId = await createReanalysis(tx, { machineId: machine.id, modelVersion: version, total: recordings.length, createdBy });
    await services.queue.enqueueReanalysisIn(tx, reanalysisId, recordings.map((r) => r.id));
    return reanalysisId;
  });
  services.queue.kick();
  return id;
}

/** Waits up to `ms` for a re-analysis to finish; returns its row as it then stands. */
export async function awaitReanalysis(services: { sql: Sql; queue: AnalysisQueue }, siteId: string, id: string, ms: number): Promise<ReanalysisRow> {
  let row: ReanalysisRow | null = null;
  await services.queue.waitUntil(id, ms, async () => {
    row = await getReanalysis(services.sql, siteId, id);
    return row === null || row.finishedAt !== null;
  });
  if (!row) throw problem('not-found', `no re-analysis '${id}' on this site`);
  return row;
}
