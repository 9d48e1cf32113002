/**
 * A mistake in what the user gave us (a file, an argument, a sheet row).
 * The CLI prints it and exits with status 1; anything else is an internal error (status 2).
 */
export class UserError extends Error {
  constructor(
    message: string,
    /** The file the problem is in, when there is one. */
    readonly file?: string,
    /** 1-based line (or sheet row) number within the file. */
    readonly line?: number,
  ) {
    super(message);
    this.name = 'UserError';
  }

  /** "file:line: message", the form editors and terminals make clickable. */
  describe(): string {
    const where = this.file ? (this.line ? `${this.file}:${this.line}: ` : `${this.file}: `) : '';
    return where + this.message;
  }
}
