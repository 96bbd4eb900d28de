import { parseMachineModel, pointUnit, type MachineModel, type Problem } from '@kinespec/kinematics';
import type { Sql } from './database.js';
import { ProblemError } from './problems.js';
import { putMachineModel, type PointSpec } from './store.js';

/*
 * Machine model files: validated by @kinespec/kinematics (its problems passed through as the
 * problem's `errors`), stored as a new version, the machine's points brought in line.
 */

export function invalidModel(problems: Problem[]): ProblemError {
  const first = problems[0];
  const where = first ? `${first.path || '(model)'}: ${first.message}` : 'invalid machine model';
  return new ProblemError(
    'invalid-machine-model',
    `the machine model has ${problems.length} problem${problems.length === 1 ? '' : 's'}; the first: ${where}`,
    { errors: problems.map((p) => ({ path: p.path, code: p.code, message: p.message })) },
  );
}

/** The model in a request body (JSON or YAML text), or a 422 with every validator problem. */
export function parseModelText(text: string, contentType: string | undefined): MachineModel {
  const type = contentType?.split(';')[0]?.trim().toLowerCase();
  const format = type === 'application/json' ? 'json' : type && /yaml/.test(type) ? 'yaml' : undefined;
  const result = parseMachineModel(text, format);
  if (!result.ok) throw invalidModel(result.problems);
  return result.model;
}

export function pointSpecs(model: MachineModel): PointSpec[] {
  return model.points.map((p) => {
    const iso = p.iso ?? model.iso ?? null;
    return {
      pointKey: p.id,
      quantity: p.quantity,
      unit: pointUnit(p),
      near: p.near ?? null,
      shaft: p.shaft ?? null,
      direction: p.direction ?? null,
      alarmVelocityRmsMmPerS: p.alarmVelocityRmsMmPerS ?? null,
      tripVelocityRmsMmPerS: p.tripVelocityRmsMmPerS ?? null,
      baselineVelocityRmsMmPerS: p.baseline?.velocityRmsMmPerS ?? null,
      isoGroup: iso?.group ?? null,
      isoFoundation: iso?.foundation ?? null,
    };
  });
}

/** Stores a validated model as the machine's new current version. */
export async function storeMachineModel(
  sql: Sql,
  input: { siteId: string; machineKey: string; model: MachineModel; sourceText: string; createdBy: string | null; validFrom?: Date },
): Promise<{ machineId: string; version: number }> {
  if (input.model.id !== input.machineKey) {
    throw new ProblemError(
      'invalid-machine-model',
      `the model's id '${input.model.id}' differs from the machine id '${input.machineKey}' in the URL`,
      { errors: [{ path: 'id', code: 'invalid_value', message: `must be '${input.machineKey}', the machine id in the URL` }] },
    );
  }
  const result = await sql.begin((tx) =>
    putMachineModel(tx, {
      siteId: input.siteId,
      machineKey: input.machineKey,
      name: input.model.name ?? input.model.id,
      model: input.model,
      sourceText: input.sourceText,
      points: pointSpecs(input.model),
      createdBy: input.createdBy,
      ...(input.validFrom ? { validFrom: input.validFrom } : {}),
    }),
  );
  return { machineId: input.machineKey, version: result.version };
}
