import type { Queryable } from './database.js';
import { hashApiKey, newApiKey } from './auth.js';
import { countSites, createSite, findApiKey, firstSite, insertApiKey } from './store.js';

export interface BootstrapResult {
  siteId: string;
  siteName: string;
  /** True when this start created the first site (an empty database). */
  createdSite: boolean;
  /** The admin key made on this start, to print once; null when it came from KINESPEC_ADMIN_KEY or already existed. */
  generatedAdminKey: string | null;
}

/**
 * First start: creates the first site and its admin key (KINESPEC_ADMIN_KEY, or a random key
 * returned here to be printed once). Later starts with KINESPEC_ADMIN_KEY set make sure that key
 * exists as an admin of the first site, which is how a lost bootstrap key is replaced.
 */
export async function bootstrap(sql: Queryable, options: { adminKey: string | null; siteName: string; platformKey?: string | null }): Promise<BootstrapResult> {
  const result = await bootstrapSite(sql, options);
  // the platform key (KINESPEC_PLATFORM_KEY) is held on the first site's row but its role reads nothing there
  if (options.platformKey && !(await findApiKey(sql, hashApiKey(options.platformKey)))) {
    await insertApiKey(sql, { siteId: result.siteId, role: 'platform', label: 'KINESPEC_PLATFORM_KEY', keyHash: hashApiKey(options.platformKey) });
  }
  return result;
}

async function bootstrapSite(sql: Queryable, options: { adminKey: string | null; siteName: string }): Promise<BootstrapResult> {
  if ((await countSites(sql)) === 0) {
    const site = await createSite(sql, options.siteName);
    const key = options.adminKey ?? newApiKey();
    await insertApiKey(sql, { siteId: site.id, role: 'admin', label: 'bootstrap admin', keyHash: hashApiKey(key) });
    return { siteId: site.id, siteName: site.name, createdSite: true, generatedAdminKey: options.adminKey ? null : key };
  }
  const site = (await firstSite(sql))!;
  if (options.adminKey && !(await findApiKey(sql, hashApiKey(options.adminKey)))) {
    await insertApiKey(sql, { siteId: site.id, role: 'admin', label: 'KINESPEC_ADMIN_KEY', keyHash: hashApiKey(options.adminKey) });
  }
  return { siteId: site.id, siteName: site.name, createdSite: false, generatedAdminKey: null };
}
