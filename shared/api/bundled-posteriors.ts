// The posterior bundle that ships with the app.
export async function loadBundledPosteriors(): Promise<never> {
  throw new Error('this build does not include a posterior bundle yet (shared/delay/bundle has no default bundle)');
}
