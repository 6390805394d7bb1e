// Run by write-reports.test.ts as a child process that the test kills mid-write.
import { writeFileAtomic } from '../../src/report/index.js';

const [path, megabytes] = process.argv.slice(2);
const text = `{"pad":"${'x'.repeat(Number(megabytes) * 1024 * 1024)}"}`;
process.stdout.write('ready\n');
await writeFileAtomic(path!, text);
process.stdout.write('done\n');
