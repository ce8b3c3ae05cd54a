// Autosave: the planner's state in this browser's IndexedDB (on this computer only), written
// after every change and read back on reopening. A refusal by the browser's storage is
// reported to the caller, never swallowed.

import type { PageState } from './project';

const DB = 'catchwalk';
const STORE = 'projects';
const KEY = 'last';

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(DB, 1);
    req.onupgradeneeded = () => req.result.createObjectStore(STORE);
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error('the browser would not open its storage'));
    req.onblocked = () => reject(new Error('another tab of this page holds the storage open'));
  });
}

function run<T>(mode: IDBTransactionMode, f: (s: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  return open().then((db) => new Promise<T>((resolve, reject) => {
    const tx = db.transaction(STORE, mode);
    const req = f(tx.objectStore(STORE));
    let out: T;
    req.onsuccess = () => { out = req.result; };
    tx.oncomplete = () => { db.close(); resolve(out); };
    tx.onabort = tx.onerror = () => { db.close(); reject(tx.error ?? req.error ?? new Error('the browser refused to store the project')); };
  }));
}

export interface Saved {
  state: PageState;
  savedAt: string;
}

/** What a storage error means for the planner, in words. */
export function storageMessage(e: unknown): string {
  const err = e as DOMException;
  if (err?.name === 'QuotaExceededError')
    return 'The browser refused to keep this project: its storage for this page is full. Your work is still open in this tab — save the project file now (Project › Save project file), then free space or allow this page more storage.';
  return `The browser refused to keep this project (${err?.name ?? 'error'}: ${err?.message ?? String(e)}). Your work is still open in this tab — save the project file to keep it.`;
}

export class Autosave {
  private timer = 0;
  private pending: Promise<void> = Promise.resolve();

  constructor(private onSaved: (at: Date) => void, private onFailed: (message: string) => void) {}

  /** Saves soon (changes in quick succession make one write). */
  schedule(state: () => PageState) {
    clearTimeout(this.timer);
    this.timer = window.setTimeout(() => { this.pending = this.save(state()); }, 250);
  }

  async save(state: PageState): Promise<void> {
    const savedAt = new Date();
    try {
      await run('readwrite', (s) => s.put({ state, savedAt: savedAt.toISOString() } satisfies Saved, KEY));
      this.onSaved(savedAt);
    } catch (e) {
      this.onFailed(storageMessage(e));
    }
  }

  /** Waits for a save in flight (tests and the remove button). */
  flush(): Promise<void> { return this.pending; }

  async load(): Promise<Saved | null> {
    try {
      return ((await run('readonly', (s) => s.get(KEY))) as Saved | undefined) ?? null;
    } catch (e) {
      this.onFailed(storageMessage(e));
      return null;
    }
  }

  /** Removes the saved project from this computer. */
  async remove(): Promise<void> {
    clearTimeout(this.timer);
    await this.pending;
    await run('readwrite', (s) => s.delete(KEY));
  }
}
