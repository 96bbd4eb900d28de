import 'uplot/dist/uPlot.min.css';
import './styles.css';
import { ApiProblem, createApiClient } from './api-client.js';
import type { MachineDetail, MachineSummary, Site } from './api-types.js';
import type { AppContext, Cleanup } from './app-context.js';
import { clear, h, message } from './dom.js';
import { renderFleetPage } from './pages/fleet-page.js';
import { renderKeyForm } from './pages/key-form.js';
import { renderMachinePage } from './pages/machine-page.js';
import { renderSignaturePage } from './pages/signature-page.js';
import { renderUploadPage } from './pages/upload-page.js';
import { parseRoute, type PageName } from './route.js';
import { forgetSessionKey, readSessionKey } from './session-key.js';

const app = document.getElementById('app')!;
let cleanup: Cleanup | null = null;
let renderToken = 0;

const api = createApiClient('', readSessionKey, () => {
  forgetSessionKey();
  void start('That key was refused (401). Enter a valid key.');
});

function navLink(page: PageName, text: string): HTMLAnchorElement {
  return h('a', { href: `#/${page}`, 'data-page': page }, text);
}

function shell(site: Site | null): { main: HTMLElement; nav: HTMLElement } {
  clear(app);
  const nav = h('nav', { 'aria-label': 'Pages' }, navLink('fleet', 'Fleet'), navLink('signatures', 'Signatures'), navLink('upload', 'Upload'));
  const header = h(
    'header',
    { class: 'topbar' },
    h('a', { class: 'brand', href: '#/fleet' }, h('span', { class: 'brand-mark', 'aria-hidden': 'true' }, '∿'), 'Kinespec'),
    site ? h('span', { class: 'site-name', 'data-site-id': site.id }, site.name) : null,
    site ? nav : null,
    site
      ? h(
          'button',
          {
            type: 'button',
            class: 'quiet',
            id: 'forget-key',
            onclick: () => {
              forgetSessionKey();
              void start('Key forgotten for this session.');
            },
          },
          'Forget key',
        )
      : null,
  );
  const main = h('main', { id: 'main', tabindex: -1 });
  app.append(header, main);
  return { main, nav };
}

async function renderRoute(ctx: AppContext, main: HTMLElement, nav: HTMLElement): Promise<void> {
  const token = ++renderToken;
  cleanup?.();
  cleanup = null;
  clear(main);
  const route = parseRoute(location.hash);
  for (const a of nav.querySelectorAll('a')) {
    const current = a.dataset.page === route.page || (route.page === 'machine' && a.dataset.page === 'fleet');
    if (current) a.setAttribute('aria-current', 'page');
    else a.removeAttribute('aria-current');
  }
  main.setAttribute('data-page', route.page);
  main.setAttribute('aria-busy', 'true');
  try {
    const render = { fleet: renderFleetPage, machine: renderMachinePage, signatures: renderSignaturePage, upload: renderUploadPage }[route.page];
    // Each render draws into its own view: a render still waiting for data when the route changes again (a click
    // during the demo's reload, a hash change right after the first load) draws into a view no longer shown, instead
    // of appending a second copy of its page to the one on screen.
    const view = h('div', { class: 'view', 'data-view-page': route.page });
    main.append(view);
    const done = await render(view, ctx, route);
    if (token !== renderToken) done();
    else cleanup = done;
  } catch (err) {
    if (token !== renderToken) return;
    const text = err instanceof ApiProblem ? err.message : `Something went wrong: ${(err as Error).message}`;
    main.append(message('error', text));
  } finally {
    if (token === renderToken) main.setAttribute('aria-busy', 'false');
  }
}

async function start(notice?: string): Promise<void> {
  cleanup?.();
  cleanup = null;
  window.onhashchange = null;
  if (!readSessionKey()) {
    const { main } = shell(null);
    renderKeyForm(main, notice, () => void start());
    return;
  }
  let site: Site;
  try {
    site = await api.get<Site>('/api/v1/site');
  } catch (err) {
    if (err instanceof ApiProblem && err.status === 401) return; // onUnauthorized already restarted
    const { main } = shell(null);
    main.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
    return;
  }
  document.title = `${site.name} · Kinespec`;
  const { main, nav } = shell(site);
  let machinesPromise: Promise<MachineSummary[]> | null = null;
  const details = new Map<string, Promise<MachineDetail>>();
  const ctx: AppContext = {
    api,
    site,
    machines() {
      machinesPromise ??= api.get<MachineSummary[]>('/api/v1/machines').catch((err) => {
        machinesPromise = null;
        throw err;
      });
      return machinesPromise;
    },
    machine(id) {
      let p = details.get(id);
      if (!p) {
        p = api.get<MachineDetail>(`/api/v1/machines/${encodeURIComponent(id)}`);
        p.catch(() => details.delete(id));
        details.set(id, p);
      }
      return p;
    },
    remember(href) {
      history.replaceState(null, '', href);
    },
  };
  window.onhashchange = () => {
    // fresh fleet figures whenever the user comes back to the fleet
    if (parseRoute(location.hash).page === 'fleet') machinesPromise = null;
    void renderRoute(ctx, main, nav);
  };
  await renderRoute(ctx, main, nav);
  if (site.demo && site.demo.state === 'seeding') followDemo(site, main, () => {
    machinesPromise = null;
    details.clear();
    void renderRoute(ctx, main, nav);
  });
}

/** Shows how far the demo's background seeding is, and redraws the page once it is complete. */
function followDemo(site: Site, main: HTMLElement, onDone: () => void): void {
  const banner = h('p', { class: 'demo-progress', id: 'demo-progress', role: 'status' });
  main.before(banner);
  const show = (d: NonNullable<Site['demo']>) => {
    banner.dataset.state = d.state;
    banner.textContent =
      d.state === 'seeding'
        ? `Loading the demo: ${d.recordingsDone} of ${d.recordingsTotal} simulated recordings analysed. Pages show what is in so far and fill in as the weeks arrive.`
        : d.state === 'done'
          ? `The demo is loaded: ${d.recordingsTotal} recordings analysed.`
          : `The demo could not be loaded completely: ${d.error ?? 'unknown error'}.`;
  };
  show(site.demo!);
  const timer = window.setInterval(() => {
    void api.get<Site>('/api/v1/site').then(
      (s) => {
        if (!s.demo) return;
        show(s.demo);
        if (s.demo.state !== 'seeding') {
          window.clearInterval(timer);
          onDone();
          window.setTimeout(() => banner.remove(), 8000);
        }
      },
      () => {},
    );
  }, 3000);
}

void start();
