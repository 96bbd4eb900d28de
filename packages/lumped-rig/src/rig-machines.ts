import { crusherGearbox } from './machines/crusher-gearbox.js';
import { dustFan } from './machines/dust-fan.js';
import { screenDrive } from './machines/screen-drive.js';
import type { RigMachine } from './rig-machine.js';

/** The rig's machines (an invented plant, Brackenrigg quarry), in a fixed order. */
export const rigMachines: readonly RigMachine[] = [screenDrive, crusherGearbox, dustFan];

export function rigMachine(id: string): RigMachine {
  const m = rigMachines.find((x) => x.model.id === id);
  if (m === undefined) throw new RangeError(`no rig machine ${id} (have ${rigMachines.map((x) => x.model.id).join(', ')})`);
  return m;
}
