// Passwords: how hard a new password is to guess, one rule for the server and the browser.
export { PASSWORD_MIN_SCORE, passwordStrength } from './strength';
export type { PasswordStrength } from './strength';
