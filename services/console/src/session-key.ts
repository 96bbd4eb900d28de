// The API key lives in sessionStorage: entered once per browser session, gone when the tab closes.
const storageName = 'kinespec.apiKey';

export function readSessionKey(): string | null {
  try {
    return sessionStorage.getItem(storageName);
  } catch {
    return null;
  }
}

export function saveSessionKey(key: string): void {
  sessionStorage.setItem(storageName, key.trim());
}

export function forgetSessionKey(): void {
  sessionStorage.removeItem(storageName);
}
