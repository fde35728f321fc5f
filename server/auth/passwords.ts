import bcrypt from 'bcryptjs';

export function hashPassword(password: string, cost: number): Promise<string> {
  return bcrypt.hash(password, cost);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

let decoy: string | undefined;

/** Compared against when the e-mail is unknown, so a wrong e-mail and a wrong password take as long. */
export function decoyHash(): string {
  decoy ??= bcrypt.hashSync('osmia-decoy-password', 10);
  return decoy;
}
