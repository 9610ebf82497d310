/**
 * The roles a user may hold, described once, lowest first: each may do what the ones before it
 * may. The database enum, the store's user schema, the server's checks and the client's controls
 * read this table. Pure data with no imports: the server and the client both use it.
 */
export const ROLES = {
  viewer: { rank: 0, may: 'read everything' },
  observer: { rank: 1, may: 'also log nights, write blocks, reports and measurements' },
  lead: { rank: 2, may: 'also edit the catalogue, sites, campaigns, orbits and users' },
} as const;

export type Role = keyof typeof ROLES;
export const ROLE_NAMES = Object.keys(ROLES) as [Role, ...Role[]];

/** Whether `role` may do what `needed` may. */
export function roleAtLeast(role: Role, needed: Role): boolean {
  return ROLES[role].rank >= ROLES[needed].rank;
}
