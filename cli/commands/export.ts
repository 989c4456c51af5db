/**
 * `veer export <planId>`: fetch a plan bundle from the API and write it. Formats are a registry
 * (`EXPORT_FORMATS`) so other formats can be added beside `json` without touching this command.
 */
import { writeFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import type { CliCommand } from '../command.ts';
import { CCSDS_EXPORT_FORMATS, runOfflineCcsdsExport } from './ccsds-cli.ts';
import { callApi, reportApiError, PROPOSAL_NOTICE, REMOTE_OPTIONS, remoteFrom, UsageError, type Remote } from './remote-api.ts';

/** One export format: fetches what it needs and returns the text to write. */
export interface ExportFormat {
  summary: string;
  /** File name suggested when --out is a directory-less default. */
  defaultFileName(planId: string): string;
  produce(remote: Remote, planId: string, options: { toHead: boolean; stepS?: number; xml?: boolean }): Promise<string>;
}

/** Registered formats; add one entry per format (e.g. a CCSDS message writer). */
export const EXPORT_FORMATS: Record<string, ExportFormat> = {
  json: {
    summary: 'the plan bundle: plan, archive entries, chain headers and hashing rules (check with veer verify --bundle)',
    defaultFileName: (planId) => `${planId}-bundle.json`,
    produce: async (remote, planId, { toHead }) => JSON.stringify(
      await callApi(remote, 'GET', `/v1/plans/${encodeURIComponent(planId)}/export${toHead ? '?toHead=true' : ''}`), null, 2) + '\n',
  },
  ...CCSDS_EXPORT_FORMATS,
};

const usage = (): string => `usage: veer export <planId> [--format NAME] [--out FILE | --stdout] [--to-head] [--url URL] [--token TOKEN]

Formats:
${Object.entries(EXPORT_FORMATS).map(([name, f]) => `  ${name.padEnd(8)} ${f.summary}`).join('\n')}

  --out FILE   where to write (default: the format's file name in the current folder)
  --stdout     write to stdout instead of a file
  --to-head    carry chain headers up to the archive head (ties the plan to the current head hash)
  --ccsds opm|oem  same as --format ccsds-opm|ccsds-oem; --step SECONDS (OEM line spacing), --xml (NDM/XML)
  --plan FILE --problem FILE [--state FILE.opm] [--ephemeris FILE.oem ...]   CCSDS export without a server, from
               veer plan --out (no plan id); a plan made with --ephemeris needs the same files again for an
               OEM export (refused when a file's SHA-256 differs from the plan's record)
  --url URL / --token TOKEN   the API ($VEER_URL / $VEER_TOKEN); needs the reviewer or auditor role
${PROPOSAL_NOTICE}`;

export const exportCommand: CliCommand = {
  name: 'export',
  get usage() { return usage(); },
  async run(args) {
    const { values, positionals } = parseArgs({
      args, allowPositionals: true,
      options: { url: REMOTE_OPTIONS.url, token: REMOTE_OPTIONS.token, format: { type: 'string', default: 'json' }, out: { type: 'string' },
        stdout: { type: 'boolean', default: false }, 'to-head': { type: 'boolean', default: false },
        ccsds: { type: 'string' }, step: { type: 'string' }, xml: { type: 'boolean', default: false },
        plan: { type: 'string' }, problem: { type: 'string' }, state: { type: 'string' }, ephemeris: { type: 'string', multiple: true } },
    });
    if (values.plan !== undefined || values.problem !== undefined) return runOfflineCcsdsExport(values, positionals);
    const planId = positionals[0];
    if (!planId) throw new UsageError('planId', 'veer export needs a plan id');
    const formatName = values.ccsds !== undefined ? `ccsds-${values.ccsds}` : values.format ?? 'json';
    const format = EXPORT_FORMATS[formatName];
    if (!format) throw new UsageError(values.ccsds !== undefined ? '--ccsds' : '--format', `unknown format ${formatName}; known: ${Object.keys(EXPORT_FORMATS).join(', ')}`);
    const stepS = values.step === undefined ? undefined : Number(values.step);
    if (stepS !== undefined && !(stepS > 0 && Number.isFinite(stepS))) throw new UsageError('--step', `'${values.step}' is not a number of seconds > 0`);
    try {
      const text = await format.produce(remoteFrom(values), planId, {
        toHead: values['to-head'] ?? false, xml: values.xml ?? false, ...(stepS !== undefined ? { stepS } : {}),
      });
      if (values.stdout) { process.stdout.write(text); return 0; }
      const file = values.out ?? format.defaultFileName(planId);
      await writeFile(file, text, 'utf8');
      process.stdout.write(`wrote ${file} (${Buffer.byteLength(text)} bytes)\n${PROPOSAL_NOTICE}\n`);
      return 0;
    } catch (error) {
      return reportApiError('export', error);
    }
  },
};
