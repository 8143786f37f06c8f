/**
 * How an offline evaluation may cut its windows (services/evaluate-split.ts): by time, per customer at random, or
 * 'auto' (by time when the signals carry it). One list for the api's schema, the command line and the app.
 */
export const SPLIT_CHOICES = ['auto', 'time', 'random'] as const;
export type SplitChoice = (typeof SPLIT_CHOICES)[number];

/** Each choice in words, for the app's picker and the command line's help. */
export const SPLIT_CHOICE_WORDS: Readonly<Record<SplitChoice, string>> = {
  auto: 'by time when the signals have times, else per customer at random',
  time: 'by time: the latest signals are held out',
  random: 'per customer at random: a seeded share of each customer\'s items is held out',
};
