/** Instants are UTC everywhere; local times are shown in the site's IANA zone through luxon, never the browser's. */
import { DateTime } from 'luxon';

const utc = (iso: string) => DateTime.fromISO(iso, { zone: 'utc' });

/** "2027-06-14 16:17" in UTC. */
export const utcText = (iso: string) => utc(iso).toFormat('yyyy-LL-dd HH:mm');
export const utcClock = (iso: string) => utc(iso).toFormat('HH:mm');
export const zoneClock = (iso: string, zone: string) => utc(iso).setZone(zone).toFormat('HH:mm');
export const zoneAbbrev = (iso: string, zone: string) => utc(iso).setZone(zone).toFormat('ZZZZ');
export const dateText = (iso: string) => utc(iso).toFormat('yyyy-LL-dd');
export const ms = (iso: string) => Date.parse(iso);
export const isoOf = (msUtc: number) => new Date(msUtc).toISOString();

/** Today's date in a zone, YYYY-MM-DD. */
export const todayIn = (zone: string) => DateTime.now().setZone(zone).toISODate() ?? '';
