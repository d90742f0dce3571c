// The inference methods a history fit can use, in a module of its own so the request
// schemas (and the preload that imports them) do not pull in the fitting code.
export const HISTORY_FIT_METHODS = ['map', 'advi', 'svi'] as const;
export type HistoryFitMethod = (typeof HISTORY_FIT_METHODS)[number];
