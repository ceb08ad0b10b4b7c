import bcrypt from "bcryptjs";

// bcrypt with cost 10 (about 70 ms per hash here): slow enough to blunt guessing, quick enough
// for a sign-in. Length rules for new passwords live in ~/lib/form.
const COST = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, COST);
}

export function verifyPassword(password: string, passwordHash: string): Promise<boolean> {
  return bcrypt.compare(password, passwordHash);
}
