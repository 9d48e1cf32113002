// Runs one trellis command in this process and reports its peak memory on stderr as JSON,
// so benchmarks can measure a command on its own.
import { main } from '../dist/cli/main.js';

const t0 = performance.now();
const code = await main(['node', 'trellis', ...process.argv.slice(2)]);
process.stderr.write(`\n${JSON.stringify({ bench: true, seconds: (performance.now() - t0) / 1000, maxRssMiB: process.resourceUsage().maxRSS / 1024 })}\n`);
process.exitCode = code;
