import { h, message } from '../dom.js';
import { forgetSessionKey, saveSessionKey } from '../session-key.js';

// Asks for the API key once per browser session. The key is checked against GET /api/v1/site
// before it is kept, so a typo is caught here and not on the first chart.

export function renderKeyForm(main: HTMLElement, notice: string | undefined, onAccepted: () => void): void {
  const input = h('input', {
    id: 'api-key',
    name: 'api-key',
    type: 'password',
    autocomplete: 'off',
    spellcheck: 'false',
    required: true,
    'aria-describedby': 'api-key-help',
  });
  const status = h('div', { class: 'form-status', 'aria-live': 'polite' }, notice ? message('note', notice) : null);
  const submit = h('button', { type: 'submit', class: 'primary' }, 'Open console');
  const form = h(
    'form',
    { class: 'key-form', 'aria-labelledby': 'key-title' },
    h('h1', { id: 'key-title' }, 'Kinespec console'),
    h('label', { for: 'api-key' }, 'API key'),
    input,
    h(
      'p',
      { id: 'api-key-help', class: 'help' },
      'An engineer or admin key of your site. It is kept in this browser tab only (session storage) and sent with each request. ',
      'The demo prints its keys in the terminal where the service was started.',
    ),
    submit,
    status,
  );
  form.addEventListener('submit', async (e) => {
    e.preventDefault();
    const key = input.value.trim();
    if (!key) return;
    submit.disabled = true;
    status.replaceChildren(message('note', 'Checking the key…'));
    let text: string;
    try {
      const response = await fetch('/api/v1/site', { headers: { authorization: `Bearer ${key}`, accept: 'application/json' } });
      if (response.ok) {
        saveSessionKey(key);
        onAccepted();
        return;
      }
      text = response.status === 401 ? 'The service does not know this key.' : response.status === 403 ? 'This key may not read the site (a logger key?). Use an engineer or admin key.' : `The service answered ${response.status} ${response.statusText}.`;
    } catch (err) {
      text = `The service cannot be reached: ${(err as Error).message}`;
    }
    forgetSessionKey();
    submit.disabled = false;
    status.replaceChildren(message('error', text));
    input.focus();
  });
  main.append(form);
  input.focus();
}
