/** Progress of a long in-process command on stderr: a redrawn bar on a terminal, one line per stage otherwise. */

/** What the bar shows: the overall fraction in [0, 1], the stage and a message. */
export interface ProgressReport { stage: string; fraction: number; message: string }

/** A progress printer for the command named `label` (e.g. `veer plan`); call end() once when done. */
export function progressBar(label: string): { update: (p: ProgressReport) => void; end: () => void } {
  const tty = process.stderr.isTTY === true;
  let lastStage = '';
  let lastLen = 0;
  return {
    update(p) {
      const pct = Math.round(p.fraction * 100);
      if (tty) {
        const width = 30;
        const filled = Math.round(p.fraction * width);
        const text = `[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${String(pct).padStart(3)}% ${p.stage}: ${p.message}`.slice(0, 110);
        process.stderr.write(`\r${text.padEnd(lastLen)}`);
        lastLen = text.length;
      } else if (p.stage !== lastStage) {
        process.stderr.write(`${label}: ${String(pct).padStart(3)}% ${p.stage}: ${p.message}\n`);
      }
      lastStage = p.stage;
    },
    end() {
      if (tty && lastLen > 0) process.stderr.write('\n');
    },
  };
}
