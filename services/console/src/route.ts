// Hash routes: #/fleet, #/machine/<id>?point=&recording=&hypothesis=, #/signatures?machine=, #/upload?machine=&point=

export type PageName = 'fleet' | 'machine' | 'signatures' | 'upload';

export interface Route {
  page: PageName;
  /** the machine id for the machine page */
  id: string | null;
  params: Record<string, string>;
}

const pages: readonly PageName[] = ['fleet', 'machine', 'signatures', 'upload'];

export function parseRoute(hash: string): Route {
  const text = hash.replace(/^#\/?/, '');
  const [pathPart = '', queryPart = ''] = text.split('?', 2);
  const segments = pathPart.split('/').filter(Boolean).map((s) => decodeURIComponent(s));
  const params: Record<string, string> = {};
  for (const [name, value] of new URLSearchParams(queryPart)) params[name] = value;
  const first = segments[0] as PageName | undefined;
  if (!first || !pages.includes(first)) return { page: 'fleet', id: null, params };
  if (first === 'machine') {
    if (!segments[1]) return { page: 'fleet', id: null, params };
    return { page: 'machine', id: segments[1], params };
  }
  return { page: first, id: null, params };
}

export function routeHref(page: PageName, id: string | null = null, params: Record<string, string | null | undefined> = {}): string {
  const path = id ? `${page}/${encodeURIComponent(id)}` : page;
  const query = new URLSearchParams();
  for (const [name, value] of Object.entries(params)) if (value) query.set(name, value);
  const q = query.toString();
  return `#/${path}${q ? `?${q}` : ''}`;
}
