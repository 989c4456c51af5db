/** Runs the veer CLI in this process, capturing what it writes to stdout and stderr (shared by the CLI tests). */
import { main } from '../../cli/main.ts';

export interface CliRun { code: number; out: string; err: string }

/** Runs `veer ...args` in-process; captures stdout and stderr (`onErr` sees stderr as it is written). */
export async function runVeer(args: string[], onErr?: (text: string) => void): Promise<CliRun> {
  const out: string[] = [];
  const err: string[] = [];
  const write = { out: process.stdout.write.bind(process.stdout), err: process.stderr.write.bind(process.stderr) };
  process.stdout.write = ((chunk: string) => { out.push(String(chunk)); return true; }) as typeof process.stdout.write;
  process.stderr.write = ((chunk: string) => { err.push(String(chunk)); onErr?.(String(chunk)); return true; }) as typeof process.stderr.write;
  try {
    const code = await main(args);
    return { code, out: out.join(''), err: err.join('') };
  } finally {
    process.stdout.write = write.out;
    process.stderr.write = write.err;
  }
}
