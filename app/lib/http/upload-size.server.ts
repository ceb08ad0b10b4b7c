/** What the person is told when their file is over the limit, e.g. "simplify the outline first". */
export function fileTooLargeMessage(maxFileBytes: number, advice: string): string {
  return `The file is larger than ${maxFileBytes / 1024 / 1024} MB; ${advice}.`;
}
