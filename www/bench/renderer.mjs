// The memory of Chromium's renderer processes (the tab; its workers are threads in it), read
// from /proc for the page benchmarks.

import { readdirSync, readFileSync } from 'node:fs';

/** The largest of the renderer processes' `field` of /proc/PID/status (`VmRSS` resident now,
 * `VmHWM` its peak) in MB, and how many renderer processes there were. */
export function rendererMemory(field) {
  const line = new RegExp(`${field}:\\s+(\\d+) kB`);
  let kb = 0;
  let n = 0;
  for (const pid of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
    try {
      const cmd = readFileSync(`/proc/${pid}/cmdline`, 'utf8');
      if (!cmd.includes('chromium') || !cmd.includes('--type=renderer')) continue;
      const m = line.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
      if (m) { kb = Math.max(kb, Number(m[1])); n += 1; }
    } catch { /* the process ended */ }
  }
  return { mb: Math.round(kb / 1024), processes: n };
}
