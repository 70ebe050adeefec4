// How hard a new password is to guess: zxcvbn-ts's estimate with its common and English
// dictionaries, and our own short wording. The server refuses what this refuses, and the
// set-password form shows the same verdict while the person types.
import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import { adjacencyGraphs, dictionary as commonDictionary } from '@zxcvbn-ts/language-common';
import { dictionary as englishDictionary } from '@zxcvbn-ts/language-en';
import { checkProblem, type CheckProblem } from '../check-problems';

/** The lowest zxcvbn score (0–4) a new password may have: 3 is "safely unguessable" in zxcvbn's scale. */
export const PASSWORD_MIN_SCORE = 3;

/** Why a password is easy to guess, in our words, by zxcvbn's warning key. */
const WARNINGS: Record<string, string> = {
  straightRow: 'Keys in a row on the keyboard are easy to guess.',
  keyPattern: 'Keyboard patterns are easy to guess.',
  simpleRepeat: 'Repeated characters are easy to guess.',
  extendedRepeat: 'Repeated groups of characters are easy to guess.',
  sequences: 'Runs such as abc or 4321 are easy to guess.',
  recentYears: 'Recent years are easy to guess.',
  dates: 'Dates are easy to guess.',
  topTen: 'This is one of the most used passwords.',
  topHundred: 'This is one of the most used passwords.',
  common: 'This is a much-used password.',
  similarToCommon: 'This is close to a much-used password.',
  wordByItself: 'A word on its own is easy to guess.',
  namesByThemselves: 'Names on their own are easy to guess.',
  commonNames: 'Common names are easy to guess.',
  userInputs: 'It is built from your name or e-mail address.',
  pwned: 'This password has appeared in leaks.',
};
const ADVICE = 'Add another word or two that do not belong together.';

let factory: ZxcvbnFactory | undefined;
// Ranking the dictionaries takes a moment: done on the first check, not on import.
const estimator = () =>
  (factory ??= new ZxcvbnFactory({
    dictionary: { ...commonDictionary, ...englishDictionary },
    graphs: adjacencyGraphs,
    // The Levenshtein matcher costs a third of a second per check here; the dictionaries and l33t variants stay.
    useLevenshteinDistance: false,
  }));

/** The words of the person's own details (e-mail, names) that a password should not lean on. */
function wordsOf(inputs: readonly string[]): string[] {
  const out = new Set<string>();
  for (const input of inputs) {
    const s = input.trim().toLowerCase();
    if (!s) continue;
    out.add(s);
    for (const word of s.split(/[^\p{L}\p{N}]+/u)) if (word.length >= 3) out.add(word);
  }
  return [...out];
}

export interface PasswordStrength {
  /** zxcvbn's score, 0 (guessed at once) to 4 (very hard to guess). */
  score: 0 | 1 | 2 | 3 | 4;
  /** True when the score reaches PASSWORD_MIN_SCORE. */
  acceptable: boolean;
  /** What is wrong and what to do, for a refused password; null for an acceptable one. */
  message: string | null;
  /** The same as a code of message area `checks` (password.tooEasy, with the warning's code inside), for screens; null when acceptable. */
  problem: CheckProblem | null;
}

/** The strength verdict (score 0–4, acceptable or not, our message) for a new password, given the person's e-mail and names. */
export function passwordStrength(password: string, personalInputs: readonly string[] = []): PasswordStrength {
  const result = estimator().check(password, wordsOf(personalInputs));
  const acceptable = result.score >= PASSWORD_MIN_SCORE;
  if (acceptable) return { score: result.score, acceptable, message: null, problem: null };
  const key = result.feedback.warning && result.feedback.warning in WARNINGS ? result.feedback.warning : undefined;
  const warning = key ? WARNINGS[key] : undefined;
  const problem = key ? checkProblem('password.tooEasyBecause', { warning: checkProblem(`password.warning.${key}`) }) : checkProblem('password.tooEasy');
  return { score: result.score, acceptable, message: ['Too easy to guess.', warning, ADVICE].filter(Boolean).join(' '), problem };
}
