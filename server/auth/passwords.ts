import bcrypt from 'bcryptjs';

/** bcrypt cost 12: about 0.2 s per hash here, well above OWASP's minimum of 10. */
export const bcryptCost = 12;

export const hashPassword = (password: string) => bcrypt.hash(password, bcryptCost);
export const verifyPassword = (password: string, hash: string) => bcrypt.compare(password, hash);

/** Compared against when the e-mail is unknown, so both failures take the same time. */
export const decoyHash = bcrypt.hashSync('decoy-password-never-matches', bcryptCost);
