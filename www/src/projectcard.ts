// The project card: save the whole project to one file (the core writes the zip), open one,
// and remove the copy this browser keeps. Nothing leaves the machine: the file is offered as a
// download from memory.

import { $ } from './dom';
import type { Autosave } from './autosave';
import type { Engine } from './engine';
import { fromCoreProject, toCoreProject, type PageState } from './project';

function errorText(e: unknown): string {
  const msg = (e as Error).message ?? String(e);
  try { return (JSON.parse(msg) as { message: string }).message; } catch { return msg; }
}

export class ProjectCard {
  constructor(
    private engine: Engine,
    private state: () => PageState,
    private restore: (s: PageState) => Promise<void>,
    private autosave: Autosave,
    private status: (s: string) => void,
  ) {
    $('prj-save').addEventListener('click', () => this.save());
    const open = $<HTMLInputElement>('prj-open');
    open.addEventListener('change', async () => {
      const f = open.files?.[0];
      open.value = '';
      if (f) await this.open(f.name, new Uint8Array(await f.arrayBuffer()));
    });
    $('prj-forget').addEventListener('click', () => this.forget());
  }

  /** The project file's bytes (the core's format, docs/project-format.md). */
  bytes(): Promise<Uint8Array> {
    return this.engine.writeProject(toCoreProject(this.state()));
  }

  async save() {
    try {
      const bytes = await this.bytes();
      const url = URL.createObjectURL(new Blob([bytes as BlobPart], { type: 'application/zip' }));
      const a = document.createElement('a');
      a.href = url;
      a.download = `project-${new Date().toISOString().slice(0, 10)}.catchwalk`;
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
      this.status(`Project file written (${Math.round(bytes.length / 1024)} KiB). It holds the homes: keep it inside your organisation.`);
    } catch (e) {
      this.status(`The project could not be written: ${errorText(e)}`);
    }
  }

  /** Opens a project file: the page takes its state whole. */
  async open(name: string, bytes: Uint8Array) {
    try {
      const st = fromCoreProject(await this.engine.readProject(bytes), name.replace(/\.(catchwalk|zip)$/i, ''));
      await this.restore(st);
      this.status(`Opened ${name}: ${st.scenarios.length} scenarios, ${st.notes.length} notes, ${st.photos.length} photos.`);
    } catch (e) {
      this.status(`${name}: ${errorText(e)}`);
    }
  }

  async forget() {
    if (!window.confirm('Remove this project (layers, scenarios, notes, photos) from this browser? Save the project file first if you need it.')) return;
    try {
      await this.autosave.remove();
    } catch (e) {
      this.status(`The browser would not remove it: ${errorText(e)}`);
      return;
    }
    window.location.reload();
  }
}
