import { readFileSync, statSync } from 'node:fs';
import { UserError } from '../errors.js';

/** Largest input read by default, in megabytes (a .docx: what it expands to). `add --max-size` raises it. */
export const DEFAULT_MAX_MB = 50;

/** The message for a file (or the text inside a .docx) over the size limit. */
export function tooLarge(size: number, max: number, file: string, what = 'the file'): UserError {
  const mb = (n: number) => `${(n / 1024 / 1024).toFixed(n < 10 * 1024 * 1024 ? 1 : 0)} MB`;
  return new UserError(
    `${what} is ${mb(size)}, over the ${mb(max)} limit: split it, or raise the limit with --max-size MB if it really is one transcript`,
    file,
  );
}


/** A file read whole (an outline, a coding sheet), refused with a clear message when missing or too large. */
export function readInputFile(file: string, maxMb = DEFAULT_MAX_MB): Buffer {
  let size: number;
  try {
    const st = statSync(file);
    if (st.isDirectory()) throw new UserError('is a folder, not a file', file);
    size = st.size;
  } catch (e) {
    if (e instanceof UserError) throw e;
    throw new UserError('cannot read the file', file);
  }
  if (size > maxMb * 1024 * 1024) throw tooLarge(size, maxMb * 1024 * 1024, file);
  try {
    return readFileSync(file);
  } catch {
    throw new UserError('cannot read the file', file);
  }
}
