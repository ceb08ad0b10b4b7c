import bcrypt from "bcryptjs";

// bcrypt with cost 10 (about 70 ms per hash here): slow enough to blunt guessing, quick enough
// for a sign-in. bcrypt reads at most 72 bytes of a password, so longer ones are refused.
const COST = 10;
export const PASSWORD_MIN_LENGTH = 10;
export const PASSWORD_MAX_BYTES = 72;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, passwordHash: string): Promise<boolean> {
  return bcrypt.compare(password, passwordHash);
}
