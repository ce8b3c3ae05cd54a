// Sums a V8 .cpuprofile (`node --cpu-prof`) by function: self time, largest first, so a wasm
// profile names the core's own functions (the wasm keeps its name section).
// Usage: node tools/bench/cpuprofile_top.mjs FILE.cpuprofile [N=25]
import { readFileSync } from 'node:fs';

const [file, n = '25'] = process.argv.slice(2);
const prof = JSON.parse(readFileSync(file, 'utf8'));
const byId = new Map(prof.nodes.map((x) => [x.id, x]));
const selfUs = new Map();
// Samples are node ids; timeDeltas the microseconds before each sample.
prof.samples.forEach((id, i) => {
  const name = byId.get(id)?.callFrame.functionName || '(anonymous)';
  selfUs.set(name, (selfUs.get(name) ?? 0) + (prof.timeDeltas[i] ?? 0));
});
const total = [...selfUs.values()].reduce((a, b) => a + b, 0);
console.log(`total ${(total / 1e6).toFixed(2)} s sampled`);
for (const [name, us] of [...selfUs].sort((a, b) => b[1] - a[1]).slice(0, Number(n)))
  console.log(`${((100 * us) / total).toFixed(1).padStart(5)} %  ${(us / 1e3).toFixed(0).padStart(7)} ms  ${name.slice(0, 110)}`);

// With a third argument (part of a function name): that function's self time by caller chain
// up to the first function of the core that is not the allocator or a std helper.
const who = process.argv[4];
if (who) {
  const parent = new Map();
  for (const x of prof.nodes) for (const c of x.children ?? []) parent.set(c, x.id);
  const helper = /dlmalloc|__rdl|__rust_|alloc::|core::|hashbrown|RawVec|memcpy|memmove|<alloc|compiler_builtins/;
  const callers = new Map();
  prof.samples.forEach((id, i) => {
    if (!byId.get(id)?.callFrame.functionName.includes(who)) return;
    let p = parent.get(id);
    while (p !== undefined && helper.test(byId.get(p).callFrame.functionName)) p = parent.get(p);
    const name = p === undefined ? '(root)' : byId.get(p).callFrame.functionName;
    callers.set(name, (callers.get(name) ?? 0) + (prof.timeDeltas[i] ?? 0));
  });
  console.log(`\n${who}: self time by calling function`);
  for (const [name, us] of [...callers].sort((a, b) => b[1] - a[1]).slice(0, 12))
    console.log(`${(us / 1e3).toFixed(0).padStart(7)} ms  ${name.slice(0, 110)}`);
}
