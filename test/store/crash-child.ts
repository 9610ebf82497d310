/**
 * Child process for the crash test: imports a large measurements CSV into the given database
 * file, printing progress from inside the transaction so the parent can kill it mid-way.
 * Usage: tsx test/store/crash-child.ts <db file> <rows>
 */
import { LOCAL_OPERATOR, createStore, openDatabase } from '../../server/store/index.ts';

const [path, rowsArg] = process.argv.slice(2);
const n = Number(rowsArg);
const store = createStore(await openDatabase({ url: `file:${path}` }));
const lines = ['system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument'];
for (let i = 0; i < n; i++)
  lines.push(
    `Crash Deep,Cobble,radial-velocity,JD ${2461000 + i * 0.01},${(i % 400) - 200},5,crash spectrograph`,
  );
process.stdout.write('started\n');
await store.importCsv(LOCAL_OPERATOR, 'measurements', lines.join('\n'), {
  onRow: (i) => {
    if (i % 500 === 0) process.stdout.write(`row ${i}\n`);
  },
});
process.stdout.write('done\n');
store.close();
