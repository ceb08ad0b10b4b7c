/** Room for a form's other fields beside its one file. */
const FORM_FIELDS_ALLOWANCE_BYTES = 64 * 1024;

/**
 * True when a form that carries one file of at most `maxFileBytes` declares a larger body: the
 * page refuses it (413) on its Content-Length, before reading a byte of it.
 */
export function declaresLargerForm(request: Request, maxFileBytes: number): boolean {
  return Number(request.headers.get("Content-Length") ?? 0) > maxFileBytes + FORM_FIELDS_ALLOWANCE_BYTES;
}

/** What the person is told when their file is over the limit, e.g. "simplify the outline first". */
export function fileTooLargeMessage(maxFileBytes: number, advice: string): string {
  return `The file is larger than ${maxFileBytes / 1024 / 1024} MB; ${advice}.`;
}
