/** Reads a JSON input file for a command, with errors that name the input and say what went wrong. */
import { readFile } from 'node:fs/promises';

/**
 * The parsed JSON of the file at `path`. An unreadable file or text that is not JSON rejects with
 * `fail(field, message)` (the command's own error class: InvalidInputError or UsageError).
 */
export async function readJsonFile(path: string, field: string, fail: (field: string, message: string) => Error): Promise<unknown> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    throw fail(field, `cannot read '${path}': ${(error as Error).message}`);
  }
  try {
    return JSON.parse(text) as unknown;
  } catch (error) {
    throw fail(field, `'${path}' is not valid JSON: ${(error as Error).message}`);
  }
}
