// Preloaded into every fractozone process the fuzz harness starts (NODE_OPTIONS=--import=…, so
// batch worker processes get it too): on exit, writes the process's peak resident set size to
// $FZ_RSS_DIR/<pid>.json. A process killed by SIGKILL writes nothing (the harness reports those
// as hangs or crashes anyway).
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';

const dir = process.env.FZ_RSS_DIR;
if (dir) {
  process.on('exit', () => {
    try {
      const maxRssKB = process.resourceUsage().maxRSS;
      writeFileSync(join(dir, `${process.pid}.json`), JSON.stringify({ pid: process.pid, maxRssKB, role: process.send ? 'worker' : 'cli' }));
    } catch {
      /* nothing to report to */
    }
  });
}
