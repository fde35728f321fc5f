/** The whole file is refused (empty, binary, missing columns, --strict with rejects…): nothing is written. */
export class ImportFileError extends Error {
  constructor(
    message: string,
    readonly rejects: { line: number; reason: string }[] = [],
  ) {
    super(message);
    this.name = 'ImportFileError';
  }
}
