// Session lifetimes (ASVS 3.3 / 7.3): a session ends 12 h after sign-in whatever happens, or after
// 60 min without a request. Edge-safe: no imports.
export const SESSION_ABSOLUTE_SECONDS = 12 * 60 * 60;
export const SESSION_IDLE_SECONDS = 60 * 60;
