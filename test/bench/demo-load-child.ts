/**
 * One first load of the demo in a process of its own (test/bench/demo.bench.ts): opens a fresh
 * in-memory store and loads the demo at the instant given, then prints the CPU time of that
 * (user + system, ms) and the number of stars fitted at load, as JSON. Modules are imported first,
 * so the time is the load's own, JIT warm-up included, as a real first start pays it.
 */
import { startStore } from '../../server/store/startup.ts';

const now = process.argv[2]!;
const c0 = process.cpuUsage();
const { store } = await startStore({ url: ':memory:', demo: true, now });
const c = process.cpuUsage(c0);
const current = await store.orbitSolutions.list({ current: true }, { limit: 100 });
const fittedAtLoad = current.items.filter((s) => s.reference.startsWith('demo fit at load')).length;
store.close();
console.log(JSON.stringify({ cpuMs: (c.user + c.system) / 1000, fittedAtLoad }));
