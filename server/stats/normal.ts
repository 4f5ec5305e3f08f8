/** The standard normal distribution lives in shared/ (the committee pack's charts draw intervals with it). */
export * from '@shared/stats/normal';
