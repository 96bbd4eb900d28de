import type { ApiClient } from './api-client.js';
import type { MachineDetail, MachineSummary, Site } from './api-types.js';

/** What every page gets from the shell. */
export interface AppContext {
  api: ApiClient;
  site: Site;
  /** the fleet list, fetched once per visit of a page that needs it */
  machines(): Promise<MachineSummary[]>;
  machine(id: string): Promise<MachineDetail>;
  /** replace the URL's hash without re-rendering (a page's own state, e.g. the chosen recording) */
  remember(href: string): void;
}

/** A rendered page: the shell calls cleanup before the next page renders. */
export type Cleanup = () => void;
