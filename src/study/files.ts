/**
 * Files the study writes: the study's own (template.txt) and the outputs a user asks for
 * (reports, sheets, exports). Every one is written whole or not at all (a temporary file renamed
 * into place), readable by its owner only, and never over the study itself.
 */
import { randomBytes } from 'node:crypto';
import { closeSync, existsSync, fchmodSync, fsyncSync, openSync, realpathSync, renameSync, statSync, unlinkSync, writeSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { UserError } from '../errors.js';

/** Files that make up a study: never an output's target. */
export const STUDY_FILES = ['study.db', 'study.db-wal', 'study.db-shm', 'study.db-journal', 'template.txt'];

/** Owner read and write only, whatever the umask: transcripts are personal data. */
export const PRIVATE_FILE = 0o600;
export const PRIVATE_DIR = 0o700;

/** A file-system error as a message a researcher can act on, or null when it is not one of those. */
export function fileProblem(e: unknown, path: string): UserError | null {
  const code = e && typeof e === 'object' && 'code' in e ? String((e as { code: unknown }).code) : '';
  const folder = dirname(path);
  const say: Record<string, string> = {
    ENOSPC: 'the disk is full: nothing was written; free some space and try again',
    EDQUOT: 'the disk quota is used up: nothing was written; free some space and try again',
    EACCES: 'permission denied: choose a place you can write to',
    EPERM: 'permission denied: choose a place you can write to',
    EROFS: 'that file system is read-only: choose another place',
    ENOENT: `the folder ${folder} does not exist`,
    ENOTDIR: `${folder} is not a folder`,
    EISDIR: 'that is a folder: give a file name',
    EEXIST: 'a file of that name appeared while writing: try again',
    EMFILE: 'too many files are open: close some programs and try again',
  };
  return say[code] ? new UserError(say[code]!, path || undefined) : null;
}

/**
 * An error from SQLite or the file system that is the machine's state, not a bug: a full disk, a
 * lock held too long, a damaged or read-only study. Returned as a message a researcher can act on.
 */
export function knownProblem(e: unknown): UserError | null {
  if (e instanceof UserError) return e;
  if (!e || typeof e !== 'object' || !('code' in e)) return null;
  const code = String((e as { code: unknown }).code);
  const unchanged = 'the command was not carried out and the study is as it was';
  if (code === 'SQLITE_FULL') return new UserError(`the disk is full: ${unchanged}; free some space and try again`);
  if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) {
    return new UserError(`the study is busy: another trellis command is writing to it; ${unchanged}. Try again when it has finished`);
  }
  if (code.startsWith('SQLITE_READONLY')) return new UserError(`the study cannot be written (a read-only file or folder): ${unchanged}`);
  if (code === 'SQLITE_CORRUPT' || code === 'SQLITE_NOTADB') return new UserError('study.db is damaged: run "trellis check" for details, and restore it from a backup');
  if (code.startsWith('SQLITE_IOERR') || code === 'SQLITE_CANTOPEN') return new UserError(`the study file could not be read or written (${code}): the disk may be full or failing; ${unchanged}. Free some space, check the disk and the folder's permissions`);
  const path = 'path' in e ? String((e as { path: unknown }).path) : '';
  return fileProblem(e, path);
}

/**
 * Writes `data` to `path` atomically (a temporary file beside it, flushed, then renamed), so a
 * full disk or a crash leaves the old file as it was. The file is made owner-only.
 */
export function writeFileAtomic(path: string, data: string | Uint8Array, mode = PRIVATE_FILE): void {
  const target = resolve(path);
  const temp = join(dirname(target), `.${basename(target)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  let fd: number | null = null;
  try {
    fd = openSync(temp, 'wx', mode);
    fchmodSync(fd, mode); // the umask may have taken bits off at open
    const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
    for (let at = 0; at < bytes.length; ) at += writeSync(fd, bytes, at, bytes.length - at);
    fsyncSync(fd);
    closeSync(fd);
    fd = null;
    renameSync(temp, target);
  } catch (e) {
    if (fd !== null) closeSync(fd);
    try {
      unlinkSync(temp);
    } catch {
      // never created, or already renamed
    }
    throw fileProblem(e, path) ?? e;
  }
}

function sameFile(a: string, b: string): boolean {
  try {
    const x = statSync(a);
    const y = statSync(b);
    return x.dev === y.dev && x.ino === y.ino;
  } catch {
    return false;
  }
}

/**
 * Refuses an output path that is one of the study's own files (by name inside the study folder,
 * or the same file by another name or link), a folder, or an existing file without `force`.
 */
export function checkOutputPath(path: string, studyDir: string, force = false): void {
  const target = resolve(path);
  const folder = dirname(target);
  if (!existsSync(folder)) throw new UserError(`the folder ${folder} does not exist`, path);
  if (!statSync(folder).isDirectory()) throw new UserError(`${folder} is not a folder`, path);
  let study: string;
  try {
    study = realpathSync(resolve(studyDir));
  } catch {
    study = resolve(studyDir);
  }
  const real = join(realpathSync(folder), basename(target));
  for (const name of STUDY_FILES) {
    const own = join(study, name);
    if (real === own || sameFile(target, own)) {
      throw new UserError(`refusing to write over the study's own ${name}: choose another file name`, path);
    }
  }
  if (existsSync(target)) {
    if (statSync(target).isDirectory()) throw new UserError('that is a folder: give a file name', path);
    if (!force) throw new UserError('the file exists: pass --force to overwrite it, or choose another name', path);
  }
}

/** An output the user asked for: checked against the study, then written atomically, owner-only. */
export function writeOutputFile(path: string, data: string | Uint8Array, studyDir: string, force = false): void {
  checkOutputPath(path, studyDir, force);
  writeFileAtomic(path, data);
}
