/** An audit action as the audit log names it to people: "share-link-created" → "Share link created". Browser-safe. */
export function auditActionLabel(action: string): string {
  const words = action.replace(/-/g, " ");
  return words.charAt(0).toUpperCase() + words.slice(1);
}
